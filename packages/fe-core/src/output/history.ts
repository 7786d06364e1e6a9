/**
 * Scalar history of a frame: point outputs (at the node nearest to each requested point) and
 * reaction sums over node sets.
 */
import type { Problem } from '../assembly/problem';
import { pointScalar, vonMises, type Frame } from './frame';
import { recoverNodal } from './recovery';

const SQRT2 = Math.SQRT2;

/** History values of a frame: point outputs at their nearest nodes and reaction sums on sets. */
export function frameHistory(problem: Problem, frame: Omit<Frame, 'history'>, pointNodes: readonly number[]): Record<string, number> {
  const h: Record<string, number> = { time: frame.time };
  const out = problem.model.output;
  if (out.points.length > 0) {
    const vm = recoverNodal(problem, pointScalar(frame.pointStress, vonMises), 1);
    const stress = recoverNodal(problem, frame.pointStress, 6);
    const xi = recoverNodal(problem, frame.pointXi, 1);
    out.points.forEach((pt, k) => {
      const n = pointNodes[k];
      h[`${pt.name}.ux`] = frame.displacement[3 * n];
      h[`${pt.name}.uy`] = frame.displacement[3 * n + 1];
      h[`${pt.name}.rz`] = frame.displacement[3 * n + 2];
      h[`${pt.name}.temperature`] = frame.temperature[n];
      h[`${pt.name}.vonMises`] = vm[n];
      h[`${pt.name}.sxx`] = stress[6 * n];
      h[`${pt.name}.syy`] = stress[6 * n + 1];
      h[`${pt.name}.sxy`] = stress[6 * n + 5] / SQRT2;
      h[`${pt.name}.xi`] = xi[n];
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
