/**
 * The site admin sets a user's limits (runs at once, model size) from Admin → Users; the API
 * stores them, and non-admins cannot change them. The viewer's limits are put back afterwards so
 * other journeys see the seeded values.
 */
import { expect, test } from '@playwright/test';
import path from 'node:path';
import { ARTIFACTS, DEMO, signInViaApi } from './support';

interface ListedUser { id: string; email: string; maxActiveRuns: number; maxNodes: number }

async function usersOf(request: import('@playwright/test').APIRequestContext): Promise<ListedUser[]> {
  const answer = await request.get('/api/admin/users');
  expect(answer.ok()).toBeTruthy();
  return ((await answer.json()) as { items: ListedUser[] }).items;
}

async function patchAsSignedIn(request: import('@playwright/test').APIRequestContext, url: string, data: unknown): Promise<number> {
  const { token } = (await (await request.get('/api/auth/csrf')).json()) as { token: string };
  return (await request.patch(url, { data, headers: { 'x-csrf-token': token } })).status();
}

test('the site admin sets a user\'s limits in Admin → Users; others may not', async ({ page, browser }) => {
  await signInViaApi(page.request, 'admin');
  const before = (await usersOf(page.request)).find((u) => u.email === DEMO.viewer.email);
  expect(before).toBeDefined();
  try {
    await page.goto('/admin?tab=users');
    const cell = page.getByTestId(`quota-${DEMO.viewer.email}`);
    await expect(cell).toContainText(`${before!.maxActiveRuns} runs`);
    await cell.getByRole('button', { name: /Edit limits/ }).click();
    await page.getByTestId('quota-runs').locator('input').fill('3');
    await page.getByTestId('quota-nodes').locator('input').fill('50000');
    await page.getByTestId('quota-save').click();
    await expect(cell).toContainText('3 runs · 50,000 nodes');
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'admin-limits.png'), fullPage: true });

    const after = (await usersOf(page.request)).find((u) => u.email === DEMO.viewer.email);
    expect(after).toMatchObject({ maxActiveRuns: 3, maxNodes: 50_000 });

    // An analyst is refused by the server, not only by a hidden tab.
    const other = await browser.newContext({ baseURL: page.url().replace(/\/admin.*$/, '') });
    await signInViaApi(other.request, 'analyst');
    expect(await patchAsSignedIn(other.request, `/api/admin/users/${before!.id}`, { maxActiveRuns: 100 })).toBe(403);
    await other.close();
  } finally {
    expect(await patchAsSignedIn(page.request, `/api/admin/users/${before!.id}`, { maxActiveRuns: before!.maxActiveRuns, maxNodes: before!.maxNodes })).toBe(200);
  }
});
