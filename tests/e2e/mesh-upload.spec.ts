/**
 * Mesh upload (issue 6): an analyst uploads a Gmsh .msh file in the study builder, a broken file is
 * refused with the line named, the physical groups of a good file are listed, and a study built
 * on it (material per region, boundary conditions on groups, load-factor history) is saved,
 * reopened and run to the end.
 */
import path from 'node:path';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { expect, test, type Page } from '@playwright/test';
import { ARTIFACTS, DEMO_PROJECT, horizontalOverflow, signInViaApi, waitForData } from './support';

const here = path.dirname(fileURLToPath(import.meta.url));
/** 4 × 1 mm strip of 4 × 2 quadrilaterals; groups corner (point), left and right (curves), strip (surface). */
const STRIP = path.join(here, 'fixtures', 'strip-2.2.msh');

async function pick(page: Page, testId: string, option: string | RegExp): Promise<void> {
  await page.getByTestId(testId).click();
  await page.getByRole('option', { name: option, exact: true }).click();
}

test.describe('mesh upload', () => {
  test('analyst uploads a .msh, sees its groups, builds, saves and runs a study on it', async ({ page }) => {
    await signInViaApi(page.request, 'analyst');
    await page.goto('/studies');
    await waitForData(page);
    // The stent project, whose library holds an approved superelastic material.
    await page.getByRole('combobox', { name: 'Current project' }).click();
    await page.getByRole('option', { name: DEMO_PROJECT }).click();
    await waitForData(page);
    await page.getByTestId('study-new').click();
    await waitForData(page);
    await page.getByTestId('study-source-mesh').click();
    await expect(page.getByTestId('study-invalid')).toContainText('choose or upload a mesh');

    // A node line missing its z coordinate: refused, and the message names that line.
    const lines = readFileSync(STRIP, 'utf8').split('\n');
    const at = lines.indexOf('7 1 0.5 0');
    lines[at] = '7 1 0.5';
    await page.getByTestId('mesh-file-input').setInputFiles({ name: 'broken.msh', mimeType: 'text/plain', buffer: Buffer.from(lines.join('\n')) });
    await expect(page.getByTestId('mesh-upload-error')).toContainText(`line ${at + 1}:`);

    await page.getByTestId('mesh-file-input').setInputFiles(STRIP);
    await expect(page.getByTestId('mesh-upload-error')).toHaveCount(0);
    await expect(page.getByTestId('mesh-summary')).toContainText('15 nodes');
    const groups = page.getByTestId('mesh-groups');
    for (const g of ['corner', 'left', 'right', 'strip']) await expect(groups).toContainText(g);
    await expect(page.getByTestId('mesh-stats')).toContainText('15 nodes · 8 elements');
    expect(await horizontalOverflow(page), 'mesh set-up at 1280×800 overflows sideways').toBeLessThanOrEqual(0);

    await page.getByTestId('mesh-thickness').locator('input').fill('0.2');
    await pick(page, 'mesh-material-strip', /^Demo superelastic NiTi/);
    await page.getByTestId('mesh-condition-add').click();
    await pick(page, 'mesh-condition-group-0', 'left');
    await page.getByTestId('mesh-condition-add').click();
    await pick(page, 'mesh-condition-group-1', 'corner');
    await pick(page, 'mesh-condition-kind-1', 'fixed y');
    await page.getByTestId('mesh-condition-add').click();
    await pick(page, 'mesh-condition-group-2', 'right');
    await pick(page, 'mesh-condition-kind-2', 'displacement x (mm)');
    const value = page.getByTestId('mesh-condition-value-2').locator('input');
    await value.fill('0.02');
    await value.press('Tab');

    // Zero increments in the history are refused in the form, as for templates.
    const increments = page.getByTestId('history-increments-0').locator('input');
    await increments.fill('0');
    await increments.press('Tab');
    await expect(page.getByTestId('history-table')).toContainText('increments must be ≥ 1');
    await expect(page.getByTestId('study-save')).toBeDisabled();
    await increments.fill('4');
    await increments.press('Tab');
    await expect(page.getByTestId('study-save')).toBeEnabled();
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'study-builder-mesh.png'), fullPage: true });

    await page.getByTestId('study-name').fill('E2E strip on an uploaded mesh');
    await page.getByTestId('study-save').click();
    await expect(page).toHaveURL(/\/studies\/[0-9a-f-]{36}$/);
    await expect(page.getByRole('heading', { name: 'E2E strip on an uploaded mesh', level: 1 })).toBeVisible();

    // Reopened from the server: the mesh, its groups and the three conditions come back.
    await page.reload();
    await waitForData(page);
    await expect(page.getByTestId('mesh-groups')).toContainText('strip');
    await expect(page.getByTestId('mesh-condition-group-2')).toContainText('right');

    await page.getByTestId('study-submit').click();
    await expect(page).toHaveURL(/\/runs\/[0-9a-f-]{36}$/);
    await expect(page.getByTestId('run-state')).toHaveAttribute('data-status', 'succeeded', { timeout: 300_000 });
  });
});
