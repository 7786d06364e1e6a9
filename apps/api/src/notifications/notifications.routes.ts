import { z } from 'zod';
import { notificationSchema } from '@phaseloop/shared';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { emailSetting, listNotifications, markRead } from './notifications.service';

export function registerNotificationRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Notifications';
  const unread = z.object({ unread: z.number().int() });
  api
    .add({
      method: 'get', path: '/notifications', tag, access: 'user', summary: 'My notifications, newest first, with the unread count',
      query: z.object({ limit: z.coerce.number().int().min(1).max(200).default(50) }),
      response: z.object({ items: z.array(notificationSchema), unread: z.number().int() }),
      handler: ({ user, query }) => listNotifications(ctx.pool, user.id, query.limit),
    })
    .add({
      method: 'post', path: '/notifications/read', tag, access: 'user', summary: 'Mark notifications read (the listed ids, or all when none are listed)', status: 200,
      body: z.object({ ids: z.array(z.string().uuid()).max(500).optional() }), response: unread,
      handler: ({ user, body }) => markRead(ctx.pool, user.id, body.ids ?? 'all'),
    })
    .add({
      method: 'get', path: '/notifications/settings', tag, access: 'user', summary: 'My notification settings',
      response: z.object({ emailOnRunEnd: z.boolean() }),
      handler: ({ user }) => emailSetting(ctx.pool, user.id),
    })
    .add({
      method: 'put', path: '/notifications/settings', tag, access: 'user', summary: 'Turn e-mail on run end on or off',
      body: z.object({ emailOnRunEnd: z.boolean() }), response: z.object({ emailOnRunEnd: z.boolean() }),
      handler: ({ user, body }) => emailSetting(ctx.pool, user.id, body.emailOnRunEnd),
    });
}
