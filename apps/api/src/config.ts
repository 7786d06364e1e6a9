/**
 * Settings from the environment, parsed once. Every default works on a developer's machine after
 * `npm start` and listens on loopback only; production sets DATABASE_URL, SESSION_SECRET, APP_URL,
 * SMTP_HOST/SMTP_PORT and, behind a proxy, HOST.
 */
import { fileURLToPath } from 'node:url';
import { z } from 'zod';
import { MAX_MESH_BYTES } from '@phaseloop/shared';

const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));
const DEV_SECRET = 'phaseloop-development-secret-change-me';

const configSchema = z.object({
  DATABASE_URL: z.string().default('postgres://postgres@127.0.0.1:55432/phaseloop'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4100),
  HOST: z.string().default('127.0.0.1'),
  /** Where links in e-mails point (the web app's origin). */
  APP_URL: z.string().default(''),
  SESSION_SECRET: z.string().min(16).default(DEV_SECRET),
  /** Idle time after which a session ends (minutes); every request renews it. */
  SESSION_IDLE_MINUTES: z.coerce.number().int().positive().default(8 * 60),
  SMTP_HOST: z.string().default(''),
  SMTP_PORT: z.coerce.number().int().positive().default(2525),
  MAIL_FROM: z.string().default('Phaseloop <no-reply@phaseloop.invalid>'),
  /** Built web app to serve with a single-page fallback; missing folder = API only. */
  WEB_DIST: z.string().default(`${repoRoot}apps/web/dist`),
  NODE_ENV: z.string().default('development'),
  LOG_LEVEL: z.string().default('info'),
  /** Failed sign-ins allowed per address per minute before 429. */
  LOGIN_FAILURES_PER_MINUTE: z.coerce.number().int().positive().default(10),
  /** Largest Gmsh .msh upload accepted (bytes). */
  MESH_MAX_BYTES: z.coerce.number().int().positive().default(MAX_MESH_BYTES),
});

export type Config = z.infer<typeof configSchema>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Config> = {}): Config {
  const config = { ...configSchema.parse(env), ...overrides };
  if (!config.APP_URL) config.APP_URL = `http://${config.HOST}:${config.PORT}`;
  config.APP_URL = config.APP_URL.replace(/\/+$/, '');
  if (config.NODE_ENV === 'production' && config.SESSION_SECRET === DEV_SECRET) {
    throw new Error('SESSION_SECRET must be set in production');
  }
  return config;
}
