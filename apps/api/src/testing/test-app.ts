/**
 * An API app on its own test database, with helpers to create users and sign them in.
 * Used by the API's tests and by the cross-app tests in tests/integration.
 */
import pg from 'pg';
import { pino } from 'pino';
import request from 'supertest';
import type { Express } from 'express';
import { loadConfig, type Config } from '../config';
import { createSequelize } from '../db/sequelize';
import { initModels } from '../db/models';
import { createApp, type BuiltApp } from '../app';
import type { AppContext } from '../context';
import { createMailer } from '../mail/mailer';
import { silentBroadcaster, type RunBroadcaster } from '../realtime/broadcaster';
import { createRunQueue, type RunQueue } from '../queue/run-queue';
import { hashPassword } from '../auth/password';
import { User } from '../users/users.model';
import type { Role } from '../auth/permissions';
import { createTestDatabase, type TestDatabase } from './test-database';

/** Records jobs instead of queueing them (for tests that only look at the API's side). */
export class RecordingQueue implements RunQueue {
  readonly sent: string[] = [];
  readonly cancelled: string[] = [];
  async enqueue(runId: string): Promise<string> {
    this.sent.push(runId);
    return `job-${this.sent.length}`;
  }
  async cancel(jobId: string): Promise<void> {
    this.cancelled.push(jobId);
  }
  async stop(): Promise<void> {}
}

export interface TestApp {
  db: TestDatabase;
  ctx: AppContext;
  built: BuiltApp;
  app: Express;
  config: Config;
  /** Creates an active user with a password; returns a supertest agent signed in as them. */
  signIn(role: Role, opts?: { email?: string; name?: string; maxActiveRuns?: number; maxNodes?: number }): Promise<SignedIn>;
  close(): Promise<void>;
}

export interface SignedIn {
  agent: ReturnType<typeof request.agent>;
  user: User;
  password: string;
}

let counter = 0;

export async function createTestApp(options: { queue?: 'recording' | 'pg-boss'; broadcaster?: RunBroadcaster; config?: Partial<Config> } = {}): Promise<TestApp> {
  const db = await createTestDatabase();
  const config = loadConfig({ ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'silent' }, { DATABASE_URL: db.url, LOGIN_RATE_LIMIT: 10_000, ...options.config });
  const sequelize = createSequelize(db.url, 5);
  initModels(sequelize);
  const pool = new pg.Pool({ connectionString: db.url, max: 5 });
  const queue = options.queue === 'pg-boss' ? await createRunQueue(db.url) : new RecordingQueue();
  const ctx: AppContext = {
    config, sequelize, pool, queue,
    logger: pino({ level: 'silent' }),
    mailer: createMailer(sequelize, config.SMTP_URL, config.MAIL_FROM),
    broadcaster: options.broadcaster ?? silentBroadcaster,
    solverVersion: 'fe-core test',
  };
  const built = createApp(ctx);
  return {
    db, ctx, built, app: built.app, config,
    async signIn(role, opts = {}) {
      counter += 1;
      const password = `pw-${role}-${counter}-long-enough`;
      const user = await User.create({
        email: opts.email ?? `${role}${counter}@example.test`, name: opts.name ?? `${role} ${counter}`, role,
        passwordHash: await hashPassword(password), maxActiveRuns: opts.maxActiveRuns ?? 4, maxNodes: opts.maxNodes ?? 200_000,
      });
      const agent = request.agent(built.app);
      const res = await agent.post('/api/auth/login').send({ email: user.email, password });
      if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
      return { agent, user, password };
    },
    async close() {
      await queue.stop();
      await sequelize.close();
      await pool.end();
      await db.drop();
    },
  };
}
