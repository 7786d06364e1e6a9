/**
 * `tsx apps/worker/src/index.ts`: one worker process (DATABASE_URL from the environment).
 * Ctrl-C / SIGTERM: a running solve stops between iterations and its run is queued again.
 */
import { pathToFileURL } from 'node:url';
import { startWorker } from './worker';

export { startWorker, type RunningWorker, type WorkerOptions } from './worker';
export type { RunSolver, SolveHooks, SolveOutcome, IterationReport, FrameReport, RunSnapshotForSolver } from './solver';
export { createRunEmitter, type RunEventSink } from './emitter';

async function main(): Promise<void> {
  const databaseUrl = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:55432/phaseloop';
  const worker = await startWorker({ databaseUrl, version: process.env.PHASELOOP_BUILD ?? '' });
  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`[worker] ${signal}: finishing the current step and stopping`);
    worker.stop().then(() => process.exit(0), () => process.exit(1));
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((err: unknown) => {
    console.error('[worker] failed to start:', err instanceof Error ? err.message : err);
    process.exit(1);
  });
}
export { createFeCoreSolver, snapshotModel, FE_SOLVER_LABEL } from './fe-solver';
export { resultStoreFromEnv, pgResultStore, s3ResultStore, s3SettingsFromEnv, type ResultStore, type S3Settings } from './result-store';
