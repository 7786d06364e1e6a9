/**
 * Scalar history of a frame: point outputs (nodal fields interpolated at each requested point,
 * see probe.ts) and reaction sums over node sets.
 */
import type { Problem } from '../assembly/problem';
import { pointScalar, vonMises, type Frame } from './frame';
import { interpolate, type Probe } from './probe';
import { recoverNodal } from './recovery';

const SQRT2 = Math.SQRT2;

/** History values of a frame: point outputs at their probes and reaction sums on sets. */
export function frameHistory(problem: Problem, frame: Omit<Frame, 'history'>, probes: readonly Probe[]): Record<string, number> {
  const h: Record<string, number> = { time: frame.time };
  const out = problem.model.output;
  if (out.points.length > 0) {
    const vm = recoverNodal(problem, pointScalar(frame.pointStress, vonMises), 1);
    const stress = recoverNodal(problem, frame.pointStress, 6);
    const xi = recoverNodal(problem, frame.pointXi, 1);
    out.points.forEach((pt, k) => {
      const p = probes[k];
      const put = (key: string, value: number) => {
        // Values a point cannot have (stress at a beam node) are left out rather than NaN.
        if (Number.isFinite(value)) h[`${pt.name}.${key}`] = value;
      };
      put('ux', interpolate(p, frame.displacement, 3, 0));
      put('uy', interpolate(p, frame.displacement, 3, 1));
      put('rz', interpolate(p, frame.displacement, 3, 2));
      put('temperature', interpolate(p, frame.temperature, 1, 0));
      put('vonMises', interpolate(p, vm, 1, 0));
      put('sxx', interpolate(p, stress, 6, 0));
      put('syy', interpolate(p, stress, 6, 1));
      put('sxy', interpolate(p, stress, 6, 5) / SQRT2);
      put('xi', interpolate(p, xi, 1, 0));
    });
  }
  for (const sum of out.reactionSums) {
    let fx = 0, fy = 0, mz = 0;
    for (const id of problem.model.nodeSets[sum.set]) {
      const n = problem.nodeIndex.get(id)!;
      fx += frame.reaction[3 * n];
      fy += frame.reaction[3 * n + 1];
      mz += frame.reaction[3 * n + 2];
    }
    h[`${sum.name}.Fx`] = fx;
    h[`${sum.name}.Fy`] = fy;
    h[`${sum.name}.Mz`] = mz;
  }
  return h;
}
