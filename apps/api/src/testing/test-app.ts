/**
 * An API app on its own test database, with a fake SMTP server, and helpers to create users,
 * projects and signed-in clients (with the CSRF token the web app would send).
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
import { startFakeSmtp, type FakeSmtp } from '../mail/captured-mail';
import { silentBroadcaster, type RunBroadcaster } from '../realtime/broadcaster';
import { createRunQueue, type RunQueue } from '../queue/run-queue';
import { hashPassword } from '../auth/password';
import { CSRF_HEADER } from '../auth/csrf';
import { User } from '../users/users.model';
import { Project, ProjectMember } from '../projects/projects.model';
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

type Agent = ReturnType<typeof request.agent>;
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** A signed-in browser: keeps the cookie and sends the CSRF token on writes, like the web app. */
export class Client {
  constructor(
    readonly agent: Agent,
    private csrf: string,
  ) {}
  static async start(app: Express): Promise<Client> {
    const agent = request.agent(app);
    const res = await agent.get('/api/auth/csrf').expect(200);
    return new Client(agent, String(res.body.token));
  }
  async refreshCsrf(): Promise<void> {
    this.csrf = String((await this.agent.get('/api/auth/csrf').expect(200)).body.token);
  }
  request(method: Method, path: string): ReturnType<Agent['get']> {
    const r = this.agent[method](path);
    return method === 'get' ? r : r.set(CSRF_HEADER, this.csrf);
  }
  get(path: string) { return this.request('get', path); }
  post(path: string) { return this.request('post', path); }
  put(path: string) { return this.request('put', path); }
  patch(path: string) { return this.request('patch', path); }
  delete(path: string) { return this.request('delete', path); }
  /** Signs in (session regenerated) and fetches the new session's CSRF token. */
  async signIn(email: string, password: string): Promise<request.Response> {
    const res = await this.post('/api/auth/login').send({ email, password });
    if (res.status === 200) await this.refreshCsrf();
    return res;
  }
}

export interface SignedIn {
  client: Client;
  user: User;
  password: string;
}

export interface TestApp {
  db: TestDatabase;
  ctx: AppContext;
  built: BuiltApp;
  app: Express;
  config: Config;
  smtp: FakeSmtp;
  /** Creates a user (member of `project` with `role`, or site admin) and signs them in. */
  signIn(opts?: { project?: Project; role?: Role; isAdmin?: boolean; email?: string; name?: string; maxActiveRuns?: number }): Promise<SignedIn>;
  createProject(name?: string): Promise<Project>;
  /** Newest mail caught by the fake SMTP server for `to`, waiting briefly for delivery. */
  mailTo(to: string): Promise<{ subject: string; text: string }>;
  close(): Promise<void>;
}

let counter = 0;

export async function createTestApp(options: { queue?: 'recording' | 'pg-boss'; broadcaster?: RunBroadcaster; config?: Partial<Config> } = {}): Promise<TestApp> {
  const db = await createTestDatabase();
  const sequelize = createSequelize(db.url, 5);
  initModels(sequelize);
  const pool = new pg.Pool({ connectionString: db.url, max: 5 });
  const smtp = await startFakeSmtp(pool);
  const config = loadConfig(
    { ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'silent' },
    { DATABASE_URL: db.url, APP_URL: 'http://127.0.0.1:4100', SMTP_HOST: '127.0.0.1', SMTP_PORT: smtp.port, WEB_DIST: '', ...options.config },
  );
  const logger = pino({ level: 'silent' });
  const queue = options.queue === 'pg-boss' ? await createRunQueue(db.url) : new RecordingQueue();
  const ctx: AppContext = {
    config, sequelize, pool, queue, logger,
    mailer: createMailer({ host: '127.0.0.1', port: smtp.port, from: config.MAIL_FROM, ignoreTLS: true }, logger),
    broadcaster: options.broadcaster ?? silentBroadcaster,
    solverVersion: 'fe-core test',
  };
  const built = createApp(ctx);
  return {
    db, ctx, built, app: built.app, config, smtp,
    async signIn(opts = {}) {
      counter += 1;
      const tag = opts.isAdmin ? 'siteadmin' : (opts.role ?? 'viewer');
      const password = `pw-${tag}-${counter}-long-enough`;
      const user = await User.create({
        email: opts.email ?? `${tag}${counter}@example.test`, name: opts.name ?? `${tag} ${counter}`,
        passwordHash: await hashPassword(password), isAdmin: opts.isAdmin ?? false, maxActiveRuns: opts.maxActiveRuns ?? 4,
      });
      if (opts.project) await ProjectMember.create({ projectId: opts.project.id, userId: user.id, role: opts.role ?? 'viewer' });
      const client = await Client.start(built.app);
      const res = await client.signIn(user.email, password);
      if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
      return { client, user, password };
    },
    async createProject(name) {
      counter += 1;
      return Project.create({ name: name ?? `Project ${counter}`, description: '', createdBy: null });
    },
    async mailTo(to) {
      for (let i = 0; i < 50; i++) {
        const { rows } = await pool.query<{ subject: string; text_body: string }>(
          'SELECT subject, text_body FROM captured_mail WHERE $1 = ANY(to_addresses) ORDER BY id DESC LIMIT 1',
          [to],
        );
        if (rows[0]) return { subject: rows[0].subject, text: rows[0].text_body };
        await new Promise((r) => setTimeout(r, 50));
      }
      throw new Error(`no mail to ${to}`);
    },
    async close() {
      await queue.stop();
      await smtp.close();
      await sequelize.close();
      await pool.end();
      await db.drop();
    },
  };
}
