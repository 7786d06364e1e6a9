/**
 * Real PostgreSQL for tests. `scripts/test.sh` starts a throw-away cluster and exports
 * PHASELOOP_TEST_PG_URL; when a test file is run on its own (npx vitest run --project api) the
 * cluster is started here through the same script. Each test file gets its own database.
 */
import { execFileSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { migrate } from '../db/migrate';

const repoRoot = fileURLToPath(new URL('../../../../', import.meta.url));

export function testClusterUrl(): string {
  const fromEnv = process.env.PHASELOOP_TEST_PG_URL;
  if (fromEnv) return fromEnv;
  const out = execFileSync('bash', [`${repoRoot}scripts/db.sh`, 'start', '--test'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'] });
  const match = /PHASELOOP_TEST_PG_URL=(\S+)/.exec(out);
  if (!match?.[1]) throw new Error(`scripts/db.sh start --test printed no URL:\n${out}`);
  process.env.PHASELOOP_TEST_PG_URL = match[1];
  return match[1];
}

export interface TestDatabase {
  url: string;
  name: string;
  drop(): Promise<void>;
}

export async function createTestDatabase(options: { migrate?: boolean } = {}): Promise<TestDatabase> {
  const adminUrl = testClusterUrl();
  const name = `phaseloop_t_${randomBytes(6).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE ${name}`);
  } finally {
    await admin.end();
  }
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  if (options.migrate !== false) await migrate(url.toString());
  return {
    url: url.toString(),
    name,
    async drop() {
      const c = new pg.Client({ connectionString: adminUrl });
      await c.connect();
      try {
        await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      } finally {
        await c.end();
      }
    },
  };
}
