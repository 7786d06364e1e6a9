/**
 * Locking: plain Q4 is too stiff in bending (parasitic shear) and near incompressibility
 * (volumetric constraint); q4-eas cures the first, q4-bbar the second.
 */
import { describe, expect, it } from 'vitest';
import { recordCheck } from '@phaseloop/tests/support/verification';
import { createLinearElastic } from '../material/elastic';
import type { Material } from '../material/types';
import { elementKernels } from './index';
import { TestModel, rectangleMesh } from './testing';
import type { ContinuumAnalysis, ElementName } from './types';

const elastic = (nu: number): Material<unknown> =>
  createLinearElastic({ model: 'linear-elastic', E: 200_000, nu, alpha: 0, T_ref: 20 }) as Material<unknown>;

/**
 * Cantilever 10 × 1 (unit thickness) under an end moment M applied as the linear traction
 * t_x = −M y / I at x = L; u = 0 on x = 0 and v = 0 at (0, 0). The elasticity solution
 * u = −Mxy/(E'I), v = M(x² + ν'y²)/(2E'I) (E' = E, ν' = ν in plane stress) satisfies these
 * supports, so the tip deflection at (L, 0) is ML²/(2E'I) — plane strain uses E' = E/(1 − ν²).
 */
function endMomentDeflection(name: ElementName, analysis: ContinuumAnalysis, nu: number, nx: number, ny: number, skew = 0): { computed: number; target: number } {
  const L = 10, h = 1, M = 1000, E = 200_000;
  const I = h ** 3 / 12;
  const mesh = rectangleMesh(nx, ny, 0, L, -h / 2, h / 2);
  // Optional distortion: interior columns lean by ±skew (top and bottom rows move oppositely).
  for (let j = 0; j <= ny; j++) {
    for (let i = 1; i < nx; i++) {
      const k = j * (nx + 1) + i;
      mesh.coords[2 * k] += skew * (i % 2 === 0 ? 1 : -1) * (2 * j / ny - 1);
    }
  }
  const model = new TestModel({ kernel: elementKernels[name], section: { kind: 'continuum', analysis, thickness: 1 }, material: elastic(nu), coords: mesh.coords, elements: mesh.elements });
  const fixed = new Map<number, number>();
  const loads = new Float64Array(model.ndof);
  const rowNode = (i: number, j: number): number => j * (nx + 1) + i;
  for (let j = 0; j <= ny; j++) fixed.set(2 * rowNode(0, j), 0);
  fixed.set(2 * rowNode(0, ny / 2) + 1, 0);
  // Consistent loads of a linear traction on each 2-node edge: (ℓ/6)(2t_a + t_b), (ℓ/6)(t_a + 2t_b).
  for (let j = 0; j < ny; j++) {
    const a = rowNode(nx, j), b = rowNode(nx, j + 1);
    const ya = mesh.coords[2 * a + 1], yb = mesh.coords[2 * b + 1];
    const ta = (-M * ya) / I, tb = (-M * yb) / I, l = yb - ya;
    loads[2 * a] += (l / 6) * (2 * ta + tb);
    loads[2 * b] += (l / 6) * (ta + 2 * tb);
  }
  // Near incompressibility (λ/μ ≈ 5000) the attainable residual is about 1e-9 of the load.
  const r = model.solve({ fixed, loads, tolerance: 1e-8 });
  expect(r.converged).toBe(true);
  const Eeff = analysis === 'planeStrain' ? E / (1 - nu * nu) : E;
  return { computed: model.u[2 * rowNode(nx, ny / 2) + 1], target: (M * L * L) / (2 * Eeff * I) };
}

describe('shear locking in bending (end-moment cantilever, 10 × 2 elements)', () => {
  it('q4-eas gives the exact tip deflection ML²/2EI on rectangles; plain Q4 locks', () => {
    const eas = endMomentDeflection('q4-eas', 'planeStress', 0.3, 10, 2);
    const q4 = endMomentDeflection('q4', 'planeStress', 0.3, 10, 2);
    const check = recordCheck({
      suite: 'Elements: locking', name: 'q4-eas end-moment cantilever 10×2, plane stress: tip deflection', computed: eas.computed, target: eas.target,
      unit: 'mm', tolerance: 1e-8, source: 'closed form: pure bending v = ML²/(2EI)', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    // Plain Q4 recovers only a fraction of it (parasitic shear strain in bending).
    expect(q4.computed / q4.target).toBeLessThan(0.8);
    expect(q4.computed / q4.target).toBeGreaterThan(0.3);
  });

  it('on a distorted mesh (columns leaning ±0.1) q4-eas stays within 10 % (8 % measured) while plain Q4 is 33 % off', () => {
    // EAS is exact only on parallelograms; distortion costs accuracy that refinement recovers.
    const eas = endMomentDeflection('q4-eas', 'planeStress', 0.3, 10, 2, 0.1);
    const q4 = endMomentDeflection('q4', 'planeStress', 0.3, 10, 2, 0.1);
    const check = recordCheck({
      suite: 'Elements: locking', name: 'q4-eas end-moment cantilever 10×2, distorted mesh (±0.1), plane stress: tip deflection', computed: eas.computed, target: eas.target,
      unit: 'mm', tolerance: 0.1, source: 'closed form: pure bending v = ML²/(2EI)', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    expect(Math.abs(q4.computed / q4.target - 1)).toBeGreaterThan(3 * Math.abs(eas.computed / eas.target - 1));
  });

  it('q4-eas stays exact in nearly incompressible plane strain (ν = 0.4999), plain Q4 locks badly', () => {
    const eas = endMomentDeflection('q4-eas', 'planeStrain', 0.4999, 10, 2);
    const q4 = endMomentDeflection('q4', 'planeStrain', 0.4999, 10, 2);
    const check = recordCheck({
      suite: 'Elements: locking', name: 'q4-eas end-moment cantilever 10×2, plane strain ν = 0.4999: tip deflection', computed: eas.computed, target: eas.target,
      unit: 'mm', tolerance: 1e-6, source: 'closed form: pure bending v = ML²(1−ν²)/(2EI)', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    expect(q4.computed / q4.target).toBeLessThan(0.2);
  });
});

/**
 * Lamé thick cylinder in plane strain, modelled as an axisymmetric strip a ≤ r ≤ b with u_z = 0
 * everywhere, internal pressure p: u(r) = (1 + ν)/E [(1 − 2ν) A r + B/r],
 * A = p a²/(b² − a²), B = p a² b²/(b² − a²). a = 10, b = 20, p = 100, E = 200 GPa:
 * u(a) = 9.5333e-3 mm for ν = 0.3.
 */
function lameInnerDisplacement(name: ElementName, nu: number, nr: number): { computed: number; target: number } {
  const a = 10, b = 20, p = 100, E = 200_000, dz = 1;
  const mesh = rectangleMesh(nr, 1, a, b, 0, dz);
  const model = new TestModel({ kernel: elementKernels[name], section: { kind: 'continuum', analysis: 'axisymmetric', thickness: 1 }, material: elastic(nu), coords: mesh.coords, elements: mesh.elements });
  const fixed = new Map<number, number>();
  for (let n = 0; n < model.nodes; n++) fixed.set(2 * n + 1, 0);
  const loads = new Float64Array(model.ndof);
  // Uniform pressure on the inner face r = a: total ring force p·2πa·dz, half to each node.
  const inner = [0, nr + 1];
  for (const n of inner) loads[2 * n] = (p * 2 * Math.PI * a * dz) / 2;
  const r = model.solve({ fixed, loads, tolerance: 1e-8 });
  expect(r.converged).toBe(true);
  const A = (p * a * a) / (b * b - a * a), B = (p * a * a * b * b) / (b * b - a * a);
  return { computed: model.u[0], target: ((1 + nu) / E) * ((1 - 2 * nu) * A * a + B / a) };
}

describe('volumetric locking (Lamé cylinder, plane strain, 20 axisymmetric elements through the wall)', () => {
  it('target u(a) is the documented 9.5333e-3 mm at ν = 0.3', () => {
    expect(lameInnerDisplacement('q4', 0.3, 4).target).toBeCloseTo(9.5333e-3, 7);
  });

  it('q4-bbar matches the closed form at ν = 0.3 and ν = 0.4999; plain Q4 locks at ν = 0.4999', () => {
    for (const nu of [0.3, 0.4999]) {
      const bbar = lameInnerDisplacement('q4-bbar', nu, 20);
      const check = recordCheck({
        suite: 'Elements: locking', name: `q4-bbar Lamé cylinder (20 elements), plane strain ν = ${nu}: u(a)`, computed: bbar.computed, target: bbar.target,
        unit: 'mm', tolerance: 2e-3, source: 'closed form: Lamé thick cylinder, plane strain', tag: 'closed',
      });
      expect(check.pass).toBe(true);
    }
    // Plain Q4 on the same mesh: fine at ν = 0.3, about 40 % too stiff at ν = 0.4999.
    expect(Math.abs(lameInnerDisplacement('q4', 0.3, 20).computed / lameInnerDisplacement('q4', 0.3, 20).target - 1)).toBeLessThan(5e-3);
    const q4 = lameInnerDisplacement('q4', 0.4999, 20);
    expect(q4.computed / q4.target).toBeLessThan(0.7);
  });
});
