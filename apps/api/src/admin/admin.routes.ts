import { z } from 'zod';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { idParams, uuid } from '../http/common-schemas';
import { ROLES } from '../auth/permissions';
import { membershipDto, userDto } from '../auth/auth.routes';
import { createInvitation, listAdminUsers, listInvitations, revokeInvitation, updateUser } from '../users/users.service';
import { listCapturedMail } from '../mail/captured-mail';
import { listAudit } from '../audit/audit.service';

const invitationDto = z.object({
  id: uuid, email: z.string(), projectId: uuid, projectName: z.string(), role: z.enum(ROLES), expiresAt: z.string(), acceptedAt: z.string().nullable(),
});
const page = z.object({ limit: z.coerce.number().int().min(1).max(1000).default(200) });

export function registerAdminRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Admin';
  api
    .add({
      method: 'get', path: '/admin/users', tag, access: 'site-admin', summary: 'Every user with their memberships',
      response: z.object({ items: z.array(userDto.extend({ memberships: z.array(membershipDto) })) }),
      handler: async () => ({ items: await listAdminUsers(ctx.sequelize) }),
    })
    .add({
      method: 'patch', path: '/admin/users/:id', tag, access: 'site-admin', summary: 'Make site admin, disable or rename a user, or set their quotas (runs at once, model size)',
      params: idParams,
      body: z.object({
        isAdmin: z.boolean().optional(), disabled: z.boolean().optional(), name: z.string().trim().min(1).max(200).optional(),
        maxActiveRuns: z.number().int().min(1).max(1000).optional(), maxNodes: z.number().int().min(1).max(10_000_000).optional(),
      }),
      response: userDto,
      handler: ({ user, params, body }) => updateUser(ctx.sequelize, user, params.id, body),
    })
    .add({
      method: 'get', path: '/admin/invitations', tag, access: 'site-admin', summary: 'Open and accepted invitations',
      response: z.object({ items: z.array(invitationDto) }),
      handler: async () => ({ items: await listInvitations() }),
    })
    .add({
      method: 'post', path: '/admin/invitations', tag, access: 'site-admin', summary: 'Invite someone into a project by e-mail',
      body: z.object({ email: z.email({ error: 'Not an e-mail address' }), projectId: uuid, role: z.enum(ROLES) }),
      response: invitationDto,
      handler: ({ user, body }) => createInvitation({ sequelize: ctx.sequelize, mailer: ctx.mailer, appUrl: ctx.config.APP_URL }, user, body),
    })
    .add({
      method: 'delete', path: '/admin/invitations/:id', tag, access: 'site-admin', summary: 'Withdraw an invitation', status: 204,
      params: idParams,
      handler: ({ user, params }) => revokeInvitation(ctx.sequelize, user, params.id),
    })
    .add({
      method: 'get', path: '/admin/mail', tag, access: 'site-admin', summary: 'Mails caught by the local fake SMTP server (development and tests)',
      query: page,
      response: z.object({ items: z.array(z.object({ id: z.string(), from: z.string(), to: z.array(z.string()), subject: z.string(), text: z.string(), receivedAt: z.string() })) }),
      handler: async ({ query }) => ({ items: await listCapturedMail(ctx.pool, query.limit) }),
    })
    .add({
      method: 'get', path: '/admin/audit', tag, access: 'site-admin', summary: 'The audit log, newest first',
      query: page.extend({ projectId: uuid.optional(), before: z.coerce.number().int().positive().optional() }),
      response: z.object({
        items: z.array(z.object({
          id: z.string(), actor: z.object({ id: z.string(), name: z.string(), email: z.string() }).nullable(), action: z.string(),
          target: z.string().nullable(), details: z.record(z.string(), z.unknown()), createdAt: z.string(),
        })),
      }),
      handler: async ({ query }) => ({ items: await listAudit(ctx.sequelize, query) }),
    });
}
