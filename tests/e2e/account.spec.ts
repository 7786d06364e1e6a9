/**
 * Personal API tokens from the account page: created with a name, the secret shown once (with a
 * copy button), usable as a Bearer token by a script without cookies, and refused with 401 once
 * revoked. And the notification bell in the header: a run that ends is announced there live.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect, request, test } from '@playwright/test';
import { ARTIFACTS, DEMO_PROJECT, apiPost, horizontalOverflow, mainNav, signInViaApi, waitForData } from './support';

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

test('a user creates an API token, sees it once, uses it as a Bearer token and revokes it', async ({ page, context, baseURL }) => {
  await context.grantPermissions(['clipboard-read', 'clipboard-write']);
  await signInViaApi(page.request, 'analyst');
  await page.goto('/projects');
  await page.getByTestId('account-menu').click();
  await page.getByTestId('account-link').click();
  await expect(page.getByRole('heading', { name: 'Account', level: 1 })).toBeVisible();
  await waitForData(page);

  const name = `e2e script ${Date.now()}`;
  // A token needs a name; the message names the field.
  await page.getByTestId('create-token').click();
  await expect(page.getByTestId('api-tokens').locator('.el-form-item__error')).toContainText('name is required');

  await page.getByTestId('token-name').fill(name);
  await page.getByTestId('create-token').click();
  const secretField = page.getByTestId('new-token');
  await expect(secretField).toHaveValue(/^plt_[A-Za-z0-9_-]{43}$/);
  const token = await secretField.inputValue();
  await page.getByTestId('copy-token').click();
  await expect(page.getByTestId('copy-token')).toHaveText('Copied');
  expect(await page.evaluate('navigator.clipboard.readText()')).toBe(token);

  const row = page.getByTestId('tokens-table').locator('tbody tr', { hasText: name });
  await expect(row).toContainText(token.slice(0, 10));
  await expect(row).toContainText('active');
  await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'account-token-created.png'), fullPage: true });

  // Shown once: after a reload the list has the prefix only, never the secret.
  await page.reload();
  await waitForData(page);
  await expect(page.getByTestId('tokens-table').locator('tbody tr', { hasText: name })).toBeVisible();
  await expect(page.getByTestId('new-token-panel')).toHaveCount(0);
  expect(await page.content()).not.toContain(token);

  // A script: no cookies, only the Bearer header.
  const script = await request.newContext({ baseURL });
  const bearer = { Authorization: `Bearer ${token}` };
  const projects = await script.get('/api/projects', { headers: bearer });
  expect(projects.status()).toBe(200);
  const { items } = (await projects.json()) as { items: { name: string }[] };
  expect(items.map((p) => p.name)).toContain(DEMO_PROJECT);
  expect((await script.get('/api/projects')).status()).toBe(401);

  await page.getByTestId('tokens-table').locator('tbody tr', { hasText: name }).getByRole('button', { name: 'Revoke' }).click();
  await page.locator('.el-message-box').getByRole('button', { name: 'Revoke' }).click();
  await expect(page.getByTestId('tokens-table').locator('tbody tr', { hasText: name })).toContainText('revoked');

  const refused = await script.get('/api/projects', { headers: bearer });
  expect(refused.status()).toBe(401);
  expect(((await refused.json()) as { error: { code: string } }).error.code).toBe('unauthenticated');
  await script.dispose();
});

test('a finished run appears live under the bell, links to the run and is marked read when opened', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const { items: projects } = (await (await page.request.get('/api/projects')).json()) as { items: { id: string; name: string }[] };
  const project = projects.find((p) => p.name === DEMO_PROJECT);
  expect(project, DEMO_PROJECT).toBeTruthy();
  const before = (await (await page.request.get('/api/notifications')).json()) as { unread: number };

  await page.goto('/projects');
  const bell = page.getByTestId('notification-bell');
  await expect(bell).toHaveAttribute('aria-label', before.unread === 0 ? 'Notifications, none unread' : `Notifications, ${before.unread} unread`);

  // A small real study (the bar example of the repository) solved by the worker.
  const model = JSON.parse(readFileSync(path.join(repoRoot, 'examples/bar-thermal.json'), 'utf8')) as unknown;
  const studyName = `E2E bell study ${Date.now()}`;
  const study = (await apiPost(page.request, `/api/projects/${project!.id}/studies`, { name: studyName, definition: { model } })) as { id: string };
  const run = (await apiPost(page.request, `/api/studies/${study.id}/runs`, {})) as { id: string; number: number };

  // Pushed over Socket.IO when the run ends, without reloading the page.
  await expect(bell).toHaveAttribute('aria-label', `Notifications, ${before.unread + 1} unread`, { timeout: 120_000 });
  await bell.click();
  const item = page.getByTestId('notification-panel').getByTestId('notification-item').first();
  await expect(item).toContainText(`Run ${run.number} of "${studyName}" succeeded`);
  await expect(item).toContainText('unread');
  await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'notification-bell.png') });
  await item.getByRole('button').first().click();
  await expect(page).toHaveURL(new RegExp(`/runs/${run.id}$`));
  await expect(bell).toHaveAttribute('aria-label', before.unread === 0 ? 'Notifications, none unread' : `Notifications, ${before.unread} unread`);
  const after = (await (await page.request.get('/api/notifications')).json()) as { items: { runId: string | null; read: boolean }[] };
  expect(after.items.find((n) => n.runId === run.id)?.read).toBe(true);
});

test('the account page and the header with the bell fit at 1280×800 and 1920×1080', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  for (const size of [{ width: 1280, height: 800 }, { width: 1920, height: 1080 }]) {
    await page.setViewportSize(size);
    await page.goto('/account');
    await expect(page.getByRole('heading', { name: 'Account', level: 1 })).toBeVisible();
    await waitForData(page);
    expect(await horizontalOverflow(page), `account at ${size.width}`).toBeLessThanOrEqual(0);
    // The bell sits between the main navigation and the account menu, touching neither.
    const boxes = await Promise.all([mainNav(page), page.getByTestId('notification-bell'), page.getByTestId('account-menu')].map((l) => l.boundingBox()));
    const [nav, bell, account] = boxes.map((b) => b ?? { x: 0, y: 0, width: 0, height: 0 });
    expect(bell!.width, 'bell drawn').toBeGreaterThan(0);
    expect(nav!.x + nav!.width, 'navigation ends before the bell').toBeLessThanOrEqual(bell!.x);
    expect(bell!.x + bell!.width, 'bell ends before the account menu').toBeLessThanOrEqual(account!.x);
    expect(account!.x + account!.width).toBeLessThanOrEqual(size.width);
    await page.getByTestId('notification-bell').click();
    await expect(page.getByTestId('notification-panel')).toBeVisible();
    expect(await horizontalOverflow(page), `open bell at ${size.width}`).toBeLessThanOrEqual(0);
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', `${size.width}x${size.height}`, 'account.png'), fullPage: true });
  }
});
