import type pg from 'pg';
import type { Sequelize } from 'sequelize';
import type { Logger } from 'pino';
import type { Config } from './config';
import type { Mailer } from './mail/mailer';
import type { RunQueue } from './queue/run-queue';
import type { RunBroadcaster } from './realtime/broadcaster';

/** Everything a route needs from the outside world; built by server.ts, or by tests. */
export interface AppContext {
  config: Config;
  sequelize: Sequelize;
  /** Raw pool for the session store and chunked result streaming. */
  pool: pg.Pool;
  logger: Logger;
  mailer: Mailer;
  queue: RunQueue;
  broadcaster: RunBroadcaster;
  /** Version string of the solver that runs will be frozen against. */
  solverVersion: string;
}
