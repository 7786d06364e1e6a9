/**
 * `tsx apps/api/src/cli/fake-smtp.ts`: the local fake SMTP server of development and tests.
 * Listens on 127.0.0.1:SMTP_PORT (default 2525) and stores every mail in DATABASE_URL's
 * captured_mail table, where site admins read it under Admin → Mail.
 */
import pg from 'pg';
import { loadConfig } from '../config';
import { startFakeSmtp } from '../mail/captured-mail';

async function main(): Promise<void> {
  const config = loadConfig();
  const pool = new pg.Pool({ connectionString: config.DATABASE_URL, max: 2 });
  const smtp = await startFakeSmtp(pool, { host: '127.0.0.1', port: config.SMTP_PORT });
  console.log(`[fake-smtp] catching mail on 127.0.0.1:${smtp.port}`);
  const stop = () => {
    void smtp.close().then(() => pool.end()).then(() => process.exit(0));
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err: unknown) => {
  console.error('[fake-smtp] failed:', err instanceof Error ? err.message : err);
  process.exit(1);
});
