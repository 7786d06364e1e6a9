import { expect, test } from '@playwright/test';
import { mainNav, signInViaApi } from './support';

test('an unknown address shows the not-found page to a visitor', async ({ page }) => {
  await page.goto('/no-such-page/at-all');
  const notFound = page.getByTestId('not-found');
  await expect(notFound.getByRole('heading', { name: 'Page not found' })).toBeVisible();
  await expect(notFound).toContainText('/no-such-page/at-all');
  await expect(notFound.getByRole('link', { name: 'Go to sign in' })).toBeVisible();
});

test('a signed-in user keeps the navigation on the not-found page', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  await page.goto('/studies/does-not-exist/anywhere');
  await expect(page.getByRole('heading', { name: 'Page not found' })).toBeVisible();
  await expect(mainNav(page).getByRole('link', { name: 'Projects' })).toBeVisible();
  await page.getByTestId('not-found').getByRole('link', { name: 'Go to projects' }).click();
  await expect(page).toHaveURL(/\/projects$/);
});
