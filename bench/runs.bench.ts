/**
 * Run pipeline benchmark: the API in this process, two worker processes (fe-core solver in a
 * worker thread each), a small real study (examples/bar-thermal.json: a bar heated in increments).
 *   1. Latency, unloaded: runs submitted one at a time; submit → first event from a worker
 *      (status 'running' or the first iteration) as a browser sees it over Socket.IO.
 *   2. Throughput: N runs submitted at once (default 500, `--runs N` to change), time until all
 *      have succeeded; submit → first worker event under that load (includes the wait in the queue).
 * Writes its section of bench/results.md.
 */
import { readFileSync } from 'node:fs';
import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import request from 'supertest';
import { io as connect, type Socket } from 'socket.io-client';
import { startApiServer, loadConfig } from '@phaseloop/api';
import { createTestDatabase } from '@phaseloop/api/testing/test-database';
import { hashPassword } from '@phaseloop/api/auth/password';
import { RUN_SOCKET_EVENTS, type RunIterationEvent, type RunStatusEvent } from '@phaseloop/shared';
import { machineLine } from './lib/machine';
import { markdownTable, writeSection } from './lib/results';

const root = fileURLToPath(new URL('../', import.meta.url));
const argRuns = process.argv.indexOf('--runs');
const N = argRuns > 0 ? Number(process.argv[argRuns + 1]) : 500;
const SERIAL = Math.min(20, N);
const WORKERS = 2;

function percentile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1))]!;
}

function spawnWorker(url: string, id: string): Promise<ChildProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'apps/worker/src/index.ts'], {
    cwd: root, env: { ...process.env, DATABASE_URL: url, LOG_LEVEL: 'warn', PHASELOOP_BUILD: 'bench' }, stdio: ['ignore', 'ignore', 'inherit'],
  });
  void id;
  return Promise.resolve(child);
}

async function main(): Promise<void> {
  const machine = machineLine();
  const db = await createTestDatabase({ migrate: false });
  const api = await startApiServer(loadConfig({ ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'error' }, { DATABASE_URL: db.url, PORT: 0, WEB_DIST: '', SMTP_HOST: '' }));
  const pool = new pg.Pool({ connectionString: db.url, max: 2 });
  const children: ChildProcess[] = [];
  let socket: Socket | undefined;
  try {
    const hash = await hashPassword('bench-password-long');
    const { rows: u } = await pool.query<{ id: string }>(`INSERT INTO users (email, name, password_hash, max_active_runs) VALUES ('bench@bench.test', 'Bench', $1, 100) RETURNING id`, [hash]);
    const { rows: p } = await pool.query<{ id: string }>(`INSERT INTO projects (name) VALUES ('Bench') RETURNING id`);
    await pool.query(`INSERT INTO project_members (project_id, user_id, role) VALUES ($1, $2, 'analyst')`, [p[0]!.id, u[0]!.id]);

    const agent = request.agent(api.url);
    let csrf = (await agent.get('/api/auth/csrf')).body.token as string;
    const login = await agent.post('/api/auth/login').set('x-csrf-token', csrf).send({ email: 'bench@bench.test', password: 'bench-password-long' });
    const cookie = String(login.headers['set-cookie']).split(';')[0]!;
    csrf = (await agent.get('/api/auth/csrf')).body.token as string;
    const token = (await agent.post('/api/tokens').set('x-csrf-token', csrf).send({ name: 'bench' })).body.token as string;
    const model = JSON.parse(readFileSync(`${root}examples/bar-thermal.json`, 'utf8')) as Record<string, unknown>;
    const study = await request(api.url).post(`/api/projects/${p[0]!.id}/studies`).set('Authorization', `Bearer ${token}`).send({ name: 'Bench bar', definition: { model } });
    if (study.status !== 201) throw new Error(`study: ${JSON.stringify(study.body)}`);

    socket = connect(api.url, { path: '/socket.io', transports: ['websocket'], extraHeaders: { cookie }, reconnection: false });
    await new Promise<void>((resolve, reject) => { socket!.once('connect', () => resolve()); socket!.once('connect_error', reject); });
    const submittedAt = new Map<string, number>();
    const firstEvent = new Map<string, number>();
    const finished = new Map<string, string>();
    const waiters = new Map<string, () => void>();
    const noteFirst = (runId: string) => { if (!firstEvent.has(runId) && submittedAt.has(runId)) firstEvent.set(runId, performance.now()); };
    socket.on(RUN_SOCKET_EVENTS.iteration, (e: RunIterationEvent) => noteFirst(e.runId));
    socket.on(RUN_SOCKET_EVENTS.status, (e: RunStatusEvent) => {
      if (e.state === 'running') noteFirst(e.runId);
      if (['succeeded', 'failed', 'cancelled'].includes(e.state) && !finished.has(e.runId)) {
        finished.set(e.runId, e.state);
        waiters.get(e.runId)?.();
      }
    });
    const submit = async (): Promise<string> => {
      const t0 = performance.now();
      const res = await request(api.url).post(`/api/studies/${study.body.id}/runs`).set('Authorization', `Bearer ${token}`);
      if (res.status !== 201) throw new Error(`submit: ${res.status} ${JSON.stringify(res.body)}`);
      const runId = res.body.id as string;
      submittedAt.set(runId, t0);
      await new Promise((resolve) => socket!.emit(RUN_SOCKET_EVENTS.watch, { runId }, resolve));
      return runId;
    };
    const done = (runId: string) => new Promise<void>((resolve) => { if (finished.has(runId)) resolve(); else waiters.set(runId, resolve); });

    for (let i = 0; i < WORKERS; i++) children.push(await spawnWorker(db.url, `bench-${i}`));
    // Warm-up: both workers started and their solver threads loaded.
    await Promise.all([submit(), submit()].map(async (r) => done(await r)));

    const serial: number[] = [];
    for (let i = 0; i < SERIAL; i++) {
      const id = await submit();
      await done(id);
      const first = firstEvent.get(id);
      if (first !== undefined) serial.push(first - submittedAt.get(id)!);
    }

    const t0 = performance.now();
    const ids: string[] = [];
    for (let i = 0; i < N; i++) ids.push(await submit());
    const submitSeconds = (performance.now() - t0) / 1000;
    await Promise.all(ids.map(done));
    const seconds = (performance.now() - t0) / 1000;
    const loaded = ids.map((id) => (firstEvent.get(id) ?? Number.NaN) - submittedAt.get(id)!).filter(Number.isFinite);
    const failedRuns = ids.filter((id) => finished.get(id) !== 'succeeded').length;

    const ms = (v: number) => v.toFixed(0);
    const body = [
      '## Runs: queue → worker → live events (bench/runs.bench.ts)',
      '',
      machine,
      '',
      `Study: examples/bar-thermal.json (5 nodes, 4 increments), solved by fe-core in a worker thread; ${WORKERS} worker processes, one API process, PostgreSQL on loopback (the test cluster). Latency = submit request sent → first event from a worker (status running or first iteration) received by a Socket.IO client.`,
      '',
      markdownTable(['measure', 'value'], [
        ['runs one at a time', String(serial.length)],
        ['latency p50 / p95, unloaded (ms)', `${ms(percentile(serial, 50))} / ${ms(percentile(serial, 95))}`],
        [`runs submitted at once`, String(N)],
        ['time to submit them all (s)', submitSeconds.toFixed(1)],
        ['time until all finished (s)', seconds.toFixed(1)],
        ['throughput (runs/s)', (N / seconds).toFixed(2)],
        ['latency p50 / p95 under that load, queue wait included (ms)', `${ms(percentile(loaded, 50))} / ${ms(percentile(loaded, 95))}`],
        ['runs not succeeded', String(failedRuns)],
      ]),
    ].join('\n');
    writeSection('runs', body);
    console.log(body);
  } finally {
    socket?.close();
    for (const c of children) c.kill('SIGTERM');
    await Promise.all(children.map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.once('exit', r)))));
    await api.close();
    await pool.end();
    await db.drop();
  }
}

main().then(() => process.exit(0), (err: unknown) => {
  console.error(err);
  process.exit(1);
});
