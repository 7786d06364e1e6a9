/**
 * Starts one API instance: migrations, database pools, queue, HTTP + Socket.IO. Any number of
 * instances can run against the same PostgreSQL.
 */
import http from 'node:http';
import { pathToFileURL } from 'node:url';
import pg from 'pg';
import { pino } from 'pino';
import { loadConfig, type Config } from './config';
import { migrate } from './db/migrate';
import { createSequelize } from './db/sequelize';
import { initModels } from './db/models';
import { createRunQueue } from './queue/run-queue';
import { LateBroadcaster, socketBroadcaster } from './realtime/broadcaster';
import { attachSocketServer } from './realtime/socket';
import { createMailer, isLoopbackHost, type SmtpSettings } from './mail/mailer';
import { createApp } from './app';
import type { AppContext } from './context';
import { solverVersion } from './version';
import { startRunAnnouncer } from './notifications/notifications.service';

export interface RunningServer {
  url: string;
  ctx: AppContext;
  close(): Promise<void>;
}

export function mailSettings(config: Config): SmtpSettings | null {
  if (!config.SMTP_HOST) return null;
  return { host: config.SMTP_HOST, port: config.SMTP_PORT, from: config.MAIL_FROM, ignoreTLS: isLoopbackHost(config.SMTP_HOST) };
}

export async function startApiServer(config: Config): Promise<RunningServer> {
  const logger = pino({ level: config.LOG_LEVEL, base: { service: 'api' } });
  await migrate(config.DATABASE_URL, (m) => logger.info(m));
  const sequelize = createSequelize(config.DATABASE_URL);
  initModels(sequelize);
  const pool = new pg.Pool({ connectionString: config.DATABASE_URL, max: 10 });
  const queue = await createRunQueue(config.DATABASE_URL);
  const broadcaster = new LateBroadcaster();
  const ctx: AppContext = {
    config, sequelize, pool, logger, queue, broadcaster,
    mailer: createMailer(mailSettings(config), logger),
    solverVersion: solverVersion(),
  };
  const built = createApp(ctx);
  const server = http.createServer(built.app);
  const io = attachSocketServer(server, built, ctx);
  broadcaster.attach(socketBroadcaster(io));
  const stopAnnouncer = startRunAnnouncer(ctx);
  await new Promise<void>((resolve) => server.listen(config.PORT, config.HOST, resolve));
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;
  const url = `http://${config.HOST}:${port}`;
  logger.info({ url }, 'Phaseloop API listening');
  return {
    url,
    ctx,
    async close() {
      stopAnnouncer();
      await new Promise<void>((resolve) => io.close(() => resolve()));
      await queue.stop();
      await sequelize.close();
      await pool.end();
    },
  };
}

async function main(): Promise<void> {
  const running = await startApiServer(loadConfig());
  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    running.ctx.logger.info({ signal }, 'stopping');
    running.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((err: unknown) => {
    console.error(err);
    process.exit(1);
  });
}
