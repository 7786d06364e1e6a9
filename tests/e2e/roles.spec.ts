import { expect, test } from '@playwright/test';
import { DEMO_PROJECT, DEMO_PROJECT_ADMIN_ONLY, mainNav, signInViaApi } from './support';

test.describe('what a viewer may see', () => {
  test.beforeEach(async ({ page }) => {
    await signInViaApi(page.request, 'viewer');
  });

  test('the viewer has no Admin navigation and the API refuses admin routes with 403', async ({ page }) => {
    await page.goto('/projects');
    await expect(page.getByTestId('projects-table').getByText(DEMO_PROJECT)).toBeVisible();
    // The second demo project has no viewer among its members.
    await expect(page.getByTestId('projects-table').getByText(DEMO_PROJECT_ADMIN_ONLY)).toHaveCount(0);
    await expect(mainNav(page).getByRole('link', { name: 'Studies' })).toBeVisible();
    await expect(mainNav(page).getByRole('link', { name: 'Admin' })).toHaveCount(0);

    // The interface only hides the link; the server is what refuses.
    for (const route of ['/api/admin/users', '/api/admin/invitations', '/api/admin/mail', '/api/admin/audit']) {
      const answer = await page.request.get(route);
      expect(answer.status(), route).toBe(403);
      const body = (await answer.json()) as { error?: { code?: string; message?: string } };
      expect(body.error?.code, route).toBe('forbidden');
      expect(typeof body.error?.message, route).toBe('string');
    }
  });

  test('typing the admin address sends the viewer back to the projects', async ({ page }) => {
    await page.goto('/admin');
    await expect(page).toHaveURL(/\/projects$/);
    await expect(page.getByRole('heading', { name: 'Projects', level: 1 })).toBeVisible();
  });

  test('the viewer sees the members but may not change their roles', async ({ page }) => {
    await page.goto('/projects');
    await page.getByTestId('projects-table').getByRole('link', { name: DEMO_PROJECT }).click();
    const members = page.getByTestId('members-table');
    await expect(members.getByText('Vic Viewer (demo)')).toBeVisible();
    await expect(members.getByRole('combobox')).toHaveCount(0);
    await expect(members.getByRole('button', { name: 'Remove' })).toHaveCount(0);
    await expect(page.getByTestId('edit-project')).toHaveCount(0);
  });
});
