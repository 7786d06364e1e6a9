/**
 * Mesh convergence rates against a closed form. Thick cylinder (a = 10, b = 20 mm, p = 100 MPa,
 * E = 200 GPa, ν = 0.3) modelled axisymmetrically on the square r ∈ [10, 20], z ∈ [0, 10] with
 * u_z = 0 on both ends (plane strain along the axis), so the geometry is exact for every element.
 *
 * Measure: the energy norm of the error. For a compatible displacement model loaded by
 * tractions, ‖u − u_h‖²_E = f(u) − f(u_h), the difference of the external work done by the exact
 * and the discrete solutions (Galerkin orthogonality), and f(u) = p·u(a)·2πa·H in closed form.
 * Theory (e.g. Strang & Fix, An Analysis of the Finite Element Method): ‖u − u_h‖_E = O(h^p),
 * p = 1 for linear (T3, Q4) and 2 for quadratic (T6, Q8) elements. Triangles start from 8×8
 * (each square split in two) because their coarsest meshes are still pre-asymptotic.
 */
import { describe, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { rectangle, type ContinuumType } from '../mesh/structured';
import { check, logLogSlope, solveModel } from './support';

const a = 10, b = 20, H = 10, p = 100, E = 200000, nu = 0.3;
const A = (p * a * a) / (b * b - a * a);
const B = (p * a * a * b * b) / (b * b - a * a);
const uA = ((1 + nu) * a / E) * ((1 - 2 * nu) * A + B / (a * a));
const exactWork = p * uA * 2 * Math.PI * a * H;

function energyError(type: ContinuumType, n: number): number {
  const mesh = rectangle({ x0: a, y0: 0, width: b - a, height: H, nx: n, ny: n }, { type, section: 'ring', material: 'steel' });
  const model: ModelInput = {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { ring: { kind: 'continuum', analysis: 'axisymmetric' } },
    materials: { steel: { model: 'linear-elastic', E, nu } },
    supports: [
      { type: 'fixed', set: 'bottom', dofs: ['uy'] },
      { type: 'fixed', set: 'top', dofs: ['uy'] },
    ],
    loads: [{ type: 'pressure', name: 'p', edgeSet: 'left' }],
    segments: [{ name: 'pressurise', targets: { p }, increments: { initial: 1, min: 0.1, max: 1 } }],
  };
  const { problem, last } = solveModel(model);
  const pattern = problem.loadPatterns[0]!;
  let work = 0;
  for (let node = 0; node < problem.nodeCount; node++) {
    for (let d = 0; d < 2; d++) work += p * pattern[problem.dofStart[node] + d] * last.displacement[3 * node + d];
  }
  return Math.sqrt(Math.max(exactWork - work, 0));
}

describe('mesh convergence rates (energy norm)', () => {
  const cases: { type: ContinuumType; meshes: number[]; rate: number }[] = [
    { type: 'q4', meshes: [4, 8, 16, 32], rate: 1 },
    { type: 't3', meshes: [8, 16, 32], rate: 1 },
    { type: 'q8', meshes: [4, 8, 16, 32], rate: 2 },
    { type: 't6', meshes: [8, 16, 32], rate: 2 },
  ];
  for (const c of cases) {
    it(`${c.type}: fitted slope of log error against log h`, () => {
      const h = c.meshes.map((n) => (b - a) / n);
      const errors = c.meshes.map((n) => energyError(c.type, n));
      for (let i = 1; i < errors.length; i++) {
        if (!(errors[i] < errors[i - 1])) throw new Error(`${c.type}: error did not fall (${errors.join(', ')})`);
      }
      check({
        suite: 'Elements: convergence rates',
        name: `${c.type}, meshes ${c.meshes.map((n) => `${n}×${n}`).join(', ')}: energy-norm error slope`,
        computed: logLogSlope(h, errors),
        target: c.rate,
        unit: '–',
        tolerance: 0.1,
        absolute: true,
        source: 'a-priori error estimate ‖u − u_h‖_E = O(h^p) (Strang & Fix); Lamé closed form',
        tag: 'closed',
      });
    });
  }
});
