import { z } from 'zod';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { projectParams } from '../http/common-schemas';
import { requireProject } from '../projects/projects.service';
import { listAudit } from './audit.service';

const auditDto = z.object({
  id: z.number(), at: z.string(), userId: z.string().nullable(), userName: z.string().nullable(), projectId: z.string().nullable(),
  action: z.string(), targetType: z.string(), targetId: z.string(), detail: z.record(z.string(), z.unknown()),
});
const page = z.object({ limit: z.coerce.number().int().min(1).max(1000).default(200), before: z.coerce.number().int().positive().optional() });

export function registerAuditRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Review';
  const fmt = (rows: Awaited<ReturnType<typeof listAudit>>) => rows.map((r) => ({ ...r, at: new Date(r.at).toISOString() }));
  api
    .add({
      method: 'get', path: '/projects/:projectId/audit', tag, access: 'user', summary: 'Who did what in a project, newest first',
      params: projectParams, query: page, response: z.array(auditDto),
      handler: async ({ user, params, query }) => {
        await requireProject(user, params.projectId);
        return fmt(await listAudit(ctx.sequelize, { projectId: params.projectId, ...query }));
      },
    })
    .add({
      method: 'get', path: '/audit', tag, access: 'audit:read', summary: 'The whole audit log (admins)',
      query: page, response: z.array(auditDto),
      handler: async ({ query }) => fmt(await listAudit(ctx.sequelize, query)),
    });
}
