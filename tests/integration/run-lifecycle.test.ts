/**
 * A run end to end across processes: the real API (HTTP + Socket.IO with the PostgreSQL adapter)
 * in this process, a worker in a separate process, a browser-side Socket.IO client. Checks the
 * stack-notes gotcha that worker-emitted events reach the browser at all (emitter namespace),
 * the state machine (queued → running → succeeded / cancelled), stored iterations and frames,
 * and a downloaded result file, against the closed-form equilibrium k·u + c·u³ = F.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import request from 'supertest';
import { io as connect, type Socket } from 'socket.io-client';
import pg from 'pg';
import { startApiServer, loadConfig, type RunningServer } from '@phaseloop/api';
import { createTestDatabase, type TestDatabase } from '@phaseloop/api/testing/test-database';
import { hashPassword } from '@phaseloop/api/auth/password';
import { RUN_SOCKET_EVENTS, type RunFrameEvent, type RunIterationEvent, type RunStatusEvent } from '@phaseloop/shared';
import { SPRING, springResidual } from './fixtures/cubic-spring-solver';

const repoRoot = fileURLToPath(new URL('../../', import.meta.url));
let db: TestDatabase;
let api: RunningServer;
let pool: pg.Pool;
const workers: ChildProcess[] = [];

function startWorker(delayMs: number): Promise<ChildProcess> {
  const child = spawn(`${repoRoot}node_modules/.bin/tsx`, ['tests/integration/fixtures/spring-worker.ts'], {
    cwd: repoRoot,
    env: { ...process.env, DATABASE_URL: db.url, SPRING_DELAY_MS: String(delayMs), LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  workers.push(child);
  return new Promise((resolve, reject) => {
    child.stdout!.on('data', (d: Buffer) => {
      if (d.toString().includes('worker-ready')) resolve(child);
    });
    child.once('exit', (code) => reject(new Error(`worker exited with ${code}`)));
  });
}

async function stopWorker(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null) return;
  await new Promise<void>((resolve) => {
    child.once('exit', () => resolve());
    child.kill('SIGTERM');
  });
}

interface Session {
  agent: ReturnType<typeof request.agent>;
  csrf: string;
  cookie: string;
}

async function signIn(email: string, password: string): Promise<Session> {
  const agent = request.agent(api.url);
  let csrf = (await agent.get('/api/auth/csrf').expect(200)).body.token as string;
  const res = await agent.post('/api/auth/login').set('x-csrf-token', csrf).send({ email, password }).expect(200);
  const cookie = String(res.headers['set-cookie']).split(';')[0]!;
  csrf = (await agent.get('/api/auth/csrf').expect(200)).body.token as string;
  return { agent, csrf, cookie };
}

function openSocket(session: Session): Promise<Socket> {
  const socket = connect(api.url, { path: '/socket.io', transports: ['websocket'], extraHeaders: { cookie: session.cookie }, reconnection: false });
  return new Promise((resolve, reject) => {
    socket.once('connect', () => resolve(socket));
    socket.once('connect_error', reject);
  });
}

function watch(socket: Socket, runId: string): Promise<{ ok: boolean; message?: string }> {
  return new Promise((resolve) => socket.emit(RUN_SOCKET_EVENTS.watch, { runId }, resolve));
}

function waitForState(socket: Socket, runId: string, states: string[]): Promise<RunStatusEvent> {
  return new Promise((resolve) => {
    const on = (e: RunStatusEvent) => {
      if (e.runId === runId && states.includes(e.state)) {
        socket.off(RUN_SOCKET_EVENTS.status, on);
        resolve(e);
      }
    };
    socket.on(RUN_SOCKET_EVENTS.status, on);
  });
}

let analyst: Session;
let outsider: Session;
let studyId: string;

beforeAll(async () => {
  db = await createTestDatabase({ migrate: false });
  const config = loadConfig({ ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'warn' }, { DATABASE_URL: db.url, PORT: 0, WEB_DIST: '', SMTP_HOST: '' });
  api = await startApiServer(config);
  pool = new pg.Pool({ connectionString: db.url, max: 3 });
  const hash = await hashPassword('integration-password');
  const { rows: users } = await pool.query<{ id: string; email: string }>(
    `INSERT INTO users (email, name, password_hash) VALUES ('analyst@it.test', 'Analyst', $1), ('outsider@it.test', 'Outsider', $1) RETURNING id, email`,
    [hash],
  );
  const { rows: projects } = await pool.query<{ id: string }>(`INSERT INTO projects (name) VALUES ('Spring project') RETURNING id`);
  const projectId = projects[0]!.id;
  await pool.query(`INSERT INTO project_members (project_id, user_id, role) VALUES ($1, $2, 'analyst')`, [projectId, users.find((u) => u.email === 'analyst@it.test')!.id]);
  analyst = await signIn('analyst@it.test', 'integration-password');
  outsider = await signIn('outsider@it.test', 'integration-password');

  const material = await analyst.agent.post(`/api/projects/${projectId}/materials`).set('x-csrf-token', analyst.csrf)
    .send({ name: 'Spring steel (test)', params: { model: 'linear-elastic', E: 200_000, nu: 0.3 } }).expect(201);
  const study = await analyst.agent.post(`/api/projects/${projectId}/studies`).set('x-csrf-token', analyst.csrf)
    .send({ name: 'Cubic spring', definition: { template: 'spring', materials: [{ materialVersionId: material.body.latest.id }], estimatedNodes: 2 } }).expect(201);
  studyId = study.body.id;
});

afterAll(async () => {
  for (const w of workers) await stopWorker(w);
  await api?.close();
  await pool?.end();
  await db?.drop();
});

describe('a run across API, queue, worker process and browser socket', () => {
  it('refuses to let a non-member follow a run', async () => {
    const submitted = await analyst.agent.post(`/api/studies/${studyId}/runs`).set('x-csrf-token', analyst.csrf).expect(201);
    const socket = await openSocket(outsider);
    try {
      expect(await watch(socket, submitted.body.id)).toEqual({ ok: false, message: 'Run not found' });
    } finally {
      socket.close();
      await analyst.agent.post(`/api/runs/${submitted.body.id}/cancel`).set('x-csrf-token', analyst.csrf).expect(200);
    }
  });

  it('refuses a socket without a signed-in session', async () => {
    const socket = connect(api.url, { path: '/socket.io', transports: ['polling'], reconnection: false });
    const error = await new Promise<Error>((resolve) => socket.once('connect_error', resolve));
    socket.close();
    expect(error).toBeInstanceOf(Error);
  });

  it('queues, solves in the worker process, streams iterations and frames to the browser, and stores the results', async () => {
    const submitted = await analyst.agent.post(`/api/studies/${studyId}/runs`).set('x-csrf-token', analyst.csrf).expect(201);
    const runId: string = submitted.body.id;
    expect(submitted.body.state).toBe('queued');
    expect(submitted.body.queuePosition).toBe(1);
    expect(submitted.body.solverVersion).toMatch(/^fe-core /);

    const socket = await openSocket(analyst);
    const iterations: RunIterationEvent[] = [];
    const frames: RunFrameEvent[] = [];
    const states: string[] = [];
    socket.on(RUN_SOCKET_EVENTS.iteration, (e: RunIterationEvent) => iterations.push(e));
    socket.on(RUN_SOCKET_EVENTS.frame, (e: RunFrameEvent) => frames.push(e));
    socket.on(RUN_SOCKET_EVENTS.status, (e: RunStatusEvent) => states.push(e.state));
    expect(await watch(socket, runId)).toEqual({ ok: true });
    const done = waitForState(socket, runId, ['succeeded', 'failed', 'cancelled']);

    const worker = await startWorker(0);
    const final = await done;
    socket.close();
    await stopWorker(worker);

    expect(final.state).toBe('succeeded');
    expect(states).toContain('running');
    // Every increment converged and was kept as a frame, in order.
    expect(frames.map((f) => f.increment)).toEqual(Array.from({ length: SPRING.increments }, (_, i) => i + 1));
    for (const f of frames) {
      // Closed form: k·u + c·u³ = F holds at every converged frame.
      expect(Math.abs(springResidual(f.history.displacement!, f.history.force!)) / f.history.force!).toBeLessThan(1e-10);
    }
    // Newton's method converges quadratically near the root (Dennis & Schnabel, Thm 5.2.1):
    // in the last increment r_{k+1} ≤ C·r_k² with a modest C once r is small.
    const last = iterations.filter((e) => e.increment === SPRING.increments).map((e) => e.residualNorm);
    const tail = last.filter((r) => r < 1e-2 && r > 1e-14);
    for (let i = 1; i < tail.length; i++) expect(tail[i]!).toBeLessThan(10 * tail[i - 1]! ** 2);

    const run = (await analyst.agent.get(`/api/runs/${runId}`).expect(200)).body;
    expect(run).toMatchObject({ state: 'succeeded', message: 'Converged in every increment', queuePosition: null });
    expect(run.startedAt).not.toBeNull();
    expect(run.finishedAt).not.toBeNull();
    const stored = (await analyst.agent.get(`/api/runs/${runId}/iterations`).expect(200)).body as unknown[];
    expect(stored).toHaveLength(iterations.length);
    const storedFrames = (await analyst.agent.get(`/api/runs/${runId}/frames`).expect(200)).body as { history: Record<string, number> }[];
    expect(storedFrames.map((f) => f.history)).toEqual(frames.map((f) => f.history));

    const csv = await analyst.agent.get(`/api/runs/${runId}/files/spring.csv`).buffer(true).parse((res, cb) => {
      let text = '';
      res.on('data', (c: Buffer) => (text += c.toString()));
      res.on('end', () => cb(null, text));
    }).expect(200);
    const lines = String(csv.body).trim().split('\n');
    expect(lines[0]).toBe('increment,force_N,displacement_mm');
    expect(lines).toHaveLength(SPRING.increments + 1);
    const [, force, u] = lines[SPRING.increments]!.split(',').map(Number);
    expect(force).toBe(SPRING.forceMax);
    expect(u).toBe(frames[frames.length - 1]!.history.displacement);
  });

  it('cancel stops the computation itself; the converged frames are kept', async () => {
    const worker = await startWorker(40);
    const submitted = await analyst.agent.post(`/api/studies/${studyId}/runs`).set('x-csrf-token', analyst.csrf).expect(201);
    const runId: string = submitted.body.id;
    const socket = await openSocket(analyst);
    expect(await watch(socket, runId)).toEqual({ ok: true });
    const firstFrame = new Promise<void>((resolve) => socket.once(RUN_SOCKET_EVENTS.frame, () => resolve()));
    const done = waitForState(socket, runId, ['succeeded', 'failed', 'cancelled']);
    await firstFrame;
    const cancel = await analyst.agent.post(`/api/runs/${runId}/cancel`).set('x-csrf-token', analyst.csrf).expect(200);
    expect(cancel.body.cancelRequested).toBe(true);
    const final = await done;
    socket.close();
    await stopWorker(worker);

    expect(final.state).toBe('cancelled');
    const frames = (await analyst.agent.get(`/api/runs/${runId}/frames`).expect(200)).body as unknown[];
    expect(frames.length).toBeGreaterThanOrEqual(1);
    expect(frames.length).toBeLessThan(SPRING.increments);
    const again = await analyst.agent.post(`/api/runs/${runId}/cancel`).set('x-csrf-token', analyst.csrf);
    expect(again.status).toBe(409);
  });

  it('reports a ready worker in /api/health while one runs, and none after it stopped', async () => {
    const worker = await startWorker(0);
    const up = (await request(api.url).get('/api/health').expect(200)).body;
    expect(up).toMatchObject({ status: 'ok', database: { ok: true }, queue: { ok: true }, worker: { ready: true } });
    await stopWorker(worker);
    const down = (await request(api.url).get('/api/health').expect(200)).body;
    expect(down.worker.ready).toBe(false);
  });
});
