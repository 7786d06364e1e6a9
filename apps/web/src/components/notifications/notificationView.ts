/**
 * How a notification reads in the bell's list: its state word for the tag and the in-app path to
 * open. Links come from the API; anything that is not a path inside the app is not followed, so a
 * stored link can never send the user to another site.
 */
import type { AppNotification } from '@/api/notifications';

/** "run.failed" → "failed"; kinds the app does not know yet read as their last word. */
export function notificationStatus(kind: string): string {
  return kind.split('.').pop() ?? kind;
}

export function notificationTarget(n: Pick<AppNotification, 'link' | 'runId'>): string | null {
  if (n.link.startsWith('/') && !n.link.startsWith('//')) return n.link;
  return n.runId ? `/runs/${encodeURIComponent(n.runId)}` : null;
}

/** Newest first, one entry per id: a pushed notification may also arrive in a list refresh. */
export function mergeNotifications(current: readonly AppNotification[], incoming: readonly AppNotification[], limit = 30): AppNotification[] {
  const byId = new Map<string, AppNotification>();
  for (const n of [...incoming, ...current]) if (!byId.has(n.id)) byId.set(n.id, n);
  return [...byId.values()].sort((a, b) => b.createdAt.localeCompare(a.createdAt)).slice(0, limit);
}
