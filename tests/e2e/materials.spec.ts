/**
 * Material library journeys: an analyst saves a draft version from the parameter form (the API's
 * field messages shown at the field), a reviewer approves or rejects drafts, two versions are
 * compared side by side, and viewers and analysts get no review buttons while the API refuses
 * them. Each test works on a material of its own, named after the demo project's, so the demo
 * materials other specs use keep their versions.
 */
import path from 'node:path';
import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import { ARTIFACTS, DEMO_PROJECT, apiPost, horizontalOverflow, signInViaApi, waitForData, type DemoUser } from './support';

/** Invented superelastic constants (demo values, not a real alloy), quick for the preview. */
const DEMO_PARAMS = { model: 'souza-auricchio', E: 52_000, nu: 0.33, alpha: 0, T_ref: 20, h: 800, beta: 6, T0: -20, R: 50, eps_L: 0.05 };

interface Version { id: string; version: number; status: string; reviewReason: string }
interface Material { id: string; latest: Version }

let counter = 0;

async function demoProjectId(request: APIRequestContext): Promise<string> {
  const answer = await request.get('/api/projects');
  const { items } = (await answer.json()) as { items: { id: string; name: string }[] };
  const project = items.find((p) => p.name === DEMO_PROJECT);
  expect(project, DEMO_PROJECT).toBeTruthy();
  return project!.id;
}

/** A material of this spec (version 1, draft), created by the analyst through the API. */
async function newMaterial(request: APIRequestContext, params: Record<string, unknown> = DEMO_PARAMS): Promise<Material> {
  const projectId = await demoProjectId(request);
  const name = `E2E review alloy ${Date.now()}-${++counter} (demo values)`;
  return (await apiPost(request, `/api/projects/${projectId}/materials`, { name, params, notes: 'demo values for an end-to-end test' })) as Material;
}

async function switchUser(page: Page, user: DemoUser): Promise<void> {
  await page.context().clearCookies();
  await signInViaApi(page.request, user);
}

function paramInput(page: Page, key: string) {
  return page.getByTestId(`param-${key}`).locator('input');
}

test('an analyst saves a draft version from the form, with the API naming a bad field at the field', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const material = await newMaterial(page.request);
  await page.goto(`/materials/${material.id}`);
  await waitForData(page);
  await expect(page.getByTestId('material-versions')).toContainText('v1');
  // Analysts write materials but do not review them.
  await expect(page.getByTestId('material-review')).toHaveCount(0);

  await paramInput(page, 'E').fill('-5');
  await paramInput(page, 'E').blur();
  await page.getByTestId('save-draft').click();
  // The shared schema's message for E, returned by the API as params.E and shown under that field.
  await expect(page.getByTestId('param-E').locator('.el-form-item__error')).toContainText('E (MPa) must be > 0');
  await expect(page.getByTestId('material-versions').locator('tbody tr')).toHaveCount(1);

  await paramInput(page, 'E').fill('52000');
  await paramInput(page, 'R').fill('65');
  await paramInput(page, 'R').blur();
  await page.getByTestId('draft-notes').fill('Raised R to match the upper plateau (demo)');
  await page.getByTestId('save-draft').click();

  const rows = page.getByTestId('material-versions').locator('tbody tr');
  await expect(rows).toHaveCount(2);
  await expect(rows.first()).toContainText('v2');
  await expect(rows.first()).toContainText('draft');
  await expect(rows.first()).toContainText('Raised R to match the upper plateau');
  await expect(rows.first()).toContainText('from v1');
  await expect(page.getByTestId('material-status')).toHaveAttribute('data-status', 'draft');
  await expect(paramInput(page, 'R')).toHaveValue('65');

  // The API holds the new draft with the edited value.
  const detail = (await (await page.request.get(`/api/materials/${material.id}`)).json()) as { versions: (Version & { params: { R: number }; provenance: Record<string, unknown> })[] };
  expect(detail.versions.map((v) => [v.version, v.status, v.params.R])).toEqual([[2, 'draft', 65], [1, 'draft', 50]]);
  expect(detail.versions[0]!.provenance).toMatchObject({ basedOn: { versionId: material.latest.id, version: 1 } });
});

test('a reviewer approves one draft and rejects another with a reason', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const material = await newMaterial(page.request);
  await switchUser(page, 'reviewer');
  await page.goto(`/materials/${material.id}`);
  await waitForData(page);

  await expect(page.getByTestId('material-status')).toHaveAttribute('data-status', 'draft');
  await page.getByTestId('approve-version').click();
  await expect(page.getByTestId('material-status')).toHaveAttribute('data-status', 'approved');
  await expect(page.getByTestId('material-versions').locator('tbody tr').first()).toContainText('Rui Reviewer (demo)');
  await expect(page.getByTestId('material-review')).toHaveCount(0);
  const approved = (await (await page.request.get(`/api/material-versions/${material.latest.id}`)).json()) as Version;
  expect(approved.status).toBe('approved');

  // A second draft, saved by the analyst, is rejected: the reason is required and then shown.
  await switchUser(page, 'analyst');
  const v2 = (await apiPost(page.request, `/api/materials/${material.id}/versions`, { params: { ...DEMO_PARAMS, beta: 9 }, notes: 'steeper slope' })) as Version;
  await switchUser(page, 'reviewer');
  await page.goto(`/materials/${material.id}`);
  await waitForData(page);
  await page.getByTestId('reject-version').click();
  await page.getByTestId('confirm-reject').click();
  await expect(page.locator('.el-dialog .el-form-item__error')).toContainText('reason is required');
  await page.getByTestId('reject-reason').fill('beta does not match the tensile curves at 37 °C (demo)');
  await page.getByTestId('confirm-reject').click();
  await expect(page.getByTestId('material-status')).toHaveAttribute('data-status', 'rejected');
  await expect(page.getByTestId('review-reason').first()).toContainText('beta does not match the tensile curves');
  const rejected = (await (await page.request.get(`/api/material-versions/${v2.id}`)).json()) as Version;
  expect(rejected).toMatchObject({ status: 'rejected', reviewReason: 'beta does not match the tensile curves at 37 °C (demo)' });
});

test('comparing two versions highlights the one differing parameter and overlays both responses', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const material = await newMaterial(page.request);
  const v2 = (await apiPost(page.request, `/api/materials/${material.id}/versions`, { params: { ...DEMO_PARAMS, T0: -10 }, notes: 'warmer T0' })) as Version;

  await page.goto(`/materials/compare?a=${material.latest.id}&b=${v2.id}`);
  await expect(page.getByTestId('compare-summary')).toHaveText('1 parameter differs');
  const differing = page.getByTestId('compare-table').locator('tr.compare__row--differs');
  await expect(differing).toHaveCount(1);
  await expect(differing).toContainText('T0');
  await expect(differing).toContainText('°C');
  await expect(differing.getByTestId('compare-a')).toHaveText('-20');
  await expect(differing.getByTestId('compare-b')).toHaveText('-10');
  await expect(differing.getByText('differs')).toBeVisible();
  // Same value on both sides: not marked.
  await expect(page.getByTestId('compare-table').locator('tr', { hasText: 'eps_L' }).first()).not.toHaveClass(/compare__row--differs/);
  // Two sets × three default temperatures from the web worker.
  await expect(page.getByTestId('material-preview-status')).toHaveText('6 curves', { timeout: 60_000 });
  await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'material-compare.png'), fullPage: true });
});

test('viewers and analysts see no review buttons, and the API refuses their review with 403', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const material = await newMaterial(page.request);
  const review = `/api/material-versions/${material.latest.id}/review`;
  const csrf = async (): Promise<string> => ((await (await page.request.get('/api/auth/csrf')).json()) as { token: string }).token;

  // The analyst (the author here) may not decide either.
  const byAnalyst = await page.request.post(review, { data: { decision: 'approve' }, headers: { 'x-csrf-token': await csrf() } });
  expect(byAnalyst.status()).toBe(403);

  await switchUser(page, 'viewer');
  await page.goto(`/materials/${material.id}`);
  await waitForData(page);
  await expect(page.getByTestId('material-versions')).toContainText('v1');
  await expect(page.getByTestId('material-status')).toHaveAttribute('data-status', 'draft');
  await expect(page.getByTestId('approve-version')).toHaveCount(0);
  await expect(page.getByTestId('reject-version')).toHaveCount(0);
  await expect(page.getByTestId('save-draft')).toHaveCount(0);

  // The interface only hides the buttons; the server is what refuses.
  const byViewer = await page.request.post(review, { data: { decision: 'approve' }, headers: { 'x-csrf-token': await csrf() } });
  expect(byViewer.status()).toBe(403);
  expect(((await byViewer.json()) as { error: { code: string } }).error.code).toBe('forbidden');
  const still = (await (await page.request.get(`/api/material-versions/${material.latest.id}`)).json()) as Version;
  expect(still.status).toBe('draft');
});

test('the material list shows the latest version, its short id and status, and filters by status', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const material = await newMaterial(page.request);
  // The list follows the project switcher; start on the demo project whatever was chosen before.
  const projectId = await demoProjectId(page.request);
  await page.addInitScript(([key, id]) => localStorage.setItem(key, id), ['phaseloop.currentProject', projectId] as const);
  await page.goto('/materials');
  await waitForData(page);
  const table = page.getByTestId('materials-table');
  const row = table.locator('tbody tr', { hasText: material.latest.id.slice(0, 8) });
  await expect(row).toContainText('v1');
  await expect(row).toContainText('Souza–Auricchio');
  await expect(row).toContainText('draft');
  await expect(row).toContainText('Ana Analyst (demo)');

  await page.getByTestId('materials-filter').getByText('Approved').click();
  await expect(table).toContainText('Demo superelastic NiTi (demo values)');
  await expect(table.locator('tbody tr', { hasText: material.latest.id.slice(0, 8) })).toHaveCount(0);
  await page.getByTestId('materials-filter').getByText('Draft').click();
  await expect(table.locator('tbody tr', { hasText: material.latest.id.slice(0, 8) })).toHaveCount(1);
  await expect(table).not.toContainText('Demo superelastic NiTi (demo values)');
});

test('an analyst creates a new material from the list; version 1 is a draft', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const projectId = await demoProjectId(page.request);
  await page.addInitScript(([key, id]) => localStorage.setItem(key, id), ['phaseloop.currentProject', projectId] as const);
  await page.goto('/materials');
  await waitForData(page);
  await page.getByTestId('new-material').click();
  const dialog = page.locator('.el-dialog', { hasText: 'New material' });
  const name = `E2E elastic tool steel ${Date.now()} (demo values)`;
  await dialog.getByTestId('new-material-name').fill(name);
  await dialog.getByTestId('material-model').click();
  await page.getByRole('option', { name: 'Linear elastic' }).click();
  await dialog.getByTestId('param-E').locator('input').fill('200000');
  await dialog.getByTestId('param-nu').locator('input').fill('0.3');
  await dialog.getByTestId('create-material').click();

  await expect(page).toHaveURL(/\/materials\/[0-9a-f-]{36}$/);
  await expect(page.getByRole('heading', { name, level: 1 })).toBeVisible();
  await expect(page.getByTestId('material-status')).toHaveAttribute('data-status', 'draft');
  await expect(page.getByTestId('material-versions')).toContainText('v1');
  await expect(paramInput(page, 'E')).toHaveValue('200000');
});

test('the material list, a material page and a comparison fit at 1280×800 and 1920×1080', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  const material = await newMaterial(page.request);
  const v2 = (await apiPost(page.request, `/api/materials/${material.id}/versions`, { params: { ...DEMO_PARAMS, h: 900 }, notes: 'harder (demo)' })) as Version;
  const projectId = await demoProjectId(page.request);
  await page.addInitScript(([key, id]) => localStorage.setItem(key, id), ['phaseloop.currentProject', projectId] as const);
  for (const size of [{ width: 1280, height: 800 }, { width: 1920, height: 1080 }]) {
    await page.setViewportSize(size);
    for (const [name, url, heading, curves] of [
      ['materials', '/materials', 'Materials', ''],
      ['material-page', `/materials/${material.id}`, 'E2E review alloy', '3 curves'],
      ['material-compare', `/materials/compare?a=${material.latest.id}&b=${v2.id}`, 'Compare material versions', '6 curves'],
    ] as const) {
      await page.goto(url);
      await expect(page.getByRole('heading', { name: heading, level: 1 })).toBeVisible();
      await waitForData(page);
      // Wait for the drawn curves, so the width is checked with the chart in place.
      if (curves) await expect(page.getByTestId('material-preview-status')).toHaveText(curves, { timeout: 60_000 });
      expect(await horizontalOverflow(page), `${name} at ${size.width}`).toBeLessThanOrEqual(0);
      await page.screenshot({ path: path.join(ARTIFACTS, 'screens', `${size.width}x${size.height}`, `${name}.png`), fullPage: true });
    }
  }
});
