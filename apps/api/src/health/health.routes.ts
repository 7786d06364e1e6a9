import { z } from 'zod';
import { SOLVE_QUEUE } from '@phaseloop/shared';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';

/** A worker that has not sent a heartbeat for this long is taken as gone. */
export const WORKER_STALE_SECONDS = 30;

const healthDto = z.object({
  status: z.enum(['ok', 'degraded']),
  version: z.string(),
  solverVersion: z.string(),
  database: z.object({ ok: z.boolean() }),
  queue: z.object({ ok: z.boolean() }),
  worker: z.object({ ready: z.boolean(), lastSeen: z.string().nullable(), count: z.number().int() }),
});

export function registerHealthRoutes(api: ApiRouter, ctx: AppContext, version: string): void {
  api.add({
    method: 'get', path: '/health', tag: 'Service', access: 'public',
    summary: 'Database and queue reachable, and whether a worker is ready (503 when the database is down)',
    response: healthDto,
    handler: async ({ res }) => {
      const database = await ctx.pool.query('SELECT 1').then(() => true, () => false);
      const queue = database
        ? await ctx.pool.query('SELECT 1 FROM pgboss.queue WHERE name = $1', [SOLVE_QUEUE]).then((r) => r.rowCount === 1, () => false)
        : false;
      const workers = database
        ? await ctx.pool
            .query<{ last: Date | null; n: number }>(
              `SELECT max(last_seen_at) AS last, count(*) FILTER (WHERE last_seen_at > now() - make_interval(secs => $1)) AS n FROM workers`,
              [WORKER_STALE_SECONDS],
            )
            .then((r) => r.rows[0], () => undefined)
        : undefined;
      const count = Number(workers?.n ?? 0);
      if (!database) res.status(503);
      return {
        status: database && queue ? ('ok' as const) : ('degraded' as const),
        version,
        solverVersion: ctx.solverVersion,
        database: { ok: database },
        queue: { ok: queue },
        worker: { ready: count > 0, lastSeen: workers?.last ? new Date(workers.last).toISOString() : null, count },
      };
    },
  });
}
