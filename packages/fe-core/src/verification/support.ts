/**
 * Helpers of the verification suite: solve a model document through the whole pipeline
 * (schema → problem → nonlinear driver → frames), read values back, and record + assert each
 * check against its outside source.
 */
import { expect } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { recordCheck, type VerificationCheck } from '@phaseloop/tests/support/verification';
import { buildProblem, type Problem } from '../assembly/problem';
import { runAnalysis, type AnalysisOptions, type AnalysisResult } from '../solve/nonlinear/driver';
import type { Frame } from '../output/frame';

export interface Solved {
  problem: Problem;
  result: AnalysisResult;
  last: Frame;
}

export function solveModel(input: ModelInput, options: AnalysisOptions = {}): Solved {
  const parsed = parseModel(input);
  if (!parsed.ok) throw new Error(parsed.issues.map((i) => `${i.path}: ${i.message}`).join('\n'));
  const problem = buildProblem(parsed.model);
  const result = runAnalysis(problem, options);
  if (result.status !== 'succeeded') throw new Error(`analysis ${result.status}: ${result.failure?.message}`);
  return { problem, result, last: result.frames[result.frames.length - 1] };
}

/** Index of the node at (x, y), failing loudly when the mesh has no node there. */
export function nodeAt(problem: Problem, x: number, y: number, tol = 1e-6): number {
  for (let i = 0; i < problem.nodeCount; i++) {
    if (Math.abs(problem.coords[2 * i] - x) <= tol * problem.size && Math.abs(problem.coords[2 * i + 1] - y) <= tol * problem.size) return i;
  }
  throw new Error(`no node at (${x}, ${y})`);
}

/** Records the check for docs/verification.md and asserts it. */
export function check(c: VerificationCheck): number {
  const { error, pass } = recordCheck(c);
  expect(Number.isFinite(c.computed), `${c.name}: computed value is not finite`).toBe(true);
  expect(pass, `${c.name}: computed ${c.computed} vs target ${c.target} ${c.unit} (error ${error.toExponential(3)}, allowed ${c.tolerance})`).toBe(true);
  return error;
}

/** Least-squares slope of log(y) against log(x). */
export function logLogSlope(x: readonly number[], y: readonly number[]): number {
  const lx = x.map(Math.log);
  const ly = y.map(Math.log);
  const n = x.length;
  const mx = lx.reduce((a, b) => a + b, 0) / n;
  const my = ly.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (lx[i] - mx) * (ly[i] - my);
    sxx += (lx[i] - mx) ** 2;
  }
  return sxy / sxx;
}
