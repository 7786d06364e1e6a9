/**
 * Kirsch (1898): a circular hole in an infinite plate under remote uniaxial stress σ has
 * σ_θθ(a, θ) = σ(1 − 2 cos 2θ), θ measured from the load axis: 3σ at 90° from the load axis and
 * −σ on it. Quarter model of an 80 × 80 mm plate with a 2 mm hole (width = 40 hole diameters),
 * load along y.
 */
import { describe, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { quarterPlateWithHole } from '../mesh/structured';
import { recoverNodal } from '../output/recovery';
import { check, nodeAt, solveModel } from './support';

describe('Kirsch plate with a hole', () => {
  it('stress concentration at the hole (Q8, plane stress)', () => {
    const sigma = 100;
    const mesh = quarterPlateWithHole({ radius: 1, halfWidth: 40, halfHeight: 40, nAround: 12, nRadial: 20, ratio: 40 }, { type: 'q8', section: 'sheet', material: 'steel' });
    const model: ModelInput = {
      format: 'phaseloop-model/1',
      ...mesh,
      sections: { sheet: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
      materials: { steel: { model: 'linear-elastic', E: 200000, nu: 0.3 } },
      supports: [
        { type: 'symmetry', set: 'left', normal: 'x' },
        { type: 'symmetry', set: 'bottom', normal: 'y' },
      ],
      loads: [{ type: 'traction', name: 'remote', edgeSet: 'top', direction: [0, 1] }],
      segments: [{ name: 'pull', targets: { remote: sigma }, increments: { initial: 1, min: 0.1, max: 1 } }],
    };
    const { problem, last } = solveModel(model);
    const s = recoverNodal(problem, last.pointStress, 6);
    const source = 'Kirsch (1898) closed form σ_θθ = σ(1 − 2cos2θ)';
    check({
      suite: 'Elements: closed-form solutions',
      name: 'Kirsch hole, Q8: σ_θθ at 90° from the load axis (3σ)',
      computed: s[6 * nodeAt(problem, 1, 0) + 1],
      target: 3 * sigma,
      unit: 'MPa',
      tolerance: 0.02,
      source,
      tag: 'closed',
    });
    check({
      suite: 'Elements: closed-form solutions',
      name: 'Kirsch hole, Q8: σ_θθ on the load axis (−σ)',
      computed: s[6 * nodeAt(problem, 0, 1)],
      target: -sigma,
      unit: 'MPa',
      tolerance: 0.03,
      source,
      tag: 'closed',
    });
  });
});
