/**
 * Shared pieces of the cross-process tests: the real API server on a test database, worker
 * processes started with tsx, signed-in HTTP sessions and browser-side Socket.IO clients.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import request from 'supertest';
import { io as connect, type Socket } from 'socket.io-client';
import { RUN_SOCKET_EVENTS, type RunStatusEvent } from '@phaseloop/shared';

export const repoRoot = fileURLToPath(new URL('../../', import.meta.url));

export interface WorkerProcess { child: ChildProcess; id: string }

export function spawnWorker(script: string, env: NodeJS.ProcessEnv): Promise<WorkerProcess> {
  // node itself with the tsx hooks (not the tsx CLI, which runs the script in a child process that
  // a SIGKILL of the CLI would leave running).
  const child = spawn(process.execPath, ['--import', 'tsx', script], {
    cwd: repoRoot,
    env: { ...process.env, LOG_LEVEL: 'warn', ...env },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  return new Promise((resolve, reject) => {
    child.stdout!.on('data', (d: Buffer) => {
      if (d.toString().includes('worker-ready')) resolve({ child, id: env.WORKER_ID ?? '' });
    });
    child.once('exit', (code) => reject(new Error(`worker exited with ${code}`)));
  });
}

export async function stopProcess(child: ChildProcess, signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  await new Promise<void>((resolve) => {
    child.once('exit', () => resolve());
    child.kill(signal);
  });
}

export interface Session {
  agent: ReturnType<typeof request.agent>;
  csrf: string;
  cookie: string;
}

export async function signIn(url: string, email: string, password: string): Promise<Session> {
  const agent = request.agent(url);
  let csrf = (await agent.get('/api/auth/csrf').expect(200)).body.token as string;
  const res = await agent.post('/api/auth/login').set('x-csrf-token', csrf).send({ email, password }).expect(200);
  const cookie = String(res.headers['set-cookie']).split(';')[0]!;
  csrf = (await agent.get('/api/auth/csrf').expect(200)).body.token as string;
  return { agent, csrf, cookie };
}

export function openSocket(url: string, session: Session): Promise<Socket> {
  const socket = connect(url, { path: '/socket.io', transports: ['websocket'], extraHeaders: { cookie: session.cookie }, reconnection: false });
  return new Promise((resolve, reject) => {
    socket.once('connect', () => resolve(socket));
    socket.once('connect_error', reject);
  });
}

export function watch(socket: Socket, runId: string): Promise<{ ok: boolean; message?: string }> {
  return new Promise((resolve) => socket.emit(RUN_SOCKET_EVENTS.watch, { runId }, resolve));
}

export function waitForState(socket: Socket, runId: string, states: string[]): Promise<RunStatusEvent> {
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

/** Body of a download as text, read as a stream (supertest buffers only what it is told to). */
export async function download(session: Session, path: string): Promise<{ status: number; text: string }> {
  const res = await session.agent.get(path).buffer(true).parse((r, cb) => {
    let text = '';
    r.on('data', (c: Buffer) => (text += c.toString()));
    r.on('end', () => cb(null, text));
  });
  return { status: res.status, text: String(res.body) };
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
