import { expect, test } from '@playwright/test';
import { DEMO, DEMO_PASSWORD, DEMO_PROJECT, mainNav, signInViaForm } from './support';

test.describe('signing in', () => {
  test('the sign-in page renders with the product mark and the engineering-aid line', async ({ page }) => {
    await page.goto('/sign-in');
    await expect(page.getByRole('heading', { name: 'Sign in' })).toBeVisible();
    await expect(page.getByLabel('E-mail')).toBeVisible();
    await expect(page.getByLabel('Password', { exact: true })).toBeVisible();
    await expect(page.getByRole('button', { name: 'Sign in' })).toBeEnabled();
    await expect(page.getByRole('link', { name: 'Forgot your password?' })).toBeVisible();
    await expect(page.locator('.product-mark__name')).toHaveText('Phaseloop');
    await expect(page.getByTestId('engineering-aid')).toContainText('never replace, physical testing');
    await expect(page).toHaveTitle(/Sign in · Phaseloop/);
  });

  test('a signed-out visitor is sent to sign in, and back to the page afterwards', async ({ page }) => {
    await page.goto('/materials');
    await expect(page).toHaveURL(/\/sign-in\?redirect=(%2F|\/)materials$/);
    await signInViaForm(page, DEMO.analyst.email);
    await expect(page).toHaveURL(/\/materials$/);
    await expect(page.getByRole('heading', { name: 'Materials', level: 1 })).toBeVisible();
  });

  test('the demo analyst signs in and sees the demo project', async ({ page }) => {
    await page.goto('/sign-in');
    await signInViaForm(page, DEMO.analyst.email);
    await expect(page).toHaveURL(/\/projects$/);

    const table = page.getByTestId('projects-table');
    const row = table.getByRole('row').filter({ hasText: DEMO_PROJECT });
    await expect(row).toBeVisible();
    await expect(row.getByText('demo values', { exact: true })).toBeVisible();
    await expect(row.getByText('Analyst', { exact: true })).toBeVisible();

    await expect(page.getByTestId('account-menu')).toContainText(DEMO.analyst.name);
    // The analyst is not a site admin: no Admin entry in the navigation.
    await expect(mainNav(page).getByRole('link', { name: 'Projects' })).toBeVisible();
    await expect(mainNav(page).getByRole('link', { name: 'Admin' })).toHaveCount(0);
  });

  test('a wrong password shows an error and keeps the visitor on the sign-in page', async ({ page }) => {
    await page.goto('/sign-in');
    await signInViaForm(page, DEMO.analyst.email, `${DEMO_PASSWORD}-wrong`);
    const error = page.getByTestId('sign-in-error');
    await expect(error).toBeVisible();
    await expect(error).not.toBeEmpty();
    await expect(page).toHaveURL(/\/sign-in/);
    await expect(page.getByLabel('Password', { exact: true })).toHaveValue('');
  });

  test('signing out ends the session', async ({ page }) => {
    await page.goto('/sign-in');
    await signInViaForm(page, DEMO.reviewer.email);
    await expect(page).toHaveURL(/\/projects$/);
    await page.getByTestId('account-menu').click();
    await expect(page.getByText(DEMO.reviewer.email)).toBeVisible();
    await page.getByTestId('sign-out').click();
    await expect(page).toHaveURL(/\/sign-in/);
    const me = await page.request.get('/api/auth/me');
    expect(me.status()).toBe(401);
  });
});
