/**
 * The queue's safety nets on a real database: a run whose worker stopped answering goes back to
 * the queue (from the beginning) until its attempts are used up, then fails with the reason; a
 * run solving for longer than the limit is failed as stuck; the per-user limit holds at pick-up.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { createTestDatabase, type TestDatabase } from '@phaseloop/api/testing/test-database';
import { claimRun, deleteResultRows, expireStuckRuns, reapStaleRuns } from './run-store';

let db: TestDatabase;
let pool: pg.Pool;
let userId: string;
let projectId: string;
let studyId: string;
let number = 0;

beforeAll(async () => {
  db = await createTestDatabase();
  pool = new pg.Pool({ connectionString: db.url, max: 3 });
  userId = (await pool.query<{ id: string }>(`INSERT INTO users (email, name, password_hash, max_active_runs) VALUES ('w@w.test', 'W', 'x', 1) RETURNING id`)).rows[0]!.id;
  projectId = (await pool.query<{ id: string }>(`INSERT INTO projects (name) VALUES ('P') RETURNING id`)).rows[0]!.id;
  studyId = (await pool.query<{ id: string }>(`INSERT INTO studies (project_id, name, definition) VALUES ($1, 'S', '{}') RETURNING id`, [projectId])).rows[0]!.id;
});
afterAll(async () => {
  await pool?.end();
  await db?.drop();
});

async function run(state: string, extra: { workerId?: string; attempts?: number; startedSecondsAgo?: number } = {}): Promise<string> {
  number += 1;
  const { rows } = await pool.query<{ id: string }>(
    `INSERT INTO runs (project_id, study_id, number, state, snapshot, solver_version, submitted_by, queued_at, started_at, worker_id, attempts)
     VALUES ($1, $2, $3, $4, '{}', 'test', $5, now(), CASE WHEN $6::int IS NULL THEN NULL ELSE now() - make_interval(secs => $6::int) END, $7, $8) RETURNING id`,
    [projectId, studyId, number, state, userId, extra.startedSecondsAgo ?? null, extra.workerId ?? null, extra.attempts ?? 0],
  );
  return rows[0]!.id;
}

const stateOf = async (id: string) => (await pool.query<{ state: string; message: string; attempts: number }>('SELECT state, message, attempts FROM runs WHERE id = $1', [id])).rows[0]!;

describe('run store', () => {
  it('restarts runs of a dead worker while attempts remain, then fails them with the reason', async () => {
    await pool.query(`INSERT INTO workers (id, hostname, pid, last_seen_at) VALUES ('dead', 'h', 1, now() - interval '1 minute'), ('alive', 'h', 2, now())`);
    const orphan = await run('running', { workerId: 'dead', attempts: 1, startedSecondsAgo: 50 });
    const spent = await run('running', { workerId: 'dead', attempts: 3, startedSecondsAgo: 50 });
    const healthy = await run('running', { workerId: 'alive', attempts: 1, startedSecondsAgo: 50 });
    const { requeued, failed } = await reapStaleRuns(pool, 30, 3);
    expect(requeued.map((r) => r.id)).toEqual([orphan]);
    expect(failed.map((r) => r.id)).toEqual([spent]);
    expect(await stateOf(orphan)).toMatchObject({ state: 'queued', attempts: 1 });
    expect((await stateOf(spent)).state).toBe('failed');
    expect((await stateOf(spent)).message).toContain('stopped answering 3 times');
    expect((await stateOf(healthy)).state).toBe('running');
    // Swept once: a second sweep finds nothing.
    expect(await reapStaleRuns(pool, 30, 3)).toEqual({ requeued: [], failed: [] });
    await pool.query(`UPDATE runs SET state = 'succeeded' WHERE id = $1`, [healthy]);
  });

  it('fails runs stuck beyond the time limit', async () => {
    const stuck = await run('running', { workerId: 'alive', attempts: 1, startedSecondsAgo: 7200 });
    expect(await expireStuckRuns(pool, 3600)).toEqual([stuck]);
    expect(await stateOf(stuck)).toMatchObject({ state: 'failed' });
  });

  it("holds a run back while its submitter is at their limit, and clears an earlier attempt's rows on claim", async () => {
    await pool.query(`UPDATE runs SET state = 'failed' WHERE state IN ('queued', 'running')`);
    const first = await run('queued');
    const second = await run('queued');
    const claimed = await claimRun(pool, first, 'alive', (id, client) => deleteResultRows(client, id));
    expect(claimed.kind).toBe('claimed');
    // max_active_runs = 1 for this user.
    expect((await claimRun(pool, second, 'alive', (id, client) => deleteResultRows(client, id))).kind).toBe('limited');
    await pool.query(`UPDATE runs SET state = 'queued' WHERE id = $1`, [first]);
    await pool.query(`INSERT INTO run_frames (run_id, frame, segment, increment, time) VALUES ($1, 0, 0, 1, 0.5)`, [first]);
    const again = await claimRun(pool, first, 'alive', (id, client) => deleteResultRows(client, id));
    expect(again.kind === 'claimed' && again.run.attempt).toBe(2);
    expect((await pool.query('SELECT count(*)::int AS n FROM run_frames WHERE run_id = $1', [first])).rows[0].n).toBe(0);
  });
});
