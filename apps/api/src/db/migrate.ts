/**
 * Schema migrations (Umzug, explicit list, state in the `migrations` table). Several API instances
 * may start at once, so the whole run holds a PostgreSQL advisory lock.
 */
import pg from 'pg';
import { Umzug, type RunnableMigration } from 'umzug';
import { initialSchema } from './migrations/0001-initial';
import { runsQueueSchema } from './migrations/0002-runs-queue';
import { runNotifiedSchema } from './migrations/0003-run-notified';
import { meshesSchema } from './migrations/0004-meshes';
import { runLogLinesSchema } from './migrations/0005-run-log-lines';

export type Sql = (text: string, values?: unknown[]) => Promise<pg.QueryResult>;
export type Migration = RunnableMigration<Sql>;

export const MIGRATIONS: Migration[] = [initialSchema, runsQueueSchema, runNotifiedSchema, meshesSchema, runLogLinesSchema];

/** Arbitrary constant shared by every Phaseloop process that migrates. */
const MIGRATION_LOCK = 7_384_114;

export async function migrate(databaseUrl: string, log: (msg: string) => void = () => {}): Promise<string[]> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    await client.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK]);
    await client.query('CREATE TABLE IF NOT EXISTS migrations (name text PRIMARY KEY, applied_at timestamptz NOT NULL DEFAULT now())');
    const sql: Sql = (text, values) => client.query(text, values as unknown[]);
    const umzug = new Umzug<Sql>({
      migrations: MIGRATIONS,
      // A function here is a context factory (Umzug calls it), so wrap the query function.
      context: () => sql,
      logger: undefined,
      storage: {
        async executed() {
          const r = await client.query<{ name: string }>('SELECT name FROM migrations ORDER BY name');
          return r.rows.map((row) => row.name);
        },
        async logMigration({ name }) {
          await client.query('INSERT INTO migrations(name) VALUES ($1)', [name]);
        },
        async unlogMigration({ name }) {
          await client.query('DELETE FROM migrations WHERE name = $1', [name]);
        },
      },
    });
    const pending = await umzug.pending();
    const applied: string[] = [];
    for (const m of pending) {
      await client.query('BEGIN');
      try {
        await umzug.up({ migrations: [m.name] });
        await client.query('COMMIT');
      } catch (err) {
        await client.query('ROLLBACK');
        throw err;
      }
      applied.push(m.name);
      log(`migrated ${m.name}`);
    }
    return applied;
  } finally {
    await client.query('SELECT pg_advisory_unlock($1)', [MIGRATION_LOCK]).catch(() => undefined);
    await client.end();
  }
}
