/**
 * Settings from the environment, parsed once. Everything has a default that works on a developer's
 * machine after `npm start`; production sets DATABASE_URL, SESSION_SECRET, PUBLIC_URL and SMTP_URL.
 */
import { z } from 'zod';

const configSchema = z.object({
  DATABASE_URL: z.string().default('postgres://postgres@127.0.0.1:55432/phaseloop'),
  PORT: z.coerce.number().int().min(0).default(3000),
  HOST: z.string().default('127.0.0.1'),
  /** Where links in e-mails point. */
  PUBLIC_URL: z.string().default('http://127.0.0.1:3000'),
  SESSION_SECRET: z.string().min(16).default('phaseloop-development-secret-change-me'),
  /** smtp://host:port; empty = keep mails in the database outbox (development). */
  SMTP_URL: z.string().default(''),
  MAIL_FROM: z.string().default('Phaseloop <no-reply@phaseloop.invalid>'),
  /** Built web app to serve (apps/web/dist); empty = API only. */
  WEB_DIST: z.string().default(''),
  NODE_ENV: z.string().default('development'),
  LOG_LEVEL: z.string().default('info'),
  /** Default quotas for new users. */
  DEFAULT_MAX_ACTIVE_RUNS: z.coerce.number().int().positive().default(4),
  DEFAULT_MAX_NODES: z.coerce.number().int().positive().default(200_000),
  /** Login attempts per address per 15 minutes. */
  LOGIN_RATE_LIMIT: z.coerce.number().int().positive().default(50),
});

export type Config = z.infer<typeof configSchema>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Config> = {}): Config {
  const parsed = configSchema.parse(env);
  const config = { ...parsed, ...overrides };
  if (config.NODE_ENV === 'production' && config.SESSION_SECRET === configSchema.shape.SESSION_SECRET.parse(undefined)) {
    throw new Error('SESSION_SECRET must be set in production');
  }
  return config;
}
