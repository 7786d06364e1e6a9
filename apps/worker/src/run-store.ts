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
  /** 1 for the first attempt; higher after a worker died while solving it. */
  attempt: number;
}

export type ClaimResult =
  | { kind: 'claimed'; run: ClaimedRun }
  /** Cancelled, deleted or already taken: the job is dropped. */
  | { kind: 'gone' }
  /** The submitter already has as many runs running as their limit allows: try again later. */
  | { kind: 'limited'; priority: number };

/**
 * queued → running, atomically, within the submitter's limit of runs at once. A per-user advisory
 * lock serialises the count-and-claim of two workers picking up the same user's runs together.
 * The rows of an earlier, interrupted attempt are deleted here, before the new attempt writes any.
 */
export async function claimRun(pool: pg.Pool, runId: string, workerId: string, clearResults: (runId: string, client: pg.PoolClient) => Promise<void>): Promise<ClaimResult> {
  const client = await pool.connect();
  try {
    await client.query('BEGIN');
    const { rows } = await client.query<{ submitted_by: string | null; priority: number }>(
      `SELECT submitted_by, priority FROM runs WHERE id = $1 AND state = 'queued' AND cancel_requested_at IS NULL AND deleted_at IS NULL FOR UPDATE`,
      [runId],
    );
    const row = rows[0];
    if (!row) {
      await client.query('ROLLBACK');
      return { kind: 'gone' };
    }
    if (row.submitted_by) {
      await client.query(`SELECT pg_advisory_xact_lock(hashtext('phaseloop-run-user:' || $1))`, [row.submitted_by]);
      const { rows: limit } = await client.query<{ running: string; max: number }>(
        `SELECT (SELECT count(*) FROM runs WHERE submitted_by = $1 AND state = 'running') AS running,
                (SELECT max_active_runs FROM users WHERE id = $1) AS max`,
        [row.submitted_by],
      );
      if (limit[0] && limit[0].max !== null && Number(limit[0].running) >= limit[0].max) {
        await client.query('ROLLBACK');
        return { kind: 'limited', priority: row.priority };
      }
    }
    await clearResults(runId, client);
    const claimed = await client.query<{ id: string; project_id: string; snapshot: RunSnapshotForSolver; attempts: number }>(
      `UPDATE runs SET state = 'running', started_at = now(), worker_id = $2, message = '', progress = '{}', attempts = attempts + 1
        WHERE id = $1 RETURNING id, project_id, snapshot, attempts`,
      [runId, workerId],
    );
    await client.query('COMMIT');
    const c = claimed.rows[0]!;
    return { kind: 'claimed', run: { id: c.id, projectId: c.project_id, snapshot: c.snapshot, attempt: c.attempts } };
  } catch (err) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
}

/** True once the run was cancelled, or is no longer this attempt's to solve (expired, deleted, restarted). */
export async function cancelRequested(pool: pg.Pool, runId: string, workerId: string): Promise<boolean> {
  const { rows } = await pool.query<{ c: boolean }>(
    `SELECT cancel_requested_at IS NOT NULL OR state <> 'running' OR worker_id IS DISTINCT FROM $2 OR deleted_at IS NOT NULL AS c FROM runs WHERE id = $1`,
    [runId, workerId],
  );
  return rows[0]?.c ?? true;
}

/** Rows of the result tables (pg storage); objects in S3 are removed by the result store. */
export async function deleteResultRows(client: pg.Pool | pg.PoolClient, runId: string): Promise<void> {
  await client.query('DELETE FROM run_iterations WHERE run_id = $1', [runId]);
  await client.query('DELETE FROM run_frames WHERE run_id = $1', [runId]);
  await client.query('DELETE FROM run_artifacts WHERE run_id = $1', [runId]);
}

export async function finishRun(pool: pg.Pool, runId: string, state: Extract<RunState, 'succeeded' | 'failed' | 'cancelled'>, message: string): Promise<void> {
  await pool.query(`UPDATE runs SET state = $2, finished_at = now(), message = $3 WHERE id = $1 AND state = 'running'`, [runId, state, message]);
}

/** Back to the queue after an interrupted attempt (worker shutdown): partial results are dropped. */
export async function requeueRun(pool: pg.Pool, runId: string, jobId: string): Promise<void> {
  // A graceful stop is not a failed attempt: the count goes back down.
  await pool.query(
    `UPDATE runs SET state = 'queued', started_at = NULL, worker_id = NULL, job_id = $2, queued_at = now(), progress = '{}',
            attempts = greatest(attempts - 1, 0)
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
  const history = { ...report.history, ...(report.summary ? { maxVonMises: report.summary.maxVonMises, maxXi: report.summary.maxXi } : {}) };
  await pool.query(
    'INSERT INTO run_frames (run_id, frame, segment, increment, time, history) VALUES ($1, $2, $3, $4, $5, $6)',
    [runId, frame, report.segment, report.increment, report.time, JSON.stringify(history)],
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

export interface StaleRun { id: string; attempts: number; priority: number }

/**
 * Runs whose worker stopped answering (killed, machine lost): back to the queue from the
 * beginning while attempts remain, otherwise failed with the reason. SKIP LOCKED lets every
 * worker run this sweep without two of them handling the same run.
 */
export async function reapStaleRuns(pool: pg.Pool, staleSeconds: number, maxAttempts: number): Promise<{ requeued: StaleRun[]; failed: StaleRun[] }> {
  const client = await pool.connect();
  try {
    await client.query('BEGIN');
    const { rows } = await client.query<StaleRun>(
      `SELECT r.id, r.attempts, r.priority FROM runs r LEFT JOIN workers w ON w.id = r.worker_id
        WHERE r.state = 'running' AND r.started_at < now() - make_interval(secs => $1)
          AND (w.id IS NULL OR w.last_seen_at < now() - make_interval(secs => $1))
        FOR UPDATE OF r SKIP LOCKED`,
      [staleSeconds],
    );
    const requeued = rows.filter((r) => r.attempts < maxAttempts);
    const failed = rows.filter((r) => r.attempts >= maxAttempts);
    for (const r of requeued) {
      await client.query(
        `UPDATE runs SET state = 'queued', queued_at = now(), started_at = NULL, worker_id = NULL, progress = '{}',
                message = $2 WHERE id = $1`,
        [r.id, `Restarted from the beginning: the worker solving it stopped answering (attempt ${r.attempts} of ${maxAttempts})`],
      );
    }
    for (const r of failed) {
      await client.query(
        `UPDATE runs SET state = 'failed', finished_at = now(), message = $2 WHERE id = $1`,
        [r.id, `The worker solving this run stopped answering ${r.attempts} times (it may run out of memory or time); the run was given up. Coarsen the model or ask an admin to check the workers.`],
      );
    }
    await client.query('COMMIT');
    return { requeued, failed };
  } catch (err) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
}

/** Runs running for longer than the limit are failed as stuck; their worker sees it at its next cancel check. */
export async function expireStuckRuns(pool: pg.Pool, maxSeconds: number): Promise<string[]> {
  const { rows } = await pool.query<{ id: string }>(
    `UPDATE runs SET state = 'failed', finished_at = now(), message = $2
      WHERE state = 'running' AND started_at < now() - make_interval(secs => $1) RETURNING id`,
    [maxSeconds, `The run was stopped after more than ${Math.round(maxSeconds / 60)} minutes of solving (stuck or far too large); check the increments and mesh, then re-run.`],
  );
  return rows.map((r) => r.id);
}

export async function setJobId(pool: pg.Pool, runId: string, jobId: string): Promise<void> {
  await pool.query(`UPDATE runs SET job_id = $2 WHERE id = $1 AND state = 'queued'`, [runId, jobId]);
}
