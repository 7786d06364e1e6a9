import { z } from 'zod';
import { apiTokenSchema, createApiTokenSchema, createdApiTokenSchema } from '@phaseloop/shared';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { idParams } from '../http/common-schemas';
import { audit } from '../audit/audit.service';
import { createToken, listTokens, revokeToken } from './tokens.service';

export function registerTokenRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'API tokens';
  api
    .add({
      method: 'get', path: '/tokens', tag, access: 'user', summary: 'My API tokens (without the secrets)',
      response: z.array(apiTokenSchema),
      handler: ({ user }) => listTokens(ctx.pool, user.id),
    })
    .add({
      method: 'post', path: '/tokens', tag, access: 'user',
      summary: 'Create an API token; the secret is in this response only',
      description: 'Send it as `Authorization: Bearer <token>`; requests with a token need no CSRF header.',
      body: createApiTokenSchema, response: createdApiTokenSchema,
      handler: async ({ user, body }) => {
        const created = await createToken(ctx.pool, user.id, body.name);
        await audit(ctx.sequelize, { userId: user.id, projectId: null, action: 'token.create', targetType: 'api-token', targetId: created.id, detail: { name: body.name } });
        return created;
      },
    })
    .add({
      method: 'delete', path: '/tokens/:id', tag, access: 'user', summary: 'Revoke one of my API tokens', status: 204,
      params: idParams,
      handler: async ({ user, params }) => {
        await revokeToken(ctx.pool, user.id, params.id);
        await audit(ctx.sequelize, { userId: user.id, projectId: null, action: 'token.revoke', targetType: 'api-token', targetId: params.id });
      },
    });
}
