/**
 * Test support for SMA models inside structures: one solve that records every increment's
 * residual sequence and the cut-backs, and the quarter plate with a hole that both SMA structure
 * suites load and unload at 37 °C.
 */
import { parseModel, type MaterialParams, type ModelInput } from '@phaseloop/shared';
import { buildProblem } from '../assembly/problem';
import { quarterPlateWithHole } from '../mesh/structured';
import { runAnalysis } from '../solve/nonlinear/driver';

/** `predictor: false` makes the first iterate strain only the driven nodes: real Newton work to measure. */
export function solveRecording(input: ModelInput, options: { predictor?: boolean } = {}) {
  const parsed = parseModel(input);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  const sequences: number[][] = [];
  let cutBacks = 0;
  const result = runAnalysis(buildProblem(parsed.model), {
    ...(options.predictor === undefined ? {} : { predictor: options.predictor }),
    onIteration: (i) => {
      if (i.iteration === 0) sequences.push([]);
      sequences[sequences.length - 1].push(i.residualNorm);
    },
    onCutBack: () => cutBacks++,
  });
  return { result, sequences, cutBacks };
}

/** Plate half-width of the quarter model (mm); the top edge is pulled to 4 % of it and back. */
export const PLATE_HALF_WIDTH = 10;

/** Plane-stress quarter plate with a hole, symmetric supports, pulled on the top edge and released. */
export function plateWithHoleLoop(type: 'q4' | 'q8', material: MaterialParams): ModelInput {
  const W = PLATE_HALF_WIDTH;
  const mesh = quarterPlateWithHole({ radius: 2, halfWidth: W, halfHeight: W, nAround: 2, nRadial: 3, ratio: 3 }, { type, section: 's', material: 'niti' });
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
    materials: { niti: material },
    initialTemperature: 37,
    supports: [
      { type: 'symmetry', set: 'left', normal: 'x' },
      { type: 'symmetry', set: 'bottom', normal: 'y' },
    ],
    loads: [{ type: 'displacement', name: 'pull', set: 'top', dof: 'uy' }],
    segments: [
      { name: 'load', targets: { pull: 0.04 * W }, increments: { initial: 0.025, min: 0.001, max: 0.025 } },
      { name: 'unload', targets: { pull: 0 }, increments: { initial: 0.025, min: 0.001, max: 0.025 } },
    ],
    output: { fields: ['displacement', 'reaction', 'martensiteFraction'], points: [], reactionSums: [{ name: 'base', set: 'bottom' }] },
    solver: { forceTolerance: 1e-9, displacementTolerance: 1e-9, lineSearch: false },
  } as ModelInput;
}
