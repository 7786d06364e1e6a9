/**
 * Material page: versions of a library material and the material-point preview, computed in a
 * web worker by fe-core's uniaxial driver, one curve per chosen temperature.
 */
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { ARTIFACTS, signInViaApi, waitForData } from './support';

test('analyst opens a material: versions and a live material-point preview', async ({ page }) => {
  await signInViaApi(page.request, 'analyst');
  await page.goto('/materials');
  await waitForData(page);
  await page.locator('a.cell-name').first().click();
  await expect(page.getByTestId('material-versions')).toContainText('v1');
  // Three default temperatures → three curves from the worker.
  await expect(page.getByTestId('material-preview-status')).toHaveText('3 curves', { timeout: 60_000 });
  await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'material-detail.png'), fullPage: true });
});
