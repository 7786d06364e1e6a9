/**
 * Results viewport at 100k elements, as a functional check: the bench page draws a generated
 * 320 × 320 quad mesh, orbits it and changes frames, and reports what it measured. Speed is
 * measured by bench/viewer.bench.ts (`npm run bench viewer`), never asserted here; this test only
 * checks that the whole mesh was drawn, orbited and animated.
 */
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { ARTIFACTS, signInViaApi } from './support';

test('results viewport draws, orbits and animates a 102 400-element mesh', async ({ page }) => {
  test.setTimeout(300_000);
  await signInViaApi(page.request, 'viewer');
  await page.goto('/bench/viewport?cells=320&frames=6&orbit=10');
  const out = page.getByTestId('bench-result');
  await expect(out).toContainText('firstFrameMs', { timeout: 280_000 });
  const result = JSON.parse((await out.textContent()) ?? '{}') as { elements: number; nodes: number; frames: number; orbitSteps: number; firstFrameMs: number; orbitMedianMs: number; updateMedianMs: number };
  expect(result.elements).toBe(320 * 320);
  expect(result.nodes).toBe(321 * 321);
  expect(result.frames).toBe(6);
  expect(result.orbitSteps).toBe(10);
  // Every phase produced a measurement (a phase that never drew would leave NaN, printed as null).
  for (const key of ['firstFrameMs', 'orbitMedianMs', 'updateMedianMs'] as const) expect(Number.isFinite(result[key]), key).toBe(true);
  await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'viewport-bench.png') });
});
