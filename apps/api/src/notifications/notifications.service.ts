/**
 * Announcing the end of runs: an in-app notification for the submitter (pushed to their sockets
 * with the new unread count) and, unless they opted out, an e-mail with a link to the run. The
 * worker only marks the run finished; API instances pick finished runs up here, each run exactly
 * once (the UPDATE … RETURNING claims it), so any number of instances can run this.
 */
import type pg from 'pg';
import type { NotificationDto, NotificationKind } from '@phaseloop/shared';
import type { AppContext } from '../context';

interface FinishedRun {
  id: string; state: 'succeeded' | 'failed'; message: string; number: number; submitted_by: string;
  study_name: string; project_name: string; email: string; name: string; notify_by_email: boolean;
}

interface NotificationRow { id: string; kind: NotificationDto['kind']; title: string; body: string; link: string; run_id: string | null; read_at: Date | null; created_at: Date }

function toDto(r: NotificationRow): NotificationDto {
  return { id: r.id, kind: r.kind, title: r.title, body: r.body, link: r.link, runId: r.run_id, read: r.read_at !== null, createdAt: new Date(r.created_at).toISOString() };
}

export async function unreadCount(pool: pg.Pool, userId: string): Promise<number> {
  const { rows } = await pool.query<{ n: string }>('SELECT count(*) AS n FROM notifications WHERE user_id = $1 AND read_at IS NULL', [userId]);
  return Number(rows[0]?.n ?? 0);
}

async function claimFinishedRuns(pool: pg.Pool, limit: number): Promise<FinishedRun[]> {
  const { rows } = await pool.query<FinishedRun>(
    `WITH claimed AS (
       UPDATE runs SET notified_at = now()
        WHERE id IN (SELECT id FROM runs WHERE notified_at IS NULL AND state IN ('succeeded', 'failed') AND submitted_by IS NOT NULL
                      ORDER BY finished_at LIMIT $1 FOR UPDATE SKIP LOCKED)
        RETURNING id, state, message, number, submitted_by, study_id, project_id)
     SELECT c.id, c.state, c.message, c.number, c.submitted_by, s.name AS study_name, p.name AS project_name,
            u.email, u.name, u.notify_by_email
       FROM claimed c JOIN studies s ON s.id = c.study_id JOIN projects p ON p.id = c.project_id JOIN users u ON u.id = c.submitted_by`,
    [limit],
  );
  return rows;
}

async function announce(ctx: AppContext, run: FinishedRun): Promise<void> {
  const ok = run.state === 'succeeded';
  const title = `Run ${run.number} of "${run.study_name}" ${ok ? 'succeeded' : 'failed'}`;
  const link = `/runs/${run.id}`;
  const { rows } = await ctx.pool.query<NotificationRow>(
    `INSERT INTO notifications (user_id, kind, title, body, link, run_id) VALUES ($1, $2, $3, $4, $5, $6)
     RETURNING id, kind, title, body, link, run_id, read_at, created_at`,
    [run.submitted_by, `run.${run.state}`, title, run.message, link, run.id],
  );
  ctx.broadcaster.notification?.(run.submitted_by, { notification: toDto(rows[0]!), unread: await unreadCount(ctx.pool, run.submitted_by) });
  if (!run.notify_by_email) return;
  const text = [
    `Hello ${run.name},`,
    '',
    `${title} (project "${run.project_name}").`,
    run.message ? `${ok ? 'Solver' : 'Reason'}: ${run.message}` : '',
    '',
    `Open the run: ${ctx.config.APP_URL}${link}`,
    '',
    'You receive this because you submitted the run. Turn these e-mails off in Phaseloop under Account → Notifications.',
  ].filter((line, i, all) => line !== '' || all[i - 1] !== '').join('\n');
  await ctx.mailer.send({ to: run.email, subject: `[Phaseloop] ${title}`, text }).catch((err: unknown) => ctx.logger.warn({ err, runId: run.id }, 'run mail not sent'));
}

export interface NewNotification { kind: NotificationKind; title: string; body: string; link: string; runId: string | null }

/**
 * In-app notifications for several users at once (review requests and decisions), each pushed to
 * that user's sockets with the new unread count. Review news is in-app only: the e-mail opt-out
 * speaks of run ends, and reviewers asked for no further mail.
 */
export async function notifyUsers(ctx: AppContext, userIds: readonly string[], n: NewNotification): Promise<void> {
  for (const userId of new Set(userIds)) {
    const { rows } = await ctx.pool.query<NotificationRow>(
      `INSERT INTO notifications (user_id, kind, title, body, link, run_id) VALUES ($1, $2, $3, $4, $5, $6)
       RETURNING id, kind, title, body, link, run_id, read_at, created_at`,
      [userId, n.kind, n.title, n.body, n.link, n.runId],
    );
    ctx.broadcaster.notification?.(userId, { notification: toDto(rows[0]!), unread: await unreadCount(ctx.pool, userId) });
  }
}

/** Announces runs that ended since the last call; returns how many. */
export async function announceFinishedRuns(ctx: AppContext, limit = 50): Promise<number> {
  const runs = await claimFinishedRuns(ctx.pool, limit);
  for (const run of runs) await announce(ctx, run);
  return runs.length;
}

/** Polls for finished runs every `everyMs` (started by server.ts); returns a stop function. */
export function startRunAnnouncer(ctx: AppContext, everyMs = 2000): () => void {
  let busy = false;
  const timer = setInterval(() => {
    if (busy) return;
    busy = true;
    announceFinishedRuns(ctx)
      .catch((err: unknown) => ctx.logger.warn({ err }, 'run announcements failed'))
      .finally(() => { busy = false; });
  }, everyMs);
  return () => clearInterval(timer);
}

export async function listNotifications(pool: pg.Pool, userId: string, limit: number): Promise<{ items: NotificationDto[]; unread: number }> {
  const { rows } = await pool.query<NotificationRow>(
    'SELECT id, kind, title, body, link, run_id, read_at, created_at FROM notifications WHERE user_id = $1 ORDER BY created_at DESC LIMIT $2',
    [userId, limit],
  );
  return { items: rows.map(toDto), unread: await unreadCount(pool, userId) };
}

/** Other users' notification ids are ignored: the user column is part of every update. */
export async function markRead(pool: pg.Pool, userId: string, ids: string[] | 'all'): Promise<{ unread: number }> {
  if (ids === 'all') {
    await pool.query('UPDATE notifications SET read_at = now() WHERE user_id = $1 AND read_at IS NULL', [userId]);
  } else {
    await pool.query('UPDATE notifications SET read_at = now() WHERE user_id = $1 AND id = ANY($2::uuid[]) AND read_at IS NULL', [userId, ids]);
  }
  return { unread: await unreadCount(pool, userId) };
}

export async function emailSetting(pool: pg.Pool, userId: string, value?: boolean): Promise<{ emailOnRunEnd: boolean }> {
  const { rows } = value === undefined
    ? await pool.query<{ notify_by_email: boolean }>('SELECT notify_by_email FROM users WHERE id = $1', [userId])
    : await pool.query<{ notify_by_email: boolean }>('UPDATE users SET notify_by_email = $2 WHERE id = $1 RETURNING notify_by_email', [userId, value]);
  return { emailOnRunEnd: rows[0]?.notify_by_email ?? true };
}
