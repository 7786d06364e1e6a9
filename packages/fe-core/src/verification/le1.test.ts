/**
 * NAFEMS LE1, elliptic membrane (The Standard NAFEMS Benchmarks, TNSB Rev. 3, 1990).
 * Plane stress quarter model between the ellipses x²/2² + y²/1² = 1 and x²/3.25² + y²/2.75² = 1
 * (metres; here in mm), thickness 0.1 m, E = 210 GPa, ν = 0.3, u_x = 0 on x = 0, u_y = 0 on
 * y = 0, outward normal traction 10 MPa on the outer ellipse. Target: σ_yy at D(2, 0) = 92.7 MPa.
 */
import { describe, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { ellipticRing, type ContinuumType } from '../mesh/structured';
import { recoverNodal } from '../output/recovery';
import { check, nodeAt, solveModel } from './support';

const SOURCE = 'NAFEMS TNSB Rev. 3 (1990), LE1 elliptic membrane';

function le1(type: ContinuumType, nAround: number, nRadial: number, ratio: number): number {
  const mesh = ellipticRing({ inner: { a: 2000, b: 1000 }, outer: { a: 3250, b: 2750 }, nAround, nRadial, ratio }, { type, section: 'membrane', material: 'steel' });
  const model: ModelInput = {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { membrane: { kind: 'continuum', analysis: 'planeStress', thickness: 100 } },
    materials: { steel: { model: 'linear-elastic', E: 210000, nu: 0.3 } },
    supports: [
      { type: 'symmetry', set: 'end', normal: 'x' },
      { type: 'symmetry', set: 'start', normal: 'y' },
    ],
    // Outward traction is a negative pressure.
    loads: [{ type: 'pressure', name: 'outer', edgeSet: 'outer' }],
    segments: [{ name: 'load', targets: { outer: -10 }, increments: { initial: 1, min: 0.1, max: 1 } }],
  };
  const { problem, last } = solveModel(model);
  const stress = recoverNodal(problem, last.pointStress, 6);
  return stress[6 * nodeAt(problem, 2000, 0) + 1];
}
// Nodal stress at D: per-element Gauss-point extrapolation averaged over the elements at D for
// quadrilaterals, patch recovery for triangles (output/recovery.ts).

describe('NAFEMS LE1 elliptic membrane: σ_yy at D', () => {
  // Radial cells graded towards the inner ellipse (outermost `ratio` times the innermost).
  const cases: { type: ContinuumType; nAround: number; nRadial: number; ratio: number; tol: number }[] = [
    { type: 'q4', nAround: 24, nRadial: 8, ratio: 4, tol: 0.02 },
    { type: 't3', nAround: 48, nRadial: 16, ratio: 4, tol: 0.02 },
    { type: 'q8', nAround: 8, nRadial: 3, ratio: 3, tol: 0.015 },
    { type: 't6', nAround: 16, nRadial: 6, ratio: 4, tol: 0.015 },
  ];
  for (const c of cases) {
    it(`${c.type} mesh ${c.nAround}×${c.nRadial}`, () => {
      const syy = le1(c.type, c.nAround, c.nRadial, c.ratio);
      check({
        suite: 'Elements: NAFEMS benchmarks',
        name: `LE1 elliptic membrane, ${c.type} ${c.nAround}×${c.nRadial}${c.type.startsWith('t') ? ' (×2 triangles)' : ''}: σ_yy at D`,
        computed: syy,
        target: 92.7,
        unit: 'MPa',
        tolerance: c.tol,
        source: SOURCE,
        tag: 'pub',
      });
    });
  }
});
