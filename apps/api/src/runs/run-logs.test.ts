/**
 * The stored run log (GET /api/runs/:id/logs): lines come back oldest first and page with
 * afterSeq and limit, project members read them (viewers too), anyone else gets 404, a bad page
 * parameter is a 400 naming the field, and deleting the run takes its lines with it.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../testing/test-app';
import { Study } from '../studies/studies.model';
import { Run } from './runs.model';

let t: TestApp;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

async function finishedRun(projectId: string, userId: string): Promise<Run> {
  const study = await Study.create({ projectId, name: 'Strip pull', definition: { materials: [] }, createdBy: null });
  return Run.create({
    projectId, studyId: study.id, sweepId: null, number: 1, state: 'succeeded', message: 'Converged', solverVersion: 'test', submittedBy: userId,
    queuedAt: new Date(), finishedAt: new Date(),
    snapshot: { study: { id: study.id, name: study.name, revision: 1, definition: { materials: [] } }, materials: [], solverVersion: 'test', submittedAt: new Date().toISOString() },
  });
}

/** Lines as the worker writes them: attempt 1 with seq 0–2, then a restarted attempt 2 going on with seq 3–4. */
const LINES = [
  { seq: 0, attempt: 1, level: 'info', message: 'Model: 45 nodes, 32 elements, 2 segment(s)' },
  { seq: 1, attempt: 1, level: 'warn', message: 'Segment "load" at t = 0.5000 s: increment cut back (residual grew)' },
  { seq: 2, attempt: 1, level: 'warn', message: 'The worker was shut down during this attempt; the run goes back to the queue.' },
  { seq: 3, attempt: 2, level: 'info', message: 'Model: 45 nodes, 32 elements, 2 segment(s)' },
  { seq: 4, attempt: 2, level: 'info', message: 'Run succeeded: Converged' },
] as const;

async function storeLines(runId: string): Promise<void> {
  // Inserted out of order on purpose: the answer must be ordered by seq, not by insertion.
  for (const l of [...LINES].reverse()) {
    await t.ctx.pool.query(
      'INSERT INTO run_log_lines (run_id, seq, attempt, level, message, created_at) VALUES ($1, $2, $3, $4, $5, $6)',
      [runId, l.seq, l.attempt, l.level, l.message, new Date(Date.UTC(2026, 0, 1, 12, 0, l.seq))],
    );
  }
}

describe('stored run log', () => {
  it('answers the lines in seq order, paged with afterSeq and limit, to members only', async () => {
    const project = await t.createProject();
    const analyst = await t.signIn({ project, role: 'analyst' });
    const viewer = await t.signIn({ project, role: 'viewer' });
    const outsider = await t.signIn({ project: await t.createProject(), role: 'admin' });
    const run = await finishedRun(project.id, analyst.user.id);
    await storeLines(run.id);

    const all = (await analyst.client.get(`/api/runs/${run.id}/logs`).expect(200)).body as { seq: number; attempt: number; level: string; message: string; at: string }[];
    expect(all.map((l) => l.seq)).toEqual([0, 1, 2, 3, 4]);
    expect(all[0]).toEqual({ seq: 0, attempt: 1, level: 'info', message: LINES[0].message, at: '2026-01-01T12:00:00.000Z' });
    expect(all[3]).toMatchObject({ seq: 3, attempt: 2 });

    const after = (await viewer.client.get(`/api/runs/${run.id}/logs?afterSeq=2`).expect(200)).body as { seq: number; message: string }[];
    expect(after.map((l) => l.seq)).toEqual([3, 4]);
    expect(after[1]!.message).toBe('Run succeeded: Converged');

    const page = (await viewer.client.get(`/api/runs/${run.id}/logs?afterSeq=0&limit=2`).expect(200)).body as { seq: number }[];
    expect(page.map((l) => l.seq)).toEqual([1, 2]);
    expect((await viewer.client.get(`/api/runs/${run.id}/logs?afterSeq=4`).expect(200)).body).toEqual([]);

    const outsiderAnswer = await outsider.client.get(`/api/runs/${run.id}/logs`).expect(404);
    expect(outsiderAnswer.body.error.code).toBe('not_found');
  });

  it('refuses a bad page parameter with a 400 that names it', async () => {
    const project = await t.createProject();
    const analyst = await t.signIn({ project, role: 'analyst' });
    const run = await finishedRun(project.id, analyst.user.id);
    const bad = await analyst.client.get(`/api/runs/${run.id}/logs?afterSeq=abc`).expect(400);
    expect(bad.body.error.details).toContainEqual(expect.objectContaining({ path: 'afterSeq' }));
    const tooMany = await analyst.client.get(`/api/runs/${run.id}/logs?limit=100000`).expect(400);
    expect(tooMany.body.error.details).toContainEqual(expect.objectContaining({ path: 'limit', message: 'limit must be at most 5000' }));
  });

  it('keeps one line per seq and loses the lines with their run', async () => {
    const project = await t.createProject();
    const analyst = await t.signIn({ project, role: 'analyst' });
    const run = await finishedRun(project.id, analyst.user.id);
    await storeLines(run.id);
    await expect(t.ctx.pool.query(
      `INSERT INTO run_log_lines (run_id, seq, attempt, level, message) VALUES ($1, 0, 1, 'info', 'again')`, [run.id],
    )).rejects.toThrow(/duplicate key/);
    await expect(t.ctx.pool.query(
      `INSERT INTO run_log_lines (run_id, seq, attempt, level, message) VALUES ($1, 9, 1, 'debug', 'unknown level')`, [run.id],
    )).rejects.toThrow(/check constraint/);

    await analyst.client.delete(`/api/runs/${run.id}`).expect(204);
    const { rows } = await t.ctx.pool.query<{ n: number }>('SELECT count(*)::int AS n FROM run_log_lines WHERE run_id = $1', [run.id]);
    expect(rows[0]!.n).toBe(0);
  });
});
