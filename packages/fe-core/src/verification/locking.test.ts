/**
 * Near incompressibility through the pipeline: the Lamé cylinder in plane strain with ν = 0.4999
 * (a = 10, b = 20 mm, p = 100 MPa, E = 200 GPa). Closed form u(a) = (1+ν)a/E·[(1 − 2ν)A + B/a²]
 * (Timoshenko & Goodier). Plain Q4 locks volumetrically; the Q4 remedies (B-bar, enhanced
 * assumed strain) must not, which matters because SMA transformation flow is isochoric.
 */
import { describe, expect, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { ellipticRing, type ContinuumType } from '../mesh/structured';
import { check, nodeAt, solveModel } from './support';

const a = 10, b = 20, p = 100, E = 200000, nu = 0.4999;
const A = (p * a * a) / (b * b - a * a);
const B = (p * a * a * b * b) / (b * b - a * a);
const uA = ((1 + nu) * a / E) * ((1 - 2 * nu) * A + B / (a * a));

function innerDisplacement(type: ContinuumType): number {
  const mesh = ellipticRing({ inner: { a, b: a }, outer: { a: b, b }, nAround: 8, nRadial: 6 }, { type, section: 's', material: 'rubberlike' });
  const model: ModelInput = {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { s: { kind: 'continuum', analysis: 'planeStrain', thickness: 1 } },
    materials: { rubberlike: { model: 'linear-elastic', E, nu } },
    supports: [
      { type: 'symmetry', set: 'start', normal: 'y' },
      { type: 'symmetry', set: 'end', normal: 'x' },
    ],
    loads: [{ type: 'pressure', name: 'p', edgeSet: 'inner' }],
    segments: [{ name: 'pressurise', targets: { p }, increments: { initial: 1, min: 0.1, max: 1 } }],
  };
  const { problem, last } = solveModel(model);
  return last.displacement[3 * nodeAt(problem, a, 0)];
}

describe('volumetric locking (ν = 0.4999, plane strain Lamé cylinder)', () => {
  for (const type of ['q4-bbar', 'q4-eas'] as const) {
    it(`${type} does not lock`, () => {
      check({
        suite: 'Elements: closed-form solutions',
        name: `Lamé plane strain ν = 0.4999, ${type} 8×6: u_r(a)`,
        computed: innerDisplacement(type),
        target: uA,
        unit: 'mm',
        tolerance: 0.01,
        source: 'Lamé thick cylinder, closed form (Timoshenko & Goodier, Theory of Elasticity)',
        tag: 'closed',
      });
    });
  }

  it('plain Q4 locks (the reason for the remedies)', () => {
    expect(innerDisplacement('q4')).toBeLessThan(0.9 * uA);
  });
});
