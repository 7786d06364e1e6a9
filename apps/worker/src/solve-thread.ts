/**
 * Runs inside a node:worker_threads Worker (one per worker process, reused run after run): builds the fe-core problem from a resolved model and
 * solves it synchronously, posting every iteration, cut-back and converged frame to the parent.
 * The parent's thread stays free for the heartbeat, database writes and cancel checks; a cancel
 * reaches this thread through a SharedArrayBuffer flag read between iterations.
 */
import { parentPort, workerData } from 'node:worker_threads';
import {
  buildProblem, buildResultDocument, frameToVtu, framesToPvd, historyCsv, parseModel, runAnalysis, vonMises,
  type Frame,
} from '@phaseloop/fe-core';
import type { ThreadInput, ThreadMessage } from './thread-protocol';
import { STOP_AFTER_INCREMENT, STOP_NOW } from './thread-protocol';
import { splitResultFiles } from './result-files';

function maxOf(values: Float64Array): number {
  let m = 0;
  for (const v of values) if (Number.isFinite(v) && v > m) m = v;
  return m;
}

function maxVonMises(frame: Frame): number {
  let m = 0;
  for (let o = 0; o + 6 <= frame.pointStress.length; o += 6) m = Math.max(m, vonMises(frame.pointStress, o));
  return m;
}

function post(message: ThreadMessage, transfer: ArrayBuffer[] = []): void {
  parentPort!.postMessage(message, transfer);
}

function solve(input: ThreadInput): void {
  const flag = new Int32Array(input.stopFlag);
  const parsed = parseModel(input.model);
  if (!parsed.ok) {
    post({ type: 'done', status: 'failed', message: `The model is not valid: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}` });
    return;
  }
  const started = performance.now();
  let problem;
  try {
    problem = buildProblem(parsed.model);
  } catch (err) {
    post({ type: 'done', status: 'failed', message: `The model could not be set up: ${err instanceof Error ? err.message : String(err)}` });
    return;
  }
  const fields = parsed.model.output.fields;
  post({ type: 'log', level: 'info', message: `Model: ${parsed.model.nodes.length} nodes, ${parsed.model.elements.length} elements, ${parsed.model.segments.length} segment(s)` });
  const encoder = new TextEncoder();
  let stopAfterFrame = false;
  const result = runAnalysis(problem, {
    onIteration: (info) => post({
      type: 'iteration',
      report: { segment: info.segment, increment: info.increment, iteration: info.iteration, time: info.time, residualNorm: info.residualNorm, correctionNorm: info.correctionNorm, cutBacks: info.cutBacks },
    }),
    onCutBack: (info) => post({ type: 'log', level: 'warn', message: `Segment "${info.segmentName}" at t = ${info.time.toPrecision(4)} s: increment cut back (${info.reason})` }),
    onFrame: (frame) => {
      const vtu = encoder.encode(frameToVtu(problem, frame, fields));
      post({
        type: 'frame',
        index: frame.index, segment: frame.segment, increment: frame.increment, time: frame.time, history: frame.history,
        maxVonMises: maxVonMises(frame), maxXi: maxOf(frame.pointXi), vtu,
      }, [vtu.buffer as ArrayBuffer]);
      if (Atomics.load(flag, 0) === STOP_AFTER_INCREMENT) stopAfterFrame = true;
    },
    shouldStop: () => Atomics.load(flag, 0) === STOP_NOW || stopAfterFrame,
  });
  const pvd = framesToPvd(result.frames.map((f) => ({ time: f.time, file: `frame-${f.index}.vtu` })));
  const doc = buildResultDocument(problem, result, (performance.now() - started) / 1000);
  post({
    type: 'done',
    status: result.status,
    message: result.status === 'failed' ? (result.failure?.message ?? 'The analysis did not converge') : result.status === 'succeeded' ? `Converged: ${result.stats.increments} increments, ${result.stats.iterations} iterations, ${result.stats.cutBacks} cut-backs` : 'stopped',
    files: {
      resultJson: encoder.encode(JSON.stringify(doc)),
      pvd: encoder.encode(pvd),
      csv: encoder.encode(historyCsv(result.frames)),
      split: splitResultFiles(doc, encoder),
    },
  });
}

// The thread stays up between runs (starting one costs far more than a small solve); each
// message from the worker process is one solve.
function solveSafely(input: ThreadInput): void {
  try {
    solve(input);
  } catch (err) {
    post({ type: 'done', status: 'failed', message: `The solver stopped with an internal error: ${err instanceof Error ? err.message : String(err)}` });
  }
}

parentPort!.on('message', (input: ThreadInput) => solveSafely(input));
if (workerData) solveSafely(workerData as ThreadInput);
