/**
 * One worker process: consumes the solve queue (one run at a time: a solve is CPU-bound, so run
 * one worker process per core), reports a heartbeat for /api/health and the queue overview,
 * streams progress into Socket.IO rooms and stores results. Any number of workers on any number
 * of machines can share a queue: all they need is DATABASE_URL (and the S3 settings if results
 * go to a bucket).
 *
 * Every heartbeat also sweeps for runs whose worker died (restarted from the beginning up to
 * RUN_MAX_ATTEMPTS times) and for runs stuck past RUN_MAX_SECONDS (failed).
 */
import os from 'node:os';
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import PgBoss from 'pg-boss';
import { pino, type Logger } from 'pino';
import {
  RUN_MAX_ATTEMPTS, RUN_MAX_SECONDS, SOLVE_QUEUE, SOLVE_QUEUE_POLICY, WORKER_STALE_SECONDS, solveJobSchema,
  type RunState, type SolveJob,
} from '@phaseloop/shared';
import { createRunEmitter, type RunEventSink } from './emitter';
import { cancelRequested, claimRun, expireStuckRuns, finishRun, reapStaleRuns, requeueRun, saveFrame, saveIterations, setJobId, type ClaimedRun } from './run-store';
import type { IterationReport, RunSolver, SolveOutcome } from './solver';
import { createFeCoreSolver } from './fe-solver';
import { resultStoreFromEnv, type ResultStore } from './result-store';
import { openRunLog, type AddedLogLine } from './run-log';

export interface WorkerOptions {
  databaseUrl: string;
  workerId?: string;
  solver?: RunSolver;
  logger?: Logger;
  heartbeatSeconds?: number;
  /** How often a running solve re-reads its cancel flag. */
  cancelPollMs?: number;
  /** Where events go (default: Socket.IO rooms through PostgreSQL). */
  events?: RunEventSink;
  /** Where result files go (default: from the environment, PostgreSQL unless S3_BUCKET is set). */
  results?: ResultStore;
  version?: string;
  /** Heartbeat age after which another worker's run is taken over (s). */
  staleSeconds?: number;
  maxAttempts?: number;
  maxRunSeconds?: number;
  /** Delay before a run held back by its submitter's limit is offered again (s). */
  limitRetrySeconds?: number;
}

export interface RunningWorker {
  id: string;
  /** Stops taking jobs; a running solve finishes its increment, then the run goes back to the queue. */
  stop(): Promise<void>;
}

async function ensureQueue(boss: PgBoss): Promise<void> {
  if (await boss.getQueue(SOLVE_QUEUE)) return;
  try {
    await boss.createQueue(SOLVE_QUEUE, { name: SOLVE_QUEUE, ...SOLVE_QUEUE_POLICY });
  } catch (err) {
    if (!(await boss.getQueue(SOLVE_QUEUE))) throw err;
  }
}

export async function startWorker(options: WorkerOptions): Promise<RunningWorker> {
  const id = options.workerId ?? `${os.hostname()}-${process.pid}-${randomBytes(3).toString('hex')}`;
  const logger = options.logger ?? pino({ base: { service: 'worker', worker: id }, level: process.env.LOG_LEVEL ?? 'info' });
  const solver = options.solver ?? createFeCoreSolver();
  const pool = new pg.Pool({ connectionString: options.databaseUrl, max: 5 });
  const events = options.events ?? createRunEmitter(pool);
  const results = options.results ?? resultStoreFromEnv(pool);
  const staleSeconds = options.staleSeconds ?? WORKER_STALE_SECONDS;
  const maxAttempts = options.maxAttempts ?? RUN_MAX_ATTEMPTS;
  const boss = new PgBoss({ connectionString: options.databaseUrl, schema: 'pgboss', max: 3, schedule: false });
  boss.on('error', (err) => logger.error({ err }, 'pg-boss'));
  await boss.start();
  await ensureQueue(boss);

  let stopping = false;
  let currentRun: string | null = null;
  const now = () => new Date().toISOString();
  const announce = (runId: string, state: RunState, message = '') => events.status({ runId, state, message, at: now() });

  const beat = async () => {
    await pool.query(
      `INSERT INTO workers (id, hostname, pid, version, current_run_id) VALUES ($1, $2, $3, $4, $5)
       ON CONFLICT (id) DO UPDATE SET last_seen_at = now(), current_run_id = EXCLUDED.current_run_id`,
      [id, os.hostname(), process.pid, options.version ?? '', currentRun],
    );
  };

  const sweep = async () => {
    const { requeued, failed } = await reapStaleRuns(pool, staleSeconds, maxAttempts);
    for (const r of requeued) {
      const jobId = await boss.send(SOLVE_QUEUE, { runId: r.id } satisfies SolveJob, { priority: r.priority });
      if (jobId) await setJobId(pool, r.id, jobId);
      logger.warn({ runId: r.id, attempts: r.attempts }, 'worker of a run stopped answering; run queued again');
      announce(r.id, 'queued', 'Restarted from the beginning: the worker solving it stopped answering');
    }
    for (const r of failed) announce(r.id, 'failed', 'The worker solving this run stopped answering too many times');
    for (const runId of await expireStuckRuns(pool, options.maxRunSeconds ?? RUN_MAX_SECONDS)) {
      announce(runId, 'failed', 'The run was stopped as stuck');
    }
  };

  await beat();
  const heartbeat = setInterval(() => {
    void beat().then(sweep).catch((err: unknown) => logger.warn({ err }, 'heartbeat failed'));
  }, (options.heartbeatSeconds ?? 10) * 1000);

  /** The submitter's limit of runs at once holds this one back: offer it again shortly. */
  async function deferRun(runId: string, priority: number): Promise<void> {
    const jobId = await boss.send(SOLVE_QUEUE, { runId } satisfies SolveJob, { priority, startAfter: options.limitRetrySeconds ?? 2 });
    if (jobId) await setJobId(pool, runId, jobId);
  }

  async function solveClaimed(run: ClaimedRun): Promise<void> {
    const runId = run.id;
    currentRun = runId;
    void beat().catch(() => undefined);
    announce(runId, 'running', run.attempt > 1 ? `Attempt ${run.attempt} of ${maxAttempts}` : '');
    logger.info({ runId, attempt: run.attempt }, 'solving');

    // The cancel flag is refreshed in the background so that shouldStop() stays synchronous.
    let cancelled = false;
    const poll = setInterval(() => {
      cancelRequested(pool, runId, id).then((c) => { cancelled = c; }, () => undefined);
    }, options.cancelPollMs ?? 250);

    let seq = 0;
    let pending: IterationReport[] = [];
    const flush = async () => {
      const batch = pending;
      pending = [];
      await saveIterations(pool, runId, seq - batch.length, batch);
    };
    let frames = 0;

    // Stored so the run monitor shows past lines too; live events carry the stored seq.
    const log = await openRunLog(pool, runId, run.attempt, { onWriteError: (err) => logger.warn({ err, runId }, 'run log write failed') });
    const emitLog = (lines: AddedLogLine[]) => {
      for (const l of lines) events.log({ runId, level: l.level, message: l.message, at: l.at.toISOString(), attempt: l.attempt, ...(l.seq !== undefined ? { seq: l.seq } : {}) });
    };
    if (run.attempt > 1) emitLog(log.add('warn', `Attempt ${run.attempt} of ${maxAttempts}: solving again from the beginning.`));

    let outcome: SolveOutcome;
    try {
      outcome = await solver.solve(run.snapshot, {
        onIteration(report) {
          seq += 1;
          pending.push(report);
          events.iteration({ runId, ...report });
          if (pending.length >= 200) void flush().catch((err: unknown) => logger.warn({ err, runId }, 'iteration log write failed'));
        },
        async onFrame(report) {
          await flush();
          const frame = frames++;
          await saveFrame(pool, runId, frame, report);
          for (const f of report.files ?? []) await results.save(runId, f.name, f.contentType, f.bytes);
          events.frame({
            runId, frame, segment: report.segment, increment: report.increment, time: report.time, history: report.history,
            ...(report.summary ? { maxVonMises: report.summary.maxVonMises, maxXi: report.summary.maxXi } : {}),
          });
        },
        onLog(level, message) {
          emitLog(log.add(level, message));
        },
        shouldStop: () => cancelled,
        shouldStopAfterIncrement: () => stopping,
      });
      await flush();
      // Converged frames of a cancelled or failed run stay downloadable, with their index files.
      if (!(outcome.kind === 'stopped' && !cancelled)) for (const f of outcome.files ?? []) await results.save(runId, f.name, f.contentType, f.bytes);
    } catch (err) {
      logger.error({ err, runId }, 'solver threw');
      outcome = { kind: 'failed', message: `The solver stopped with an internal error: ${err instanceof Error ? err.message : String(err)}` };
    } finally {
      clearInterval(poll);
    }

    if (outcome.kind === 'stopped' && !cancelled && stopping) {
      emitLog(log.add('warn', 'The worker was shut down during this attempt; the run goes back to the queue.'));
      await log.close();
      const jobId = await boss.send(SOLVE_QUEUE, { runId } satisfies SolveJob);
      if (jobId) {
        await results.clear(runId);
        await requeueRun(pool, runId, jobId);
        announce(runId, 'queued', 'The worker was shut down; the run is queued again');
      } else {
        await finishRun(pool, runId, 'failed', 'The worker was shut down and could not queue the run again; re-run it');
        announce(runId, 'failed', 'The worker was shut down; re-run it');
      }
    } else {
      const state = outcome.kind === 'succeeded' ? 'succeeded' : outcome.kind === 'stopped' ? 'cancelled' : 'failed';
      const message = outcome.kind === 'stopped' ? 'Cancelled while running; the frames that converged are kept' : outcome.message;
      // The outcome closes the stored log, so a past log reads to its end without the status line.
      emitLog(log.add(state === 'failed' ? 'error' : 'info', `Run ${state}: ${message}`));
      await log.close();
      await finishRun(pool, runId, state, message);
      announce(runId, state, message);
      logger.info({ runId, outcome: outcome.kind, frames }, 'run finished');
    }
    currentRun = null;
    void beat().catch(() => undefined);
  }

  async function solveJob(job: PgBoss.Job<SolveJob>): Promise<void> {
    const { runId } = solveJobSchema.parse(job.data);
    const claim = await claimRun(pool, runId, id, (rid, client) => results.clear(rid, client));
    if (claim.kind === 'gone') {
      logger.info({ runId }, 'run not claimable (cancelled or taken); job dropped');
      return;
    }
    if (claim.kind === 'limited') {
      await deferRun(runId, claim.priority);
      return;
    }
    await solveClaimed(claim.run);
  }

  await boss.work<SolveJob>(SOLVE_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async (jobs) => {
    for (const job of jobs) await solveJob(job);
  });
  logger.info('worker ready');

  return {
    id,
    async stop() {
      stopping = true;
      clearInterval(heartbeat);
      await boss.stop({ graceful: true, wait: true, timeout: 60_000 });
      await pool.query('DELETE FROM workers WHERE id = $1', [id]).catch(() => undefined);
      await pool.end();
    },
  };
}
