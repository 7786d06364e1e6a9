/**
 * The contract between the API (which queues runs), the worker (which solves them) and the web
 * app (which watches them): run states, the queue's job payload and the live events.
 */
import { z } from 'zod';

export const RUN_STATES = ['draft', 'queued', 'running', 'succeeded', 'failed', 'cancelled'] as const;
export const runStateSchema = z.enum(RUN_STATES);
export type RunState = z.infer<typeof runStateSchema>;

/** States a run never leaves. */
export const RUN_REVIEW_STATUSES = ['none', 'requested', 'approved', 'rejected'] as const;
export type RunReviewStatus = (typeof RUN_REVIEW_STATUSES)[number];

/**
 * A run as the API answers it (GET /api/runs/:id and the other run routes); the frozen snapshot
 * only on GET /api/runs/:id. One schema for the API's OpenAPI document and the web client's type.
 */
export const runDtoSchema = z.object({
  id: z.string().uuid(), projectId: z.string().uuid(), studyId: z.string().uuid(), sweepId: z.string().uuid().nullable(),
  number: z.number().int(), state: runStateSchema, message: z.string(), solverVersion: z.string(),
  progress: z.record(z.string(), z.unknown()), queuePosition: z.number().int().nullable(), submittedBy: z.string().nullable(),
  createdAt: z.string(), queuedAt: z.string().nullable(), startedAt: z.string().nullable(), finishedAt: z.string().nullable(),
  cancelRequested: z.boolean(), cancelledBy: z.string().nullable(), attempts: z.number().int(), priority: z.number().int(),
  reviewStatus: z.enum(RUN_REVIEW_STATUSES), reviewReason: z.string(),
  /** Who approved or rejected the run, and when (null until decided). */
  reviewedBy: z.string().nullable(), reviewedAt: z.string().nullable(),
  snapshot: z.record(z.string(), z.unknown()).optional(),
});
export type RunDto = z.infer<typeof runDtoSchema>;

export const FINAL_RUN_STATES: readonly RunState[] = ['succeeded', 'failed', 'cancelled'];
export function isFinalRunState(state: RunState): boolean {
  return FINAL_RUN_STATES.includes(state);
}

/** pg-boss queue the API sends to and workers consume. */
export const SOLVE_QUEUE = 'phaseloop-solve';

/**
 * Queue settings, the same wherever the queue is created (API or worker, whichever starts first).
 * No automatic retry of a solve that failed (it would fail the same way); pg-boss caps a job's
 * expiry below 24 h.
 */
export const SOLVE_QUEUE_POLICY = { retryLimit: 0, expireInSeconds: 23 * 3600 } as const;

/** A run whose worker stopped answering is restarted from the beginning this many times in all. */
export const RUN_MAX_ATTEMPTS = 3;
/** A worker whose heartbeat is older than this is taken for dead (its run is restarted). */
export const WORKER_STALE_SECONDS = 30;
/** A run still running after this long is failed as stuck. */
export const RUN_MAX_SECONDS = 6 * 3600;

/** The job payload is only the run id: the frozen snapshot is read from the database. */
export const solveJobSchema = z.object({ runId: z.string().uuid() });
export type SolveJob = z.infer<typeof solveJobSchema>;

/** Socket.IO room that receives every event of one run. */
export function runRoom(runId: string): string {
  return `run:${runId}`;
}

/** Socket.IO event names (server → browser), and the browser's request to follow a run. */
export const RUN_SOCKET_EVENTS = {
  watch: 'run:watch',
  unwatch: 'run:unwatch',
  status: 'run:status',
  iteration: 'run:iteration',
  frame: 'run:frame',
  log: 'run:log',
} as const;

export const runStatusEventSchema = z.object({
  runId: z.string().uuid(),
  state: runStateSchema,
  /** Plain words an analyst can act on (failures), or a short note. */
  message: z.string().default(''),
  /** Position in the queue (1 = next), for queued runs. */
  queuePosition: z.number().int().positive().optional(),
  at: z.string(),
});
export type RunStatusEvent = z.infer<typeof runStatusEventSchema>;

/** Sent after every Newton iteration. */
export const runIterationEventSchema = z.object({
  runId: z.string().uuid(),
  segment: z.number().int().nonnegative(),
  increment: z.number().int().nonnegative(),
  iteration: z.number().int().nonnegative(),
  /** Analysis time at the end of the increment (s). */
  time: z.number(),
  /** Norms of the out-of-balance force and of the displacement correction (relative). */
  residualNorm: z.number(),
  correctionNorm: z.number(),
  /** Number of increment cut-backs so far in this segment. */
  cutBacks: z.number().int().nonnegative(),
});
export type RunIterationEvent = z.infer<typeof runIterationEventSchema>;

/** Sent after every converged increment that the study's outputs ask to keep. */
export const runFrameEventSchema = z.object({
  runId: z.string().uuid(),
  frame: z.number().int().nonnegative(),
  segment: z.number().int().nonnegative(),
  increment: z.number().int().nonnegative(),
  time: z.number(),
  /** Small scalar history values (e.g. reaction force, probe displacement, temperature). */
  history: z.record(z.string(), z.number()),
  /** Largest von Mises stress (MPa) and martensite fraction ξ over the integration points. */
  maxVonMises: z.number().optional(),
  maxXi: z.number().optional(),
});
export type RunFrameEvent = z.infer<typeof runFrameEventSchema>;

export const RUN_LOG_LEVELS = ['info', 'warn', 'error'] as const;
export type RunLogLevel = (typeof RUN_LOG_LEVELS)[number];

export const runLogEventSchema = z.object({
  runId: z.string().uuid(),
  level: z.enum(RUN_LOG_LEVELS),
  message: z.string(),
  at: z.string(),
  /**
   * Place of the line in the run's stored log (the same `seq` as GET /runs/:id/logs), so a page
   * that loaded past lines can skip live ones it already has. Absent on lines that were shown
   * live but not stored (past the per-attempt cap).
   */
  seq: z.number().int().nonnegative().optional(),
  /** 1 for the first attempt; higher after the run was restarted. */
  attempt: z.number().int().positive().optional(),
});
export type RunLogEvent = z.infer<typeof runLogEventSchema>;

/**
 * Log lines stored per attempt of a run. A run that cuts back thousands of times would otherwise
 * fill the table with near-identical lines; the first lines (model size, first cut-backs) are the
 * ones that explain a run, so the worker keeps those and writes one last line saying so.
 */
export const RUN_LOG_MAX_LINES_PER_ATTEMPT = 1000;

/** One stored line of a run's log, as GET /api/runs/:id/logs answers it. */
export const runLogLineSchema = z.object({
  seq: z.number().int().nonnegative(),
  attempt: z.number().int().positive(),
  level: z.enum(RUN_LOG_LEVELS),
  message: z.string(),
  at: z.string(),
});
export type RunLogLine = z.infer<typeof runLogLineSchema>;

/** Paging of the stored log: lines after `afterSeq` (−1 = from the start), at most `limit`. */
export const runLogQuerySchema = z.object({
  afterSeq: z.coerce.number({ error: 'afterSeq must be a whole number (−1 for the first page)' }).int({ error: 'afterSeq must be a whole number' }).min(-1, { error: 'afterSeq must be −1 or more' }).default(-1),
  limit: z.coerce.number({ error: 'limit must be a whole number' }).int({ error: 'limit must be a whole number' }).min(1, { error: 'limit must be at least 1' }).max(5000, { error: 'limit must be at most 5000' }).default(1000),
});
export type RunLogQuery = z.infer<typeof runLogQuerySchema>;

export interface RunServerToClientEvents {
  'run:status': (e: RunStatusEvent) => void;
  'run:iteration': (e: RunIterationEvent) => void;
  'run:frame': (e: RunFrameEvent) => void;
  'run:log': (e: RunLogEvent) => void;
}

export interface RunClientToServerEvents {
  'run:watch': (req: { runId: string }, ack: (res: { ok: boolean; message?: string }) => void) => void;
  'run:unwatch': (req: { runId: string }) => void;
}
