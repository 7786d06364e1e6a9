/**
 * The worker's reads and writes of run rows (plain SQL over pg: a worker on another machine needs
 * nothing but the database). Result files are written in chunks so large fields never sit whole
 * in one query.
 */
import type pg from 'pg';
import type { RunState } from '@phaseloop/shared';
import type { IterationReport, FrameReport, RunSnapshotForSolver } from './solver';

export const CHUNK_BYTES = 512 * 1024;

export interface ClaimedRun {
  id: string;
  projectId: string;
  snapshot: RunSnapshotForSolver;
}

/** queued → running, atomically: a cancelled or already-claimed run is not touched. */
export async function claimRun(pool: pg.Pool, runId: string, workerId: string): Promise<ClaimedRun | null> {
  const { rows } = await pool.query<{ id: string; project_id: string; snapshot: RunSnapshotForSolver }>(
    `UPDATE runs SET state = 'running', started_at = now(), worker_id = $2, message = ''
      WHERE id = $1 AND state = 'queued' AND cancel_requested_at IS NULL
      RETURNING id, project_id, snapshot`,
    [runId, workerId],
  );
  const row = rows[0];
  return row ? { id: row.id, projectId: row.project_id, snapshot: row.snapshot } : null;
}

export async function cancelRequested(pool: pg.Pool, runId: string): Promise<boolean> {
  const { rows } = await pool.query<{ c: boolean }>('SELECT cancel_requested_at IS NOT NULL AS c FROM runs WHERE id = $1', [runId]);
  return rows[0]?.c ?? true;
}

export async function finishRun(pool: pg.Pool, runId: string, state: Extract<RunState, 'succeeded' | 'failed' | 'cancelled'>, message: string): Promise<void> {
  await pool.query(`UPDATE runs SET state = $2, finished_at = now(), message = $3 WHERE id = $1 AND state = 'running'`, [runId, state, message]);
}

/** Back to the queue after an interrupted attempt (worker shutdown): partial results are dropped. */
export async function requeueRun(pool: pg.Pool, runId: string, jobId: string): Promise<void> {
  await pool.query('DELETE FROM run_iterations WHERE run_id = $1', [runId]);
  await pool.query('DELETE FROM run_frames WHERE run_id = $1', [runId]);
  await pool.query('DELETE FROM run_artifacts WHERE run_id = $1', [runId]);
  await pool.query(
    `UPDATE runs SET state = 'queued', started_at = NULL, worker_id = NULL, job_id = $2, queued_at = now(), progress = '{}'
      WHERE id = $1 AND state = 'running'`,
    [runId, jobId],
  );
}

export async function saveIterations(pool: pg.Pool, runId: string, firstSeq: number, batch: IterationReport[]): Promise<void> {
  if (batch.length === 0) return;
  const values: unknown[] = [];
  const tuples = batch.map((it, i) => {
    const b = i * 9;
    values.push(runId, firstSeq + i, it.segment, it.increment, it.iteration, it.time, it.residualNorm, it.correctionNorm, it.cutBacks);
    return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5}, $${b + 6}, $${b + 7}, $${b + 8}, $${b + 9})`;
  });
  await pool.query(
    `INSERT INTO run_iterations (run_id, seq, segment, increment, iteration, time, residual_norm, correction_norm, cut_backs) VALUES ${tuples.join(', ')}`,
    values,
  );
}

export async function saveFrame(pool: pg.Pool, runId: string, frame: number, report: FrameReport): Promise<void> {
  await pool.query(
    'INSERT INTO run_frames (run_id, frame, segment, increment, time, history) VALUES ($1, $2, $3, $4, $5, $6)',
    [runId, frame, report.segment, report.increment, report.time, JSON.stringify(report.history)],
  );
  await pool.query(`UPDATE runs SET progress = $2 WHERE id = $1`, [
    runId,
    JSON.stringify({ frame, segment: report.segment, increment: report.increment, time: report.time }),
  ]);
}

export async function saveFile(pool: pg.Pool, runId: string, name: string, contentType: string, bytes: Uint8Array): Promise<void> {
  const client = await pool.connect();
  try {
    await client.query('BEGIN');
    const { rows } = await client.query<{ id: string }>(
      `INSERT INTO run_artifacts (run_id, name, content_type, size) VALUES ($1, $2, $3, $4)
       ON CONFLICT (run_id, name) DO UPDATE SET content_type = EXCLUDED.content_type, size = EXCLUDED.size, complete = false
       RETURNING id`,
      [runId, name, contentType, bytes.byteLength],
    );
    const id = rows[0]!.id;
    await client.query('DELETE FROM run_artifact_chunks WHERE artifact_id = $1', [id]);
    for (let seq = 0, off = 0; off < bytes.byteLength; seq++, off += CHUNK_BYTES) {
      await client.query('INSERT INTO run_artifact_chunks (artifact_id, seq, bytes) VALUES ($1, $2, $3)', [
        id, seq, Buffer.from(bytes.buffer, bytes.byteOffset + off, Math.min(CHUNK_BYTES, bytes.byteLength - off)),
      ]);
    }
    await client.query('UPDATE run_artifacts SET complete = true WHERE id = $1', [id]);
    await client.query('COMMIT');
  } catch (err) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
}
