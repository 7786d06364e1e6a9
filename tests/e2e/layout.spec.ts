import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { ARTIFACTS, DEMO_PROJECT, horizontalOverflow, mainNav, signInViaApi, waitForData } from './support';

/** The two desktop sizes Phaseloop is laid out for. */
const VIEWPORTS = [
  { width: 1280, height: 800 },
  { width: 1920, height: 1080 },
] as const;

type Viewport = (typeof VIEWPORTS)[number];

/** Checks that a screen fits the width, and keeps a full-page screenshot of it as an artifact. */
async function checkScreen(page: Page, viewport: Viewport, name: string, heading: string): Promise<void> {
  await test.step(name, async () => {
    await expect(page.getByRole('heading', { name: heading, level: 1 })).toBeVisible();
    await waitForData(page);
    expect(await horizontalOverflow(page), `${name} overflows sideways`).toBeLessThanOrEqual(0);
    const file = path.join(ARTIFACTS, 'screens', `${viewport.width}x${viewport.height}`, `${name}.png`);
    await page.screenshot({ path: file, fullPage: true });
  });
}

for (const viewport of VIEWPORTS) {
  test.describe(`layout at ${viewport.width}×${viewport.height}`, () => {
    test.use({ viewport });

    test('public screens fit the width', async ({ page }) => {
      await page.goto('/sign-in');
      await checkScreen(page, viewport, 'sign-in', 'Sign in');
      await page.getByRole('link', { name: 'Forgot your password?' }).click();
      await checkScreen(page, viewport, 'forgot-password', 'Forgot your password?');
    });

    // One page load, then the app's own navigation from screen to screen (as a user moves).
    test('signed-in screens fit the width', async ({ page }) => {
      test.setTimeout(240_000);
      await signInViaApi(page.request, 'admin');
      await page.goto('/projects');
      await checkScreen(page, viewport, 'projects', 'Projects');

      await page.getByTestId('projects-table').getByRole('link', { name: DEMO_PROJECT }).click();
      await checkScreen(page, viewport, 'project-detail', DEMO_PROJECT);

      for (const [name, label] of [
        ['studies', 'Studies'],
        ['runs', 'Runs'],
        ['materials', 'Materials'],
        ['test-data', 'Test data'],
      ] as const) {
        await mainNav(page).getByRole('link', { name: label }).click();
        await checkScreen(page, viewport, name, label);
      }

      await mainNav(page).getByRole('link', { name: 'Admin' }).click();
      await checkScreen(page, viewport, 'admin-users', 'Admin');
      for (const [name, tab] of [
        ['admin-invitations', 'Invitations'],
        ['admin-mailbox', 'Mailbox'],
        ['admin-audit', 'Audit log'],
      ] as const) {
        await page.getByRole('tab', { name: tab }).click();
        await checkScreen(page, viewport, name, 'Admin');
      }

      await page.goto('/no-such-page');
      await checkScreen(page, viewport, 'not-found', 'Page not found');
    });
  });
}
