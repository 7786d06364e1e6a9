/**
 * One worker process: consumes the solve queue (one run at a time: a solve is CPU-bound, so run
 * one worker process per core), reports a heartbeat for /api/health and the queue overview,
 * streams progress into Socket.IO rooms and stores results. Any number of workers on any number
 * of machines can share a queue: all they need is DATABASE_URL.
 */
import os from 'node:os';
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import PgBoss from 'pg-boss';
import { pino, type Logger } from 'pino';
import { SOLVE_QUEUE, SOLVE_QUEUE_POLICY, solveJobSchema, type RunState, type SolveJob } from '@phaseloop/shared';
import { createRunEmitter, type RunEventSink } from './emitter';
import { cancelRequested, claimRun, finishRun, requeueRun, saveFile, saveFrame, saveIterations } from './run-store';
import { unavailableSolver, type IterationReport, type RunSolver, type SolveOutcome } from './solver';

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
  version?: string;
}

export interface RunningWorker {
  id: string;
  /** Stops taking jobs; a running solve stops between iterations and goes back to the queue. */
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
  const logger = options.logger ?? pino({ base: { service: 'worker', worker: id } });
  const solver = options.solver ?? unavailableSolver;
  const pool = new pg.Pool({ connectionString: options.databaseUrl, max: 4 });
  const events = options.events ?? createRunEmitter(pool);
  const boss = new PgBoss({ connectionString: options.databaseUrl, schema: 'pgboss', max: 3, schedule: false });
  boss.on('error', (err) => logger.error({ err }, 'pg-boss'));
  await boss.start();
  await ensureQueue(boss);

  let stopping = false;
  let currentRun: string | null = null;

  const beat = async () => {
    await pool.query(
      `INSERT INTO workers (id, hostname, pid, version, current_run_id) VALUES ($1, $2, $3, $4, $5)
       ON CONFLICT (id) DO UPDATE SET last_seen_at = now(), current_run_id = EXCLUDED.current_run_id`,
      [id, os.hostname(), process.pid, options.version ?? '', currentRun],
    );
  };
  await beat();
  const heartbeat = setInterval(() => void beat().catch((err: unknown) => logger.warn({ err }, 'heartbeat failed')), (options.heartbeatSeconds ?? 10) * 1000);

  const now = () => new Date().toISOString();
  const announce = (runId: string, state: RunState, message = '') => events.status({ runId, state, message, at: now() });

  async function solveRun(job: PgBoss.Job<SolveJob>): Promise<void> {
    const { runId } = solveJobSchema.parse(job.data);
    const run = await claimRun(pool, runId, id);
    if (!run) {
      logger.info({ runId }, 'run not claimable (cancelled or taken); job dropped');
      return;
    }
    currentRun = runId;
    void beat().catch(() => undefined);
    announce(runId, 'running');
    logger.info({ runId }, 'solving');

    // The cancel flag is refreshed in the background so that shouldStop() stays synchronous.
    let cancelled = false;
    const poll = setInterval(() => {
      cancelRequested(pool, runId).then((c) => { cancelled = c; }, () => undefined);
    }, options.cancelPollMs ?? 250);

    let seq = 0;
    let pending: IterationReport[] = [];
    const flush = async () => {
      const batch = pending;
      pending = [];
      await saveIterations(pool, runId, seq - batch.length, batch);
    };
    let frames = 0;

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
          for (const f of report.files ?? []) await saveFile(pool, runId, f.name, f.contentType, f.bytes);
          events.frame({ runId, frame, segment: report.segment, increment: report.increment, time: report.time, history: report.history });
        },
        shouldStop: () => cancelled || stopping,
      });
      await flush();
      if (outcome.kind === 'succeeded') for (const f of outcome.files ?? []) await saveFile(pool, runId, f.name, f.contentType, f.bytes);
    } catch (err) {
      logger.error({ err, runId }, 'solver threw');
      outcome = { kind: 'failed', message: `The solver stopped with an internal error: ${err instanceof Error ? err.message : String(err)}` };
    } finally {
      clearInterval(poll);
    }

    if (outcome.kind === 'stopped' && !cancelled && stopping) {
      const jobId = await boss.send(SOLVE_QUEUE, { runId } satisfies SolveJob);
      if (jobId) {
        await requeueRun(pool, runId, jobId);
        announce(runId, 'queued', 'The worker was shut down; the run is queued again');
      } else {
        await finishRun(pool, runId, 'failed', 'The worker was shut down and could not queue the run again; re-run it');
        announce(runId, 'failed', 'The worker was shut down; re-run it');
      }
    } else {
      const state = outcome.kind === 'succeeded' ? 'succeeded' : outcome.kind === 'stopped' ? 'cancelled' : 'failed';
      const message = outcome.kind === 'stopped' ? 'Cancelled while running; the frames that converged are kept' : outcome.message;
      await finishRun(pool, runId, state, message);
      announce(runId, state, message);
    }
    currentRun = null;
    void beat().catch(() => undefined);
    logger.info({ runId, outcome: outcome.kind }, 'run finished');
  }

  await boss.work<SolveJob>(SOLVE_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async (jobs) => {
    for (const job of jobs) await solveRun(job);
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
