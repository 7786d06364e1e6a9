/**
 * Results of a beam model: the demo analyst runs a wire-bending study (beam elements with a
 * circular section), and the results viewer draws the wire as a solid of its section (one prism
 * per beam element), several pixels thick on screen rather than a one-pixel line.
 */
import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { ARTIFACTS, DEMO_PROJECT, signInViaApi } from './support';

/**
 * Longest run of pixels that differ from the viewport background (#111a21) down two columns
 * of the canvas (at 40 % and 60 % of its width), from a screenshot decoded in the page: the
 * thickness of whatever the viewer drew across those columns.
 */
async function drawnThickness(page: Page): Promise<number> {
  const canvas = page.getByTestId('results-viewport').locator('canvas');
  const png = (await canvas.screenshot()).toString('base64');
  return page.evaluate(async (b64) => {
    const img = new Image();
    img.src = `data:image/png;base64,${b64}`;
    await img.decode();
    const c = document.createElement('canvas');
    c.width = img.width;
    c.height = img.height;
    const ctx = c.getContext('2d');
    if (!ctx) return 0;
    ctx.drawImage(img, 0, 0);
    let best = 0;
    for (const fx of [0.4, 0.6]) {
      const x = Math.round(fx * img.width);
      // The middle 80 % of the height: the frame information sits along the bottom edge.
      const y0 = Math.round(0.1 * img.height);
      const data = ctx.getImageData(x, y0, 1, Math.round(0.8 * img.height)).data;
      let run = 0;
      for (let k = 0; k < data.length; k += 4) {
        const differs = Math.abs(data[k]! - 0x11) + Math.abs(data[k + 1]! - 0x1a) + Math.abs(data[k + 2]! - 0x21) > 40;
        run = differs ? run + 1 : 0;
        best = Math.max(best, run);
      }
    }
    return best;
  }, png);
}

test('a wire-bending run shows the wire as a solid of its section', async ({ page }) => {
  test.setTimeout(600_000);
  await signInViaApi(page.request, 'analyst');
  const { items } = (await (await page.request.get('/api/projects')).json()) as { items: { id: string; name: string }[] };
  const project = items.find((p) => p.name === DEMO_PROJECT);
  expect(project, DEMO_PROJECT).toBeTruthy();
  await page.addInitScript((id) => localStorage.setItem('phaseloop.currentProject', id), project?.id ?? '');
  await page.goto('/studies/new?template=wire-bending');
  await page.getByTestId('study-name').fill('E2E wire bending run');
  await expect(page.getByTestId('mesh-stats')).toContainText(/\d+ nodes/);
  await page.getByTestId('study-submit').click();
  await expect(page).toHaveURL(/\/runs\/[0-9a-f-]{36}$/);
  const runId = new URL(page.url()).pathname.split('/').pop() ?? '';
  await expect(page.getByTestId('run-state')).toHaveAttribute('data-status', 'succeeded', { timeout: 540_000 });

  const detail = (await (await page.request.get(`/api/runs/${runId}`)).json()) as { snapshot: { study: { definition: { model: { elements: { type: string }[] } } } } };
  const beams = detail.snapshot.study.definition.model.elements.filter((e) => e.type === 'beam2').length;
  expect(beams).toBeGreaterThan(0);

  await page.goto(`/runs/${runId}/results`);
  await expect(page.getByTestId('results-caution')).toContainText('never replace, physical testing');
  const viewport = page.getByTestId('results-viewport');
  await expect(viewport.locator('canvas')).toBeVisible();
  // One section prism per beam element.
  await expect(viewport).toHaveAttribute('data-section-solids', String(beams));
  await page.getByRole('button', { name: 'Fit view' }).click();
  // A 0.5 mm wire over a 20 mm span fitted to the view is well over a dozen pixels thick; a
  // line drawing of the same beams would be one or two.
  await expect.poll(() => drawnThickness(page), { timeout: 30_000 }).toBeGreaterThanOrEqual(6);
  // Probing the wire: beam nodes have no nodal stress, so the probe shows the element's own value.
  const canvas = viewport.locator('canvas');
  const box = await canvas.boundingBox();
  await expect(async () => {
    await canvas.click({ position: { x: (box?.width ?? 0) * 0.4, y: (box?.height ?? 0) / 2 } });
    await expect(page.getByTestId('results-probe-value')).toContainText(/von Mises stress = -?\d/, { timeout: 3000 });
  }).toPass({ timeout: 30_000 });
  await expect(page.getByTestId('results-probe')).toContainText('at its most stressed point');
  await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'results-wire.png'), fullPage: true });
});
