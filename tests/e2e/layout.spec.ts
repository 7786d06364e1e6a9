/**
 * Every main screen at the two desktop sizes: no sideways scroll, a header whose parts (mark,
 * project switcher, main navigation, bell, account) and navigation links neither overlap each
 * other nor the page heading, and a full-page screenshot kept per size under
 * ARTIFACTS/screens/<width>x<height>/. The finished run the run monitor and results need is
 * found in the demo project or made here, so the spec does not depend on other specs' order.
 */
import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { ARTIFACTS, DEMO_PROJECT, horizontalOverflow, mainNav, signInViaApi, waitForData } from './support';
import { succeededDemoRun, type QuickRun } from './support-runs';

/** The two desktop sizes Phaseloop is laid out for. */
const VIEWPORTS = [
  { width: 1280, height: 800 },
  { width: 1920, height: 1080 },
] as const;

type Viewport = (typeof VIEWPORTS)[number];

/**
 * Pairs of header pieces that overlap on screen (each named by its text or label), pieces that
 * stick out of the window, and the header covering the page heading. Empty when the header holds.
 */
async function headerProblems(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const problems: string[] = [];
    const header = document.querySelector('header');
    if (!header) return ['no header'];
    const name = (el: Element) => (el.getAttribute('aria-label') ?? el.textContent ?? el.tagName).trim().replace(/\s+/g, ' ').slice(0, 40);
    const overlap = (a: DOMRect, b: DOMRect) => Math.min(a.right, b.right) - Math.max(a.left, b.left) > 0.5 && Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top) > 0.5;
    const visible = (el: Element) => { const r = el.getBoundingClientRect(); return r.width > 0 && r.height > 0; };
    const groups = [
      Array.from(header.firstElementChild?.children ?? []).filter(visible),
      Array.from(document.querySelectorAll('nav[aria-label="Main"] a')).filter(visible),
    ];
    for (const group of groups) {
      group.forEach((a, i) => group.slice(i + 1).forEach((b) => {
        if (overlap(a.getBoundingClientRect(), b.getBoundingClientRect())) problems.push(`"${name(a)}" overlaps "${name(b)}"`);
      }));
      for (const el of group) {
        const r = el.getBoundingClientRect();
        if (r.left < 0 || r.right > document.documentElement.clientWidth + 0.5) problems.push(`"${name(el)}" sticks out of the window`);
      }
    }
    const h1 = document.querySelector('main h1');
    if (h1 && window.scrollY === 0 && h1.getBoundingClientRect().top < header.getBoundingClientRect().bottom) problems.push('the header covers the page heading');
    return problems;
  });
}

/** Checks that a screen fits the width, and keeps a full-page screenshot of it as an artifact. */
async function checkScreen(page: Page, viewport: Viewport, name: string, heading: string | RegExp, frame: 'app' | 'public' = 'app'): Promise<void> {
  await test.step(name, async () => {
    await expect(page.getByRole('heading', { name: heading, level: 1 })).toBeVisible();
    await waitForData(page);
    await page.evaluate(() => window.scrollTo(0, 0));
    expect(await horizontalOverflow(page), `${name} overflows sideways`).toBeLessThanOrEqual(0);
    if (frame === 'app') expect(await headerProblems(page), `${name}: header and navigation`).toEqual([]);
    const file = path.join(ARTIFACTS, 'screens', `${viewport.width}x${viewport.height}`, `${name}.png`);
    await page.screenshot({ path: file, fullPage: true });
  });
}

for (const viewport of VIEWPORTS) {
  test.describe(`layout at ${viewport.width}×${viewport.height}`, () => {
    test.use({ viewport });

    test('public screens fit the width', async ({ page }) => {
      await page.goto('/sign-in');
      await checkScreen(page, viewport, 'sign-in', 'Sign in', 'public');
      await page.getByRole('link', { name: 'Forgot your password?' }).click();
      await checkScreen(page, viewport, 'forgot-password', 'Forgot your password?', 'public');
    });

    // One page load, then the app's own navigation from screen to screen (as a user moves).
    test('signed-in screens fit the width', async ({ page }) => {
      test.setTimeout(480_000);
      await signInViaApi(page.request, 'admin');
      const finished: QuickRun = await succeededDemoRun(page.request);
      // The stent project is the current one (as the switcher leaves it), so the lists show its studies and runs.
      await page.addInitScript((id) => localStorage.setItem('phaseloop.currentProject', id), finished.projectId);
      await page.goto('/projects');
      await checkScreen(page, viewport, 'projects', 'Projects');

      await page.getByTestId('projects-table').getByRole('link', { name: DEMO_PROJECT }).click();
      await checkScreen(page, viewport, 'project-detail', DEMO_PROJECT);

      await mainNav(page).getByRole('link', { name: 'Studies' }).click();
      await checkScreen(page, viewport, 'studies', 'Studies');
      await page.getByTestId('studies-table').getByRole('link', { name: 'Strut cell deployment (demo)', exact: true }).click();
      await checkScreen(page, viewport, 'study-builder', 'Strut cell deployment (demo)');

      await mainNav(page).getByRole('link', { name: 'Runs' }).click();
      await checkScreen(page, viewport, 'runs', 'Runs');
      await page.getByTestId('runs-table').locator(`a[href="/runs/${finished.runId}"]`).click();
      await checkScreen(page, viewport, 'run-monitor', /^Run #\d+\b/);
      await page.getByTestId('run-open-results').click();
      await checkScreen(page, viewport, 'results', /^Results of run #\d+\b/);

      await mainNav(page).getByRole('link', { name: 'Materials' }).click();
      await checkScreen(page, viewport, 'materials', 'Materials');
      await page.getByTestId('materials-table').getByRole('link', { name: 'Demo superelastic NiTi (demo values)', exact: true }).click();
      await checkScreen(page, viewport, 'material-detail', 'Demo superelastic NiTi (demo values)');

      await mainNav(page).getByRole('link', { name: 'Test data' }).click();
      await checkScreen(page, viewport, 'test-data', 'Test data');

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
