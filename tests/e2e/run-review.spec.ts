/**
 * Review of a run on the run monitor. The demo analyst solves a quick strip run, finds its past
 * log lines on the monitor (also after a reload, each line once), and asks for a review; the demo
 * reviewer comments, is stopped from rejecting without a reason, and approves; the demo viewer
 * sees where the review stands and the comments but no control, and the API refuses the viewer's
 * own review and comment.
 */
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { ARTIFACTS, signInViaApi, waitForData } from './support';
import { submitQuickRun } from './support-runs';

let runId = '';
const analystComment = 'Please check the unloading branch of the strip (e2e).';
const reviewerComment = 'Residuals fall fast in every increment; the loop closes. Approving (e2e).';

test.describe.serial('run review', () => {
  test('analyst sees the past log of a finished run and requests its review', async ({ page }) => {
    test.setTimeout(360_000);
    await signInViaApi(page.request, 'analyst');
    ({ runId } = await submitQuickRun(page.request, `E2E review strip ${Date.now()}`));

    // The run finished before the page opened: its lines come from the stored log.
    await page.goto(`/runs/${runId}`);
    await waitForData(page);
    await expect(page.getByTestId('run-state')).toHaveAttribute('data-status', 'succeeded');
    const modelLine = page.getByTestId('run-log-line').filter({ hasText: 'Model: 33 nodes' });
    await expect(modelLine).toHaveCount(1);
    await expect(page.getByTestId('run-log-line').last()).toContainText('Run succeeded: Converged');
    const linesBefore = await page.getByTestId('run-log-line').count();
    await page.reload();
    await waitForData(page);
    await expect(modelLine).toHaveCount(1);
    // The Socket.IO join backfills again; a line read twice is still shown once.
    await expect(page.getByTestId('run-log-line')).toHaveCount(linesBefore);

    const review = page.getByTestId('run-review');
    await expect(review.getByTestId('run-review-state')).toHaveText('not requested');
    await expect(review.getByTestId('run-approve')).toHaveCount(0);
    await review.getByTestId('run-request-review').click();
    await expect(review.getByTestId('run-review-state')).toHaveText('review requested');
    await expect(review.getByTestId('run-request-review')).toHaveCount(0);

    await review.getByTestId('run-comment-input').fill(analystComment);
    await review.getByTestId('run-comment-add').click();
    await expect(review.getByTestId('run-comments')).toContainText(analystComment);
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'run-review-requested.png'), fullPage: true });
  });

  test('reviewer comments, cannot reject without a reason, and approves', async ({ page }) => {
    test.skip(!runId, 'needs the run of the previous test');
    await signInViaApi(page.request, 'reviewer');
    await page.goto(`/runs/${runId}`);
    await waitForData(page);
    const review = page.getByTestId('run-review');
    await expect(review.getByTestId('run-review-state')).toHaveText('review requested');
    await expect(review.getByTestId('run-comments')).toContainText(analystComment);
    await expect(review.getByTestId('run-request-review')).toHaveCount(0);
    // A reviewer acts on the review only: no run controls.
    await expect(page.getByTestId('run-rerun')).toHaveCount(0);

    await review.getByTestId('run-comment-input').fill(reviewerComment);
    await review.getByTestId('run-comment-add').click();
    await expect(review.getByTestId('run-comments').locator('li')).toHaveCount(2);
    await expect(review.getByTestId('run-comments').locator('li').last()).toContainText(reviewerComment);

    await review.getByTestId('run-reject').click();
    const dialog = page.getByRole('dialog', { name: 'Reject this run?' });
    await dialog.getByTestId('run-review-confirm').click();
    await expect(dialog).toContainText('Say why the run is rejected.');
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    await expect(review.getByTestId('run-review-state')).toHaveText('review requested');

    await review.getByTestId('run-approve').click();
    const approve = page.getByRole('dialog', { name: 'Approve this run?' });
    await approve.getByTestId('run-review-reason-input').fill('Inputs and convergence checked (e2e).');
    await approve.getByTestId('run-review-confirm').click();
    await expect(review.getByTestId('run-review-state')).toHaveText('approved');
    await expect(review.getByTestId('run-review-reason')).toContainText('Inputs and convergence checked (e2e).');
    await expect(review.getByTestId('run-approve')).toHaveCount(0);
    await expect(review.getByTestId('run-reject')).toHaveCount(0);

    const stored = (await (await page.request.get(`/api/runs/${runId}`)).json()) as { reviewStatus: string };
    expect(stored.reviewStatus).toBe('approved');
    await page.screenshot({ path: path.join(ARTIFACTS, 'screens', 'run-review-approved.png'), fullPage: true });
  });

  test('viewer sees the review and the comments without controls; the API refuses the viewer', async ({ page }) => {
    test.skip(!runId, 'needs the run of the previous test');
    await signInViaApi(page.request, 'viewer');
    await page.goto(`/runs/${runId}`);
    await waitForData(page);
    const review = page.getByTestId('run-review');
    await expect(review.getByTestId('run-review-state')).toHaveText('approved');
    await expect(review.getByTestId('run-comments')).toContainText(reviewerComment);
    for (const control of ['run-request-review', 'run-approve', 'run-reject', 'run-comment-input', 'run-comment-add']) {
      await expect(review.getByTestId(control), control).toHaveCount(0);
    }
    await expect(page.getByTestId('run-log-line').filter({ hasText: 'Model: 33 nodes' })).toHaveCount(1);

    // The project's run list says where the review stands too.
    await page.goto('/runs');
    await waitForData(page);
    const row = page.getByTestId('runs-table').locator('tr', { has: page.locator(`a[href="/runs/${runId}"]`) });
    await expect(row.getByTestId('runs-review')).toHaveText('approved');

    const { token } = (await (await page.request.get('/api/auth/csrf')).json()) as { token: string };
    const headers = { 'x-csrf-token': token };
    const decide = await page.request.post(`/api/runs/${runId}/review`, { headers, data: { decision: 'reject', reason: 'viewer tries' } });
    expect(decide.status()).toBe(403);
    const comment = await page.request.post('/api/comments', { headers, data: { targetType: 'run', targetId: runId, body: 'viewer tries' } });
    expect(comment.status()).toBe(403);
    expect((await page.request.post(`/api/runs/${runId}/request-review`, { headers, data: {} })).status()).toBe(403);
    // The refusals changed nothing.
    const after = (await (await page.request.get(`/api/runs/${runId}`)).json()) as { reviewStatus: string };
    expect(after.reviewStatus).toBe('approved');
  });
});
