/**
 * The API's side of the job queue (pg-boss on the same PostgreSQL). The job carries only the run
 * id; the worker reads the frozen snapshot from the runs table.
 */
import PgBoss from 'pg-boss';
import { SOLVE_QUEUE, SOLVE_QUEUE_POLICY, type SolveJob } from '@phaseloop/shared';

export interface RunQueue {
  /** Returns the job id. Higher priority is picked up first. */
  enqueue(runId: string, priority?: number): Promise<string>;
  /** Removes a queued job; a running handler notices the run's cancel flag instead. */
  cancel(jobId: string): Promise<void>;
  stop(): Promise<void>;
}


export async function ensureSolveQueue(boss: PgBoss): Promise<void> {
  // createQueue must come before send/work: sending to a missing queue returns null silently.
  if (await boss.getQueue(SOLVE_QUEUE)) return;
  try {
    await boss.createQueue(SOLVE_QUEUE, { name: SOLVE_QUEUE, ...SOLVE_QUEUE_POLICY });
  } catch (err) {
    // Another process (API or worker) may have created it at the same moment.
    if (!(await boss.getQueue(SOLVE_QUEUE))) throw err;
  }
}

export async function startBoss(databaseUrl: string, options: { supervise: boolean }): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString: databaseUrl, schema: 'pgboss', max: 4, supervise: options.supervise, schedule: false });
  boss.on('error', (err) => console.error('[pg-boss]', err.message));
  await boss.start();
  await ensureSolveQueue(boss);
  return boss;
}

export async function createRunQueue(databaseUrl: string): Promise<RunQueue> {
  const boss = await startBoss(databaseUrl, { supervise: true });
  return {
    async enqueue(runId, priority = 0) {
      const data: SolveJob = { runId };
      const id = await boss.send(SOLVE_QUEUE, data, { priority });
      if (!id) throw new Error(`The queue ${SOLVE_QUEUE} refused the job`);
      return id;
    },
    async cancel(jobId) {
      await boss.cancel(SOLVE_QUEUE, jobId);
    },
    async stop() {
      await boss.stop({ graceful: true, timeout: 5000, wait: true });
    },
  };
}
