/**
 * A real run leaves its log behind: the API in this process, worker processes solving the
 * superelastic strip of examples/ with fe-core. After the run, GET /runs/:id/logs holds the
 * solver's "Model: …" line and the outcome, and the live run:log events carried the same seq as
 * the stored lines (the run monitor relies on that to merge past and live lines without doubles).
 * A run whose worker is killed keeps the lines of that attempt, and the next attempt counts on.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import pg from 'pg';
import { startApiServer, loadConfig, type RunningServer } from '@phaseloop/api';
import { createTestDatabase, type TestDatabase } from '@phaseloop/api/testing/test-database';
import { hashPassword } from '@phaseloop/api/auth/password';
import { RUN_SOCKET_EVENTS, runLogLineSchema, type RunLogEvent } from '@phaseloop/shared';
import { openSocket, repoRoot, signIn, sleep, spawnWorker, stopProcess, waitForState, watch, type Session, type WorkerProcess } from './harness';

const strip = JSON.parse(readFileSync(`${repoRoot}examples/superelastic-strip.json`, 'utf8')) as {
  materials: Record<string, Record<string, unknown>>; nodes: unknown[]; elements: unknown[]; segments: unknown[];
};
const materialName = Object.keys(strip.materials)[0]!;

let db: TestDatabase;
let api: RunningServer;
let pool: pg.Pool;
const workers: WorkerProcess[] = [];
let analyst: Session;
let viewer: Session;
let outsider: Session;
let studyId: string;

beforeAll(async () => {
  db = await createTestDatabase({ migrate: false });
  const config = loadConfig({ ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'warn' }, { DATABASE_URL: db.url, PORT: 0, WEB_DIST: '', SMTP_HOST: '' });
  api = await startApiServer(config);
  pool = new pg.Pool({ connectionString: db.url, max: 3 });
  const hash = await hashPassword('integration-password');
  const { rows } = await pool.query<{ id: string; email: string }>(
    `INSERT INTO users (email, name, password_hash) VALUES ('analyst@log.test', 'Ana Analyst', $1), ('viewer@log.test', 'Vi Viewer', $1), ('outsider@log.test', 'Out Sider', $1)
     RETURNING id, email`,
    [hash],
  );
  const id = (who: string) => rows.find((r) => r.email.startsWith(who))!.id;
  const { rows: projects } = await pool.query<{ id: string }>(`INSERT INTO projects (name) VALUES ('Log project'), ('Elsewhere') RETURNING id`);
  await pool.query(
    `INSERT INTO project_members (project_id, user_id, role) VALUES ($1, $2, 'analyst'), ($1, $3, 'viewer'), ($4, $5, 'admin')`,
    [projects[0]!.id, id('analyst'), id('viewer'), projects[1]!.id, id('outsider')],
  );
  [analyst, viewer, outsider] = await Promise.all(['analyst', 'viewer', 'outsider'].map((u) => signIn(api.url, `${u}@log.test`, 'integration-password')));

  const material = await analyst.agent.post(`/api/projects/${projects[0]!.id}/materials`).set('x-csrf-token', analyst.csrf)
    .send({ name: 'Demo NiTi (demo values)', params: strip.materials[materialName] }).expect(201);
  const model = { ...strip, materials: { [materialName]: { materialVersionId: material.body.latest.id } } };
  const study = await analyst.agent.post(`/api/projects/${projects[0]!.id}/studies`).set('x-csrf-token', analyst.csrf).send({ name: 'Strip pull', definition: { model } });
  expect(study.status, JSON.stringify(study.body)).toBe(201);
  studyId = study.body.id;
});

afterAll(async () => {
  for (const w of workers) await stopProcess(w.child);
  await api?.close();
  await pool?.end();
  await db?.drop();
});

describe('stored run log of a real run', () => {
  it('keeps the model line and the outcome, with the seq the live events carried', async () => {
    const submitted = await analyst.agent.post(`/api/studies/${studyId}/runs`).set('x-csrf-token', analyst.csrf);
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(201);
    const runId = submitted.body.id as string;

    const socket = await openSocket(api.url, analyst);
    const live: RunLogEvent[] = [];
    socket.on(RUN_SOCKET_EVENTS.log, (e: RunLogEvent) => { if (e.runId === runId) live.push(e); });
    expect(await watch(socket, runId)).toEqual({ ok: true });
    const done = waitForState(socket, runId, ['succeeded', 'failed', 'cancelled']);
    workers.push(await spawnWorker('tests/integration/fixtures/fe-worker.ts', { DATABASE_URL: db.url, WORKER_ID: 'log-w1' }));
    const final = await done;
    // Events and the answer to a request travel separately; let the last events arrive.
    await sleep(200);
    socket.close();
    expect(final.state).toBe('succeeded');

    const answer = await viewer.agent.get(`/api/runs/${runId}/logs`).expect(200);
    const lines = (answer.body as unknown[]).map((l) => runLogLineSchema.parse(l));
    const modelLine = `Model: ${strip.nodes.length} nodes, ${strip.elements.length} elements, ${strip.segments.length} segment(s)`;
    expect(lines[0]).toMatchObject({ seq: 0, attempt: 1, level: 'info', message: modelLine });
    expect(lines.at(-1)).toMatchObject({ level: 'info', message: expect.stringMatching(/^Run succeeded: Converged: \d+ increments/) });
    expect(lines.map((l) => l.seq)).toEqual(lines.map((_, i) => i));

    // Every live line was stored under the seq it carried (no cap is reached by this small run).
    expect(live.map((e) => [e.seq, e.message])).toEqual(lines.map((l) => [l.seq, l.message]));

    // Paging from the middle answers the rest.
    const rest = await viewer.agent.get(`/api/runs/${runId}/logs?afterSeq=0`).expect(200);
    expect((rest.body as { seq: number }[]).map((l) => l.seq)).toEqual(lines.slice(1).map((l) => l.seq));
    expect((await outsider.agent.get(`/api/runs/${runId}/logs`)).status).toBe(404);
  });

  it('keeps the lines of an attempt whose worker was killed, and goes on counting in the next one', async () => {
    workers.push(await spawnWorker('tests/integration/fixtures/fe-worker.ts', { DATABASE_URL: db.url, WORKER_ID: 'log-w2' }));
    const submitted = await analyst.agent.post(`/api/studies/${studyId}/runs`).set('x-csrf-token', analyst.csrf).expect(201);
    const runId = submitted.body.id as string;
    const solving = await until('three frames of the first attempt', async () => {
      const { rows } = await pool.query<{ worker_id: string; frames: string }>(
        `SELECT r.worker_id, (SELECT count(*) FROM run_frames f WHERE f.run_id = r.id) AS frames FROM runs r WHERE r.id = $1 AND r.state = 'running'`, [runId],
      );
      return rows[0] && Number(rows[0].frames) >= 3 ? rows[0] : null;
    });
    const victim = workers.find((w) => w.id === solving.worker_id)!;
    await stopProcess(victim.child, 'SIGKILL');
    const final = await until('the restarted run to finish', async () => {
      const { rows } = await pool.query<{ state: string; attempts: number }>('SELECT state, attempts FROM runs WHERE id = $1', [runId]);
      return rows[0] && ['succeeded', 'failed', 'cancelled'].includes(rows[0].state) ? rows[0] : null;
    }, 90_000);
    expect(final).toEqual({ state: 'succeeded', attempts: 2 });

    const lines = ((await analyst.agent.get(`/api/runs/${runId}/logs`).expect(200)).body as unknown[]).map((l) => runLogLineSchema.parse(l));
    expect(lines.map((l) => l.seq)).toEqual(lines.map((_, i) => i));
    const first = lines.filter((l) => l.attempt === 1);
    const second = lines.filter((l) => l.attempt === 2);
    // The killed attempt wrote its model line before it died; nothing of it was lost or rewritten.
    expect(first[0]?.message).toMatch(/^Model: \d+ nodes/);
    expect(first.some((l) => l.message.startsWith('Run '))).toBe(false);
    // Cut-back lines, if any, sit between the model line and the outcome.
    expect(second[0]?.message).toBe('Attempt 2 of 3: solving again from the beginning.');
    expect(second[1]?.message).toMatch(/^Model: \d+ nodes/);
    expect(second.at(-1)?.message).toMatch(/^Run succeeded: /);
  });
});

async function until<T>(what: string, probe: () => Promise<T | undefined | null | false>, timeoutMs = 60_000): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await sleep(50);
  }
}
