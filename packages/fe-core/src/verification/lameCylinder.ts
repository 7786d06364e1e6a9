/**
 * Test fixture: the Lamé thick cylinder under internal pressure, a = 10, b = 20 mm, p = 100 MPa,
 * E = 200 GPa (closed form from Timoshenko & Goodier, Theory of Elasticity, §28):
 *   σ_rr(r) = A − B/r², σ_θθ(r) = A + B/r², A = p a²/(b² − a²), B = p a² b²/(b² − a²);
 *   u(a), plane strain: (1+ν)a/E·[(1 − 2ν)A + B/a²];
 *   closed ends (axisymmetric, σ_zz = A): a/E·[σ_θθ − ν(σ_rr + σ_zz)].
 * Shared by the closed-form check (lame.test.ts) and the volumetric-locking check (locking.test.ts).
 */
import type { ModelInput } from '@phaseloop/shared';
import { ellipticRing, type ContinuumType } from '../mesh/structured';

export const LAME = { a: 10, b: 20, p: 100, E: 200000 } as const;
export const LAME_SOURCE = 'Lamé thick cylinder, closed form (Timoshenko & Goodier, Theory of Elasticity)';

export interface LameClosedForm {
  readonly A: number;
  readonly B: number;
  readonly sigmaTT: number;
  readonly sigmaRR: number;
  readonly uPlaneStrain: number;
  readonly uClosedEnd: number;
}

/** Stresses at r = a and the inner radial displacement for Poisson's ratio nu. */
export function lameClosedForm(nu: number): LameClosedForm {
  const { a, b, p, E } = LAME;
  const A = (p * a * a) / (b * b - a * a);
  const B = (p * a * a * b * b) / (b * b - a * a);
  const sigmaTT = A + B / (a * a);
  const sigmaRR = A - B / (a * a);
  return {
    A,
    B,
    sigmaTT,
    sigmaRR,
    uPlaneStrain: ((1 + nu) * a / E) * ((1 - 2 * nu) * A + B / (a * a)),
    uClosedEnd: (a / E) * (sigmaTT - nu * (sigmaRR + A)),
  };
}

/**
 * Plane-strain quarter annulus with symmetry on both cut edges and the pressure p on the inner
 * edge; nAround = 8 elements around, `nRadial` across (graded by `ratio` when given).
 */
export function lameQuarterAnnulus(type: ContinuumType, nu: number, nRadial: number, ratio?: number): ModelInput {
  const { a, b, p, E } = LAME;
  const mesh = ellipticRing(
    { inner: { a, b: a }, outer: { a: b, b }, nAround: 8, nRadial, ...(ratio === undefined ? {} : { ratio }) },
    { type, section: 's', material: 'cylinder' },
  );
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { s: { kind: 'continuum', analysis: 'planeStrain', thickness: 1 } },
    materials: { cylinder: { model: 'linear-elastic', E, nu } },
    supports: [
      { type: 'symmetry', set: 'start', normal: 'y' },
      { type: 'symmetry', set: 'end', normal: 'x' },
    ],
    loads: [{ type: 'pressure', name: 'p', edgeSet: 'inner' }],
    segments: [{ name: 'pressurise', targets: { p }, increments: { initial: 1, min: 0.1, max: 1 } }],
  };
}
