/** In-app notifications of the signed-in user, and their e-mail setting. */
import type { NotificationDto } from '@phaseloop/shared';
import { http } from './http';

export type AppNotification = NotificationDto;

export interface NotificationList {
  items: AppNotification[];
  unread: number;
}

export function listNotifications(limit = 30): Promise<NotificationList> {
  return http.get<NotificationList>(`/api/notifications?limit=${limit}`);
}

/** Marks the listed notifications read, or all of them when no ids are given; answers the new unread count. */
export async function markNotificationsRead(ids?: string[]): Promise<number> {
  return (await http.post<{ unread: number }>('/api/notifications/read', ids ? { ids } : {})).unread;
}

export interface NotificationSettings {
  emailOnRunEnd: boolean;
}

export function getNotificationSettings(): Promise<NotificationSettings> {
  return http.get<NotificationSettings>('/api/notifications/settings');
}

export function saveNotificationSettings(settings: NotificationSettings): Promise<NotificationSettings> {
  return http.put<NotificationSettings>('/api/notifications/settings', settings);
}
