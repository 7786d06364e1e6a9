/** In-app notifications (a run finished or failed; a run's review asked for or decided) and their live push over Socket.IO. */
import { z } from 'zod';

export const NOTIFICATION_KINDS = ['run.succeeded', 'run.failed', 'review.requested', 'review.approved', 'review.rejected'] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

export const notificationSchema = z.object({
  id: z.string().uuid(),
  kind: z.enum(NOTIFICATION_KINDS),
  title: z.string(),
  body: z.string(),
  /** Path inside the web app, e.g. /runs/<id>. */
  link: z.string(),
  runId: z.string().uuid().nullable(),
  read: z.boolean(),
  createdAt: z.string(),
});
export type NotificationDto = z.infer<typeof notificationSchema>;

/** Socket.IO room of one user: every socket of a signed-in user joins it on connect. */
export function userRoom(userId: string): string {
  return `user:${userId}`;
}

export const NOTIFICATION_SOCKET_EVENT = 'notification:new' as const;

export const notificationEventSchema = z.object({ notification: notificationSchema, unread: z.number().int().nonnegative() });
export type NotificationEvent = z.infer<typeof notificationEventSchema>;
