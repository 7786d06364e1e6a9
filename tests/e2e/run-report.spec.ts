/**
 * The printable run report: the demo analyst opens it from the run monitor of a run that
 * succeeded, finds the title block, the caution, a material parameter with its unit, the solver
 * version and a curve, and saves it as PDF through the browser's print path. The demo viewer
 * opens the same report (read access is enough).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { ARTIFACTS, DEMO_PROJECT, mainNav, signInViaApi, waitForData } from './support';
import { succeededDemoRun } from './support-runs';

interface SnapshotAnswer {
  number: number;
  snapshot: {
    study: { name: string; revision: number };
    materials: { name: string; version: number; params: Record<string, unknown> }[];
    solver: { name: string; version: string; commit: string };
  };
}

let runId = '';

test.describe.serial('run report', () => {
  test('analyst opens the report of a finished run and saves it as PDF', async ({ page }) => {
    test.setTimeout(360_000);
    await signInViaApi(page.request, 'analyst');
    ({ runId } = await succeededDemoRun(page.request));
    const run = (await (await page.request.get(`/api/runs/${runId}`)).json()) as SnapshotAnswer;

    // The run monitor links to the report once the run is finished.
    await page.goto(`/runs/${runId}`);
    await page.getByTestId('run-open-report').click();
    await expect(page).toHaveURL(new RegExp(`/runs/${runId}/report$`));
    await waitForData(page);

    // No app frame around the sheet.
    await expect(mainNav(page)).toHaveCount(0);

    const title = page.getByTestId('report-title-block');
    await expect(title).toContainText(run.snapshot.study.name);
    await expect(title).toContainText(`run #${run.number}`);
    await expect(title).toContainText(DEMO_PROJECT);
    await expect(page.getByTestId('report-state')).toHaveAttribute('data-status', 'succeeded');

    await expect(page.getByTestId('report-caution')).toContainText('never replace, physical testing');

    // A stress-like parameter of the frozen material version, printed with its unit.
    const material = run.snapshot.materials[0];
    expect(material, 'the quick run uses a library material').toBeTruthy();
    const key = ['E_A', 'E'].find((k) => typeof material?.params[k] === 'number') ?? '';
    expect(key, 'a modulus in the material parameters').not.toBe('');
    const block = page.getByTestId('report-material').first();
    await expect(block).toContainText(`version ${material?.version}`);
    const cell = block.locator('tr').filter({ has: page.locator('th', { hasText: new RegExp(`^${key}$`) }) }).locator('td');
    await expect(cell).toHaveText(/^\S+\s+MPa$/);
    const printed = Number.parseFloat((await cell.textContent()) ?? '');
    const stored = material?.params[key] as number;
    expect(Math.abs(printed - stored) / stored).toBeLessThan(1e-3);

    expect(run.snapshot.solver.version, 'the snapshot records the solver version').not.toBe('');
    await expect(page.getByTestId('report-solver')).toContainText(run.snapshot.solver.version);

    const curve = page.getByTestId('report-curve').first();
    await expect(curve).toBeVisible();
    // Drawn as SVG, so the line is a path element that prints at any resolution.
    expect(await curve.locator('svg path').count()).toBeGreaterThan(0);
    await expect(page.getByTestId('report-segment-ends').locator('tbody tr')).not.toHaveCount(0);

    mkdirSync(path.join(ARTIFACTS, 'screens'), { recursive: true });
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'run-report.png'), fullPage: true });

    // On paper the print button goes; the sheet and its caution stay.
    await page.emulateMedia({ media: 'print' });
    await expect(page.getByTestId('report-print')).toBeHidden();
    await expect(page.getByTestId('report-caution')).toBeVisible();
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'run-report-print.png'), fullPage: true });
    await page.emulateMedia({ media: 'screen' });

    const pdf = await page.pdf({ format: 'A4', printBackground: true });
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // A real report (text, tables, at least one vector curve) is far above an empty page's few kB.
    expect(pdf.length).toBeGreaterThan(20_000);
    mkdirSync(path.join(ARTIFACTS, 'reports'), { recursive: true });
    writeFileSync(path.join(ARTIFACTS, 'reports', 'run-report.pdf'), pdf);
  });

  test('viewer opens the same report', async ({ page }) => {
    expect(runId, 'the first test found a finished run').not.toBe('');
    await signInViaApi(page.request, 'viewer');
    await page.goto(`/runs/${runId}/report`);
    await waitForData(page);
    await expect(page.getByTestId('report-title-block')).toBeVisible();
    await expect(page.getByTestId('report-caution')).toBeVisible();
    await expect(page.getByTestId('report-material').first()).toBeVisible();
    await expect(page.getByTestId('report-print')).toBeEnabled();
  });
});
