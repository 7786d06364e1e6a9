import { z } from 'zod';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { API_VERSION } from '../version';

export function registerHealthRoutes(api: ApiRouter, ctx: AppContext): void {
  api.add({
    method: 'get', path: '/health', tag: 'Service', access: 'public', summary: 'Is the API up and can it reach its database',
    response: z.object({ ok: z.boolean(), version: z.string(), solverVersion: z.string(), database: z.enum(['up', 'down']) }),
    handler: async ({ res }) => {
      const database = await ctx.sequelize.query('SELECT 1').then(() => 'up' as const, () => 'down' as const);
      if (database === 'down') res.status(503);
      return { ok: database === 'up', version: API_VERSION, solverVersion: ctx.solverVersion, database };
    },
  });
}
