/**
 * The worker's stored run log on a real database: lines land in order with a seq that counts on
 * across attempts, and an attempt keeps only its first lines, the last kept one saying so.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { createTestDatabase, type TestDatabase } from '@phaseloop/api/testing/test-database';
import { capNotice, openRunLog } from './run-log';

let db: TestDatabase;
let pool: pg.Pool;
let projectId: string;
let studyId: string;
let number = 0;

beforeAll(async () => {
  db = await createTestDatabase();
  pool = new pg.Pool({ connectionString: db.url, max: 3 });
  projectId = (await pool.query<{ id: string }>(`INSERT INTO projects (name) VALUES ('P') RETURNING id`)).rows[0]!.id;
  studyId = (await pool.query<{ id: string }>(`INSERT INTO studies (project_id, name, definition) VALUES ($1, 'S', '{}') RETURNING id`, [projectId])).rows[0]!.id;
});
afterAll(async () => {
  await pool?.end();
  await db?.drop();
});

async function newRun(): Promise<string> {
  number += 1;
  const { rows } = await pool.query<{ id: string }>(
    `INSERT INTO runs (project_id, study_id, number, state, snapshot, solver_version, queued_at) VALUES ($1, $2, $3, 'running', '{}', 'test', now()) RETURNING id`,
    [projectId, studyId, number],
  );
  return rows[0]!.id;
}

const stored = async (runId: string) =>
  (await pool.query<{ seq: number; attempt: number; level: string; message: string }>('SELECT seq, attempt, level, message FROM run_log_lines WHERE run_id = $1 ORDER BY seq', [runId])).rows;

describe('run log', () => {
  it('stores lines in order and goes on counting in a later attempt', async () => {
    const runId = await newRun();
    const first = await openRunLog(pool, runId, 1);
    const added = ['a', 'b', 'c'].map((m) => first.add('info', m));
    await first.close();
    expect(added.map((lines) => lines.map((l) => l.seq))).toEqual([[0], [1], [2]]);

    const second = await openRunLog(pool, runId, 2);
    expect(second.add('warn', 'again')[0]).toMatchObject({ seq: 3, attempt: 2, level: 'warn' });
    await second.close();
    expect(await stored(runId)).toEqual([
      { seq: 0, attempt: 1, level: 'info', message: 'a' },
      { seq: 1, attempt: 1, level: 'info', message: 'b' },
      { seq: 2, attempt: 1, level: 'info', message: 'c' },
      { seq: 3, attempt: 2, level: 'warn', message: 'again' },
    ]);
  });

  it('keeps the first lines of an attempt and says that later ones were not stored', async () => {
    const runId = await newRun();
    const log = await openRunLog(pool, runId, 1, { maxLines: 4 });
    const shown = Array.from({ length: 7 }, (_, i) => log.add('warn', `cut back ${i}`)).flat();
    await log.close();

    const rows = await stored(runId);
    expect(rows.map((r) => r.message)).toEqual(['cut back 0', 'cut back 1', 'cut back 2', capNotice(4, 1)]);
    expect(rows.map((r) => r.seq)).toEqual([0, 1, 2, 3]);
    // Every line is still shown live; only the stored ones carry a seq.
    expect(shown.map((l) => l.message)).toEqual(['cut back 0', 'cut back 1', 'cut back 2', capNotice(4, 1), 'cut back 3', 'cut back 4', 'cut back 5', 'cut back 6']);
    expect(shown.filter((l) => l.seq !== undefined).map((l) => l.seq)).toEqual([0, 1, 2, 3]);

    // A new attempt has room again.
    const next = await openRunLog(pool, runId, 2, { maxLines: 4 });
    expect(next.add('info', 'fresh')[0]?.seq).toBe(4);
    await next.close();
  });
});
