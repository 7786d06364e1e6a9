/**
 * A run's stored log: the lines the solver thread and the worker post (model size, cut-backs,
 * the outcome) are written to run_log_lines as they come, so the run monitor can show them after
 * a reload or to someone who opens the run later. Writes are chained, so lines land in order and
 * never block the solver's message loop; `close()` waits for the last write.
 *
 * `seq` counts on from the run's earlier attempts, and each attempt keeps at most
 * RUN_LOG_MAX_LINES_PER_ATTEMPT lines: the last one kept says that later lines were not stored.
 */
import type pg from 'pg';
import { RUN_LOG_MAX_LINES_PER_ATTEMPT, type RunLogLevel } from '@phaseloop/shared';

export interface LogLineToStore { seq: number; attempt: number; level: RunLogLevel; message: string; at: Date }

/** What a line became: stored lines carry their seq, lines past the cap are shown live only. */
export interface AddedLogLine { level: RunLogLevel; message: string; at: Date; seq?: number; attempt: number }

export interface RunLog {
  /** The lines to show live: the line itself, preceded by the cap notice when it is the first one past the cap. */
  add(level: RunLogLevel, message: string): AddedLogLine[];
  /** Waits until every line added so far is written. */
  close(): Promise<void>;
}

/** Where the next attempt's lines start, and how many lines this attempt number already holds. */
export async function logPosition(pool: pg.Pool, runId: string, attempt: number): Promise<{ nextSeq: number; stored: number }> {
  const { rows } = await pool.query<{ next: number; stored: string }>(
    `SELECT coalesce(max(seq) + 1, 0)::int AS next, count(*) FILTER (WHERE attempt = $2) AS stored FROM run_log_lines WHERE run_id = $1`,
    [runId, attempt],
  );
  return { nextSeq: rows[0]?.next ?? 0, stored: Number(rows[0]?.stored ?? 0) };
}

export async function saveLogLines(pool: pg.Pool, runId: string, lines: LogLineToStore[]): Promise<void> {
  if (lines.length === 0) return;
  const values: unknown[] = [];
  const tuples = lines.map((l, i) => {
    const b = i * 6;
    values.push(runId, l.seq, l.attempt, l.level, l.message, l.at);
    return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5}, $${b + 6})`;
  });
  // A line already there (same seq) is an earlier write of this very line: keep the first.
  await pool.query(
    `INSERT INTO run_log_lines (run_id, seq, attempt, level, message, created_at) VALUES ${tuples.join(', ')} ON CONFLICT (run_id, seq) DO NOTHING`,
    values,
  );
}

export function capNotice(max: number, attempt: number): string {
  return `Only the first ${max} log lines of attempt ${attempt} are kept; later lines were shown live but not stored.`;
}

export interface RunLogOptions {
  maxLines?: number;
  /** A failed write loses only its lines; the run goes on (the log is a help, not a result). */
  onWriteError?: (err: unknown) => void;
}

export async function openRunLog(pool: pg.Pool, runId: string, attempt: number, options: RunLogOptions = {}): Promise<RunLog> {
  const max = options.maxLines ?? RUN_LOG_MAX_LINES_PER_ATTEMPT;
  let { nextSeq, stored } = await logPosition(pool, runId, attempt);
  let pending: LogLineToStore[] = [];
  let writing: Promise<void> = Promise.resolve();
  let scheduled = false;

  const schedule = () => {
    if (scheduled) return;
    scheduled = true;
    writing = writing.then(async () => {
      scheduled = false;
      const batch = pending;
      pending = [];
      await saveLogLines(pool, runId, batch);
    }).catch((err: unknown) => { scheduled = false; options.onWriteError?.(err); });
  };

  const store = (level: RunLogLevel, message: string, at: Date): AddedLogLine => {
    const line: LogLineToStore = { seq: nextSeq, attempt, level, message, at };
    nextSeq += 1;
    stored += 1;
    pending.push(line);
    schedule();
    return line;
  };

  return {
    add(level, message) {
      const at = new Date();
      const line: AddedLogLine = { level, message, at, attempt };
      if (stored >= max) return [line];
      if (stored === max - 1) {
        // The last place under the cap goes to a notice, so a reader knows the log was cut.
        const notice = store('warn', capNotice(max, attempt), at);
        return [notice, line];
      }
      return [store(level, message, at)];
    },
    async close() {
      await writing;
    },
  };
}
