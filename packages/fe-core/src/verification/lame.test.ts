/**
 * Lamé thick cylinder under internal pressure (closed form, e.g. Timoshenko & Goodier, Theory of
 * Elasticity, §28): a = 10, b = 20 mm, p = 100 MPa, E = 200 GPa, ν = 0.3.
 *   σ_rr(r) = A − B/r², σ_θθ(r) = A + B/r², A = p a²/(b² − a²), B = p a² b²/(b² − a²)
 *   → σ_θθ(a) = 166.67 MPa, σ_rr(a) = −100 MPa.
 *   u(a), plane strain: (1+ν)a/E·[(1 − 2ν)A + B/a²] = 9.5333e-3 mm;
 *   closed ends (axisymmetric, σ_zz = A): a/E·[σ_θθ − ν(σ_rr + σ_zz)] = 9.3333e-3 mm.
 */
import { describe, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { rectangle } from '../mesh/structured';
import { recoverNodal } from '../output/recovery';
import { LAME, LAME_SOURCE as SOURCE, lameClosedForm, lameQuarterAnnulus } from './lameCylinder';
import { check, nodeAt, solveModel, type Solved } from './support';

const { a, b, p, E } = LAME;
const nu = 0.3;
const { A, sigmaTT, sigmaRR, uPlaneStrain, uClosedEnd } = lameClosedForm(nu);
const SUITE = 'Elements: closed-form solutions';

/** σ_θθ, σ_rr (nodal, recovered) and u_r at r = a on the x axis against the closed form. */
function checkInnerEdge(label: string, { problem, last }: Solved, hoop: number, uTarget: number): void {
  const s = recoverNodal(problem, last.pointStress, 6);
  const n = nodeAt(problem, a, 0);
  check({ suite: SUITE, name: `${label}: σ_θθ(a)`, computed: s[6 * n + hoop], target: sigmaTT, unit: 'MPa', tolerance: 0.01, source: SOURCE, tag: 'closed' });
  check({ suite: SUITE, name: `${label}: σ_rr(a)`, computed: s[6 * n], target: sigmaRR, unit: 'MPa', tolerance: 0.01, source: SOURCE, tag: 'closed' });
  check({ suite: SUITE, name: `${label}: u_r(a)`, computed: last.displacement[3 * n], target: uTarget, unit: 'mm', tolerance: 0.002, source: SOURCE, tag: 'closed' });
}

describe('Lamé thick cylinder', () => {
  it('plane strain quarter annulus (Q8)', () => {
    const model = lameQuarterAnnulus('q8', nu, 8, 2);
    // On the x axis the hoop direction is y (stress component 1) and the radial direction x.
    checkInnerEdge('Lamé plane strain, Q8', solveModel(model), 1, uPlaneStrain);
  });

  it('axisymmetric closed-end cylinder (Q8)', () => {
    // r–z strip; the end cap's pull is an axial traction σ_zz = A on the top edge.
    const mesh = rectangle({ x0: a, y0: 0, width: b - a, height: 1, nx: 20, ny: 1 }, { type: 'q8', section: 'ring', material: 'steel' });
    const model: ModelInput = {
      format: 'phaseloop-model/1',
      ...mesh,
      sections: { ring: { kind: 'continuum', analysis: 'axisymmetric' } },
      materials: { steel: { model: 'linear-elastic', E, nu } },
      supports: [{ type: 'fixed', set: 'bottom', dofs: ['uy'] }],
      loads: [
        { type: 'pressure', name: 'p', edgeSet: 'left' },
        { type: 'traction', name: 'cap', edgeSet: 'top', direction: [0, 1] },
      ],
      segments: [{ name: 'pressurise', targets: { p, cap: A }, increments: { initial: 1, min: 0.1, max: 1 } }],
    };
    // Axisymmetric stress order: rr, zz, θθ.
    checkInnerEdge('Lamé axisymmetric closed end, Q8', solveModel(model), 2, uClosedEnd);
  });
});
