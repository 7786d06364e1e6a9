/**
 * A real run leaves its log behind: the API in this process, one worker process solving the
 * superelastic strip of examples/ with fe-core. After the run, GET /runs/:id/logs holds the
 * solver's "Model: …" line and the outcome, and the live run:log events carried the same seq as
 * the stored lines (the run monitor relies on that to merge past and live lines without doubles).
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
let worker: WorkerProcess | undefined;
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
  if (worker) await stopProcess(worker.child);
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
    worker = await spawnWorker('tests/integration/fixtures/fe-worker.ts', { DATABASE_URL: db.url, WORKER_ID: 'log-w1' });
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
});
