import { z } from 'zod';
import { QueryTypes } from 'sequelize';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { idParams, pageQuery, uuid } from '../http/common-schemas';
import { ROLES } from '../auth/permissions';
import { inviteUser, listUsers, updateUser } from './users.service';

export const userDto = z.object({
  id: uuid, email: z.string(), name: z.string(), role: z.enum(ROLES), active: z.boolean(),
  hasPassword: z.boolean(), maxActiveRuns: z.number().int(), maxNodes: z.number().int(),
});

export function registerUserRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Users';
  api
    .add({
      method: 'get', path: '/users', tag, access: 'user:manage', summary: 'All users',
      response: z.array(userDto), handler: () => listUsers(),
    })
    .add({
      method: 'post', path: '/users/invitations', tag, access: 'user:manage', summary: 'Invite someone by e-mail',
      body: z.object({ email: z.email({ error: 'Not an e-mail address' }), name: z.string().trim().min(1).max(200), role: z.enum(ROLES) }),
      response: z.object({ user: userDto, expiresAt: z.string() }),
      handler: ({ user, body }) =>
        inviteUser(
          { sequelize: ctx.sequelize, mailer: ctx.mailer, publicUrl: ctx.config.PUBLIC_URL, defaults: { maxActiveRuns: ctx.config.DEFAULT_MAX_ACTIVE_RUNS, maxNodes: ctx.config.DEFAULT_MAX_NODES } },
          user,
          body,
        ),
    })
    .add({
      method: 'patch', path: '/users/:id', tag, access: 'user:manage', summary: 'Change role, quotas or deactivate',
      params: idParams,
      body: z.object({
        name: z.string().trim().min(1).max(200).optional(),
        role: z.enum(ROLES).optional(),
        active: z.boolean().optional(),
        maxActiveRuns: z.number().int().min(1).max(1000).optional(),
        maxNodes: z.number().int().min(1).max(50_000_000).optional(),
      }),
      response: userDto,
      handler: ({ user, params, body }) => updateUser(ctx.sequelize, user, params.id, body),
    })
    .add({
      method: 'get', path: '/admin/outbox', tag, access: 'user:manage', summary: 'Mails sent (or kept, without SMTP)',
      query: pageQuery,
      response: z.array(z.object({ id: uuid, to: z.string(), subject: z.string(), text: z.string(), createdAt: z.string(), sentAt: z.string().nullable() })),
      handler: async ({ query }) => {
        const rows = await ctx.sequelize.query<{ id: string; to: string; subject: string; text: string; createdAt: Date; sentAt: Date | null }>(
          `SELECT id, to_address AS "to", subject, body_text AS "text", created_at AS "createdAt", sent_at AS "sentAt"
             FROM mail_outbox ORDER BY created_at DESC LIMIT :limit`,
          { replacements: { limit: query.limit }, type: QueryTypes.SELECT },
        );
        return rows.map((r) => ({ ...r, createdAt: new Date(r.createdAt).toISOString(), sentAt: r.sentAt ? new Date(r.sentAt).toISOString() : null }));
      },
    });
}
