/**
 * Comment threads on a material version and on a study: a reviewer writes, an analyst and a viewer
 * read, the viewer gets no comment box, and the API itself refuses a viewer's comment.
 */
import { expect, test, type Page } from '@playwright/test';
import { signInViaApi, waitForData } from './support';

test.describe.configure({ mode: 'serial' });

// Unique per run, so a re-run against the same database never finds an older comment instead.
const stamp = Date.now().toString(36);
const materialNote = `Plateau fit looks plausible for these demo values (${stamp})`;
const studyNote = `Mesh density near the strut crown is enough for this check (${stamp})`;

interface Target { url: string; id: string }
let material: Target | null = null;
let study: Target | null = null;

/** Adds a comment through the page and returns the target id the API stored it under. */
async function comment(page: Page, prefix: 'material-version' | 'study', body: string): Promise<string> {
  await page.getByTestId(`${prefix}-comment-input`).fill(body);
  const [answer] = await Promise.all([
    page.waitForResponse((r) => r.url().endsWith('/api/comments') && r.request().method() === 'POST'),
    page.getByTestId(`${prefix}-comment-add`).click(),
  ]);
  expect(answer.status()).toBe(201);
  await expect(page.getByTestId(`${prefix}-comments`)).toContainText(body);
  return ((await answer.json()) as { targetId: string }).targetId;
}

test('a reviewer comments on a material version and on a study', async ({ page }) => {
  await signInViaApi(page.request, 'reviewer');
  await page.goto('/materials');
  await waitForData(page);
  await page.locator('a.cell-name').first().click();
  await expect(page).toHaveURL(/\/materials\/[0-9a-f-]{36}$/);
  await waitForData(page);
  const materialUrl = page.url();
  material = { url: materialUrl, id: await comment(page, 'material-version', materialNote) };

  await page.goto('/studies');
  await waitForData(page);
  await page.getByTestId('studies-table').getByRole('link').first().click();
  await expect(page).toHaveURL(/\/studies\/[0-9a-f-]{36}$/);
  await waitForData(page);
  await expect(page.getByTestId('study-comment-card')).toBeVisible();
  const studyUrl = page.url();
  study = { url: studyUrl, id: await comment(page, 'study', studyNote) };
});

test('an analyst sees both comments and may add one', async ({ page }) => {
  expect(material && study, 'the reviewer test ran first').toBeTruthy();
  await signInViaApi(page.request, 'analyst');
  await page.goto(material?.url ?? '/');
  await expect(page.getByTestId('material-version-comments')).toContainText(materialNote);
  await expect(page.getByTestId('material-version-comments')).toContainText('Rui Reviewer (demo)');
  await expect(page.getByTestId('material-version-comment-input')).toBeVisible();
  await page.goto(study?.url ?? '/');
  await expect(page.getByTestId('study-comments')).toContainText(studyNote);
  await expect(page.getByTestId('study-comment-input')).toBeVisible();
});

test('a viewer reads both threads without a comment box, and the API refuses their comment', async ({ page }) => {
  expect(material && study, 'the reviewer test ran first').toBeTruthy();
  await signInViaApi(page.request, 'viewer');
  await page.goto(material?.url ?? '/');
  await expect(page.getByTestId('material-version-comments')).toContainText(materialNote);
  await expect(page.getByTestId('material-version-comment-input')).toHaveCount(0);
  await expect(page.getByTestId('material-version-comment-add')).toHaveCount(0);
  await page.goto(study?.url ?? '/');
  await expect(page.getByTestId('study-comments')).toContainText(studyNote);
  await expect(page.getByTestId('study-comment-input')).toHaveCount(0);

  const csrf = await page.request.get('/api/auth/csrf');
  const { token } = (await csrf.json()) as { token: string };
  for (const [targetType, target] of [['material-version', material], ['study', study]] as const) {
    const answer = await page.request.post('/api/comments', {
      data: { targetType, targetId: target?.id, body: 'a viewer may not write this' },
      headers: { 'x-csrf-token': token },
    });
    expect(answer.status(), `viewer POST /api/comments on a ${targetType}`).toBe(403);
  }
});
