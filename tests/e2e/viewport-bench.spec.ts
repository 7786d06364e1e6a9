/**
 * Results viewport at 100k elements: a generated 320 × 320 quad mesh animated over 60 frames of
 * displacement and contour. The timings are written to the artifacts (speed is reported, never
 * asserted); the test asserts only that the whole mesh was drawn and measured.
 */
import fs from 'node:fs';
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { ARTIFACTS, signInViaApi } from './support';

test('results viewport animates a 102 400-element mesh', async ({ page }) => {
  test.setTimeout(240_000);
  await signInViaApi(page.request, 'viewer');
  await page.goto('/bench/viewport?cells=320');
  const out = page.getByTestId('bench-result');
  await expect(out).toContainText('medianDrawMs', { timeout: 200_000 });
  const result = JSON.parse((await out.textContent()) ?? '{}') as { elements: number; nodes: number; frames: number; wallMsPerFrame: number; medianDrawMs: number };
  expect(result.elements).toBe(320 * 320);
  expect(result.nodes).toBe(321 * 321);
  expect(result.frames).toBe(60);
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  fs.writeFileSync(path.join(ARTIFACTS, 'bench-viewport.json'), JSON.stringify({ ...result, browser: 'chromium headless (software WebGL)' }, null, 2));
  await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'viewport-bench.png') });
});
