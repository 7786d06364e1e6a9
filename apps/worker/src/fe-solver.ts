/**
 * The real solver: the study's fe-core model, with library materials resolved from the frozen
 * snapshot, solved in a worker thread so that this process keeps its heartbeat, writes results
 * as they converge and sees a cancel request while the thread computes.
 */
import { Worker } from 'node:worker_threads';
import { resolveMaterialReferences } from '@phaseloop/shared';
import { SOLVER_NAME, SOLVER_VERSION } from '@phaseloop/fe-core';
import type { FrameReport, RunSnapshotForSolver, RunSolver, SolveHooks, SolveOutcome } from './solver';
import { RUN_ON, STOP_AFTER_INCREMENT, STOP_NOW, type ThreadInput, type ThreadMessage } from './thread-protocol';

export const FE_SOLVER_LABEL = `${SOLVER_NAME} ${SOLVER_VERSION}`;

/** The fe-core model of a snapshot, with `{ materialVersionId }` entries replaced by their parameters. */
export function snapshotModel(snapshot: RunSnapshotForSolver): unknown {
  const definition = snapshot.study.definition as { model?: unknown };
  const params = new Map(snapshot.materials.map((m) => [m.versionId, m.params]));
  return resolveMaterialReferences(definition.model, (id) => params.get(id));
}

/**
 * The thread's entry is a TypeScript source run through tsx, like the rest of the worker. Node 20
 * does not pass a process's module hooks on to worker threads, so the thread registers tsx itself
 * before importing the entry.
 */
function startThread(): Worker {
  const entry = new URL('./solve-thread.ts', import.meta.url).href;
  const tsxApi = import.meta.resolve('tsx/esm/api');
  const boot = `import(${JSON.stringify(tsxApi)}).then((m) => { m.register(); return import(${JSON.stringify(entry)}); });`;
  return new Worker(boot, { eval: true, workerData: null });
}

export interface FeSolverOptions {
  /** How often the stop request is checked while the thread computes (ms). */
  pollMs?: number;
}

/** One solve at a time per solver (the worker takes one job at a time); the thread is kept between solves. */
export function createFeCoreSolver(options: FeSolverOptions = {}): RunSolver {
  let thread: Worker | null = null;
  const obtain = (): Worker => {
    if (!thread) {
      const t = startThread();
      t.once('exit', () => { if (thread === t) thread = null; });
      thread = t;
    }
    return thread;
  };
  return {
    async solve(snapshot, hooks) {
      const t = obtain();
      t.ref();
      try {
        return await solveInThread(t, snapshotModel(snapshot), hooks, options.pollMs ?? 20);
      } finally {
        t.removeAllListeners('message');
        t.removeAllListeners('error');
        // An idle thread must not keep the process alive.
        t.unref();
      }
    },
  };
}

function solveInThread(thread: Worker, model: unknown, hooks: SolveHooks, pollMs: number): Promise<SolveOutcome> {
  if (model === undefined) return Promise.resolve({ kind: 'failed', message: 'The study has no model to solve (definition.model is missing).' });
  const stopFlag = new SharedArrayBuffer(4);
  const flag = new Int32Array(stopFlag);
  const input: ThreadInput = { model, stopFlag };

  return new Promise<SolveOutcome>((resolve) => {
    // Messages are handled one after another so frames are stored in order before the end.
    let chain: Promise<unknown> = Promise.resolve();
    let settled = false;
    const finishHooks: (() => void)[] = [];
    const finish = (outcome: SolveOutcome) => {
      if (settled) return;
      settled = true;
      clearInterval(watch);
      for (const h of finishHooks) h();
      resolve(outcome);
    };
    const watch = setInterval(() => {
      if (Atomics.load(flag, 0) !== RUN_ON) return;
      if (hooks.shouldStop()) Atomics.store(flag, 0, STOP_NOW);
      else if (hooks.shouldStopAfterIncrement?.()) Atomics.store(flag, 0, STOP_AFTER_INCREMENT);
    }, pollMs);

    thread.on('message', (message: ThreadMessage) => {
      chain = chain.then(() => handle(message)).catch((err: unknown) => {
        // The thread may still be mid-solve: end it, so no late message reaches the next run.
        finish({ kind: 'failed', message: `Results could not be stored: ${err instanceof Error ? err.message : String(err)}` });
        void thread.terminate();
      });
    });
    thread.on('error', (err) => finish({ kind: 'failed', message: `The solver stopped with an internal error: ${err.message}` }));
    const onExit = (code: number) => {
      void chain.then(() => finish({ kind: 'failed', message: `The solver thread ended unexpectedly (exit code ${code})` }));
    };
    thread.once('exit', onExit);
    finishHooks.push(() => thread.off('exit', onExit));
    thread.postMessage(input);

    async function handle(message: ThreadMessage): Promise<void> {
      switch (message.type) {
        case 'iteration':
          hooks.onIteration(message.report);
          return;
        case 'log':
          hooks.onLog?.(message.level, message.message);
          return;
        case 'frame': {
          const report: FrameReport = {
            segment: message.segment, increment: message.increment, time: message.time, history: message.history,
            summary: { maxVonMises: message.maxVonMises, maxXi: message.maxXi },
            files: [{ name: `frame-${message.index}.vtu`, contentType: 'application/xml', bytes: message.vtu }],
          };
          await hooks.onFrame(report);
          return;
        }
        case 'done': {
          const files = message.files
            ? [
              { name: 'result.json', contentType: 'application/json', bytes: message.files.resultJson },
              { name: 'frames.pvd', contentType: 'application/xml', bytes: message.files.pvd },
              { name: 'history.csv', contentType: 'text/csv', bytes: message.files.csv },
              ...(message.files.split ?? []),
            ]
            : [];
          if (message.status === 'succeeded') finish({ kind: 'succeeded', message: message.message, files });
          else if (message.status === 'cancelled') finish({ kind: 'stopped', message: 'stopped', files });
          else finish({ kind: 'failed', message: message.message, files });
        }
      }
    }
  });
}
