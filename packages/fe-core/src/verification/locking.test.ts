/**
 * Near incompressibility through the pipeline: the Lamé cylinder in plane strain with ν = 0.4999
 * (a = 10, b = 20 mm, p = 100 MPa, E = 200 GPa). Closed form u(a) = (1+ν)a/E·[(1 − 2ν)A + B/a²]
 * (Timoshenko & Goodier). Plain Q4 locks volumetrically; the Q4 remedies (B-bar, enhanced
 * assumed strain) must not, which matters because SMA transformation flow is isochoric.
 */
import { describe, expect, it } from 'vitest';
import type { ContinuumType } from '../mesh/structured';
import { LAME, LAME_SOURCE, lameClosedForm, lameQuarterAnnulus } from './lameCylinder';
import { check, nodeAt, solveModel } from './support';

const nu = 0.4999;
const uA = lameClosedForm(nu).uPlaneStrain;

function innerDisplacement(type: ContinuumType): number {
  const { problem, last } = solveModel(lameQuarterAnnulus(type, nu, 6));
  return last.displacement[3 * nodeAt(problem, LAME.a, 0)];
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
        source: LAME_SOURCE,
        tag: 'closed',
      });
    });
  }

  it('plain Q4 locks (the reason for the remedies)', () => {
    expect(innerDisplacement('q4')).toBeLessThan(0.9 * uA);
  });
});
