import { recordCheck } from '@phaseloop/tests/support/verification';
import { describe, expect, it } from 'vitest';
import { csrResidual, norm2 } from './csr';
import { csrFromTriplets, laplace2d, q4Patch, q4PlaneStressKe, randomSparse } from './fixtures';
import { SupernodalLdlt } from './supernodal';
import { SingularMatrixError, type CsrMatrix } from './types';

function relativeResidual(A: CsrMatrix, x: Float64Array, b: Float64Array): number {
  return norm2(csrResidual(A, x, b, new Float64Array(A.n))) / norm2(b);
}

/** −u'' = f on (0, 1), u(0) = u(1) = 0, central differences (h² scaled): tridiag(−1, 2, −1). */
function poisson1d(n: number, shift = 0): CsrMatrix {
  const r: number[] = [], c: number[] = [], v: number[] = [];
  for (let i = 0; i < n; i++) {
    r.push(i); c.push(i); v.push(2 - shift);
    if (i > 0) { r.push(i); c.push(i - 1); v.push(-1); }
    if (i < n - 1) { r.push(i); c.push(i + 1); v.push(-1); }
  }
  return csrFromTriplets(n, r, c, v);
}

describe('multifrontal LDLᵀ', () => {
  it('solves 1D Poisson exactly: u_i = x_i(1 − x_i)/2 (central differences are exact for quadratics)', () => {
    const n = 199;
    const h = 1 / (n + 1);
    const A = poisson1d(n);
    const b = new Float64Array(n).fill(h * h);
    const s = new SupernodalLdlt();
    s.analyse(A, { symmetric: true });
    s.factor(A);
    const x = s.solve(b);
    const i = 99; // x = 0.5
    const check = recordCheck({
      suite: 'Linear solvers', name: 'LDLᵀ, 1D Poisson −u″ = 1, 199 unknowns: u(0.5)', computed: x[i], target: 0.125,
      unit: '–', tolerance: 1e-12, source: 'closed form: discrete solution u_i = x_i(1 − x_i)/2', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    // In the natural order a tridiagonal matrix has no fill: nnz(L) = 2n − 1.
    const natural = new SupernodalLdlt({ ordering: Int32Array.from({ length: n }, (_, k) => k) });
    natural.analyse(A, { symmetric: true });
    expect(natural.stats().nnzL).toBe(2 * n - 1);
  });

  it('solves 2D Poisson (five-point, 47×47) to the exact quadratic u = x(1−x)/2 + y(1−y)/2', () => {
    const g = laplace2d(48);
    const h = 1 / 48;
    const u = (x: number, y: number): number => (x * (1 - x)) / 2 + (y * (1 - y)) / 2;
    // −Δu = 2; boundary values of u move to the right-hand side.
    const b = new Float64Array(g.A.n);
    for (let k = 0; k < g.A.n; k++) {
      const x = g.x[k], y = g.y[k];
      b[k] = 2 * h * h;
      if (x - h < h / 2) b[k] += u(0, y);
      if (x + h > 1 - h / 2) b[k] += u(1, y);
      if (y - h < h / 2) b[k] += u(x, 0);
      if (y + h > 1 - h / 2) b[k] += u(x, 1);
    }
    const s = new SupernodalLdlt();
    s.analyse(g.A, { symmetric: true, coordinates: g.coordinates });
    s.factor(g.A);
    const sol = s.solve(b);
    let worst = 0;
    for (let k = 0; k < g.A.n; k++) worst = Math.max(worst, Math.abs(sol[k] - u(g.x[k], g.y[k])));
    const check = recordCheck({
      suite: 'Linear solvers', name: 'LDLᵀ, 2D Poisson 47×47 five-point: max nodal error vs exact quadratic', computed: worst, target: 0,
      unit: '–', tolerance: 1e-12, absolute: true, source: 'closed form: five-point stencil exact for quadratics', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    expect(relativeResidual(g.A, sol, b)).toBeLessThan(1e-12);
  });

  it('reproduces the Q4 patch test u_x = σx/E, u_y = −νσy/E on a 24×24 plane-stress mesh', () => {
    const E = 70000, nu = 0.33, sigma = 100;
    const p = q4Patch(24, E, nu, sigma);
    const s = new SupernodalLdlt();
    s.analyse(p.A, { symmetric: true, coordinates: p.coordinates });
    s.factor(p.A);
    const x = s.solve(p.b);
    let worst = 0;
    for (let i = 0; i < p.A.n; i++) worst = Math.max(worst, Math.abs(x[i] - p.exact[i]));
    const tipUx = x[p.dofOf[2 * (24 * 25 + 24)]];
    const check = recordCheck({
      suite: 'Linear solvers', name: 'LDLᵀ, Q4 plane-stress patch 24×24, σ = 100: u_x at (1, 1)', computed: tipUx, target: sigma / E,
      unit: 'mm', tolerance: 1e-10, source: 'closed form: uniform tension u_x = σx/E (patch test)', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    expect(worst).toBeLessThan(1e-12);
    expect(s.stats().negativePivots).toBe(0);
  });

  it('solves random SPD matrices to ‖Ax − b‖/‖b‖ < 1e-10', () => {
    for (const [n, per, seed] of [[50, 4, 1], [300, 5, 2], [600, 4, 3]]) {
      const A = randomSparse(n, per, seed, true);
      const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
      const s = new SupernodalLdlt();
      s.analyse(A, { symmetric: true });
      s.factor(A);
      expect(relativeResidual(A, s.solve(b), b)).toBeLessThan(1e-10);
    }
  });

  it('re-factors new values on the same pattern without a new analysis', () => {
    const p = q4Patch(16, 1000, 0.3, 1);
    const s = new SupernodalLdlt();
    s.analyse(p.A, { symmetric: true, coordinates: p.coordinates });
    s.factor(p.A);
    const x1 = s.solve(p.b).slice();
    // Twice the modulus: half the displacement (linearity in E), same symbolic structure.
    const A2 = { ...p.A, values: p.A.values.map((v) => 2 * v) };
    s.factor(A2);
    const x2 = s.solve(p.b);
    for (let i = 0; i < p.A.n; i++) expect(x2[i]).toBeCloseTo(x1[i] / 2, 14);
    // Values that change more than a scale factor (an added spring stiffness on the diagonal).
    const A3 = { ...p.A, values: p.A.values.slice() };
    for (let i = 0; i < A3.n; i++)
      for (let q = A3.rowPtr[i]; q < A3.rowPtr[i + 1]; q++) if (A3.colIdx[q] === i) A3.values[q] *= 1 + 0.5 * Math.cos(i);
    s.factor(A3);
    expect(relativeResidual(A3, s.solve(p.b), p.b)).toBeLessThan(1e-10);
  });

  it('counts negative pivots = eigenvalues below the shift (Sylvester inertia)', () => {
    // tridiag(−1, 2, −1) of order n has eigenvalues 2 − 2cos(kπ/(n+1)), k = 1..n.
    const n = 60, shift = 0.5;
    let below = 0;
    for (let k = 1; k <= n; k++) if (2 - 2 * Math.cos((k * Math.PI) / (n + 1)) < shift) below++;
    const A = poisson1d(n, shift);
    const s = new SupernodalLdlt();
    s.analyse(A, { symmetric: true });
    s.factor(A);
    const check = recordCheck({
      suite: 'Linear solvers', name: 'LDLᵀ inertia of tridiag(−1, 2, −1) − 0.5·I, n = 60: negative pivots', computed: s.stats().negativePivots ?? -1,
      target: below, unit: 'count', tolerance: 0, absolute: true,
      source: 'closed form: eigenvalues 2 − 2cos(kπ/(n+1)); Sylvester law of inertia', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    const b = new Float64Array(n).fill(1);
    expect(relativeResidual(A, s.solve(b), b)).toBeLessThan(1e-10);
  });

  it('names the unknown whose pivot vanishes: a decoupled unknown with zero stiffness', () => {
    const base = laplace2d(8).A; // 49 unknowns
    const r: number[] = [], c: number[] = [], v: number[] = [];
    for (let i = 0; i < base.n; i++)
      for (let q = base.rowPtr[i]; q < base.rowPtr[i + 1]; q++) {
        const a = base.colIdx[q];
        // Unknown 17 keeps only a zero diagonal: nothing holds it.
        if (i === 17 || a === 17) continue;
        r.push(i); c.push(a); v.push(base.values[q]);
      }
    r.push(17); c.push(17); v.push(0);
    const A = csrFromTriplets(base.n, r, c, v);
    const s = new SupernodalLdlt();
    s.analyse(A, { symmetric: true });
    let err: unknown = null;
    try {
      s.factor(A);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SingularMatrixError);
    expect((err as SingularMatrixError).unknown).toBe(17);
  });

  it('names a y unknown when nothing restrains the y translation of a plane-stress square', () => {
    // Rollers at x = 0 only (u_x = 0): the rigid translation in y remains, so the last pivot of
    // the y unknowns vanishes and the error must point at a y unknown.
    const free = q4FreeY(8);
    const s = new SupernodalLdlt();
    s.analyse(free.A, { symmetric: true, coordinates: free.coordinates });
    let err: unknown = null;
    try {
      s.factor(free.A);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SingularMatrixError);
    expect(free.isY[(err as SingularMatrixError).unknown]).toBe(1);
  });

  it('refuses non-symmetric values instead of silently using one triangle', () => {
    const A = randomSparse(40, 4, 5, false);
    const s = new SupernodalLdlt();
    s.analyse(A, { symmetric: true });
    expect(() => s.factor(A)).toThrow(/not symmetric/);
  });
});

/** Q4 square with u_x = 0 on x = 0 only (rigid y translation left free); node-major unknowns. */
function q4FreeY(nx: number): { A: CsrMatrix; coordinates: Float64Array; isY: Uint8Array } {
  const h = 1 / nx;
  const Ke = q4PlaneStressKe(1000, 0.3, h);
  const nn = (nx + 1) * (nx + 1);
  const dof = new Int32Array(2 * nn).fill(-1);
  const coords: number[] = [];
  const isY: number[] = [];
  let k = 0;
  for (let j = 0; j <= nx; j++)
    for (let i = 0; i <= nx; i++) {
      const node = j * (nx + 1) + i;
      if (i > 0) { dof[2 * node] = k++; coords.push(i * h, j * h); isY.push(0); }
      dof[2 * node + 1] = k++; coords.push(i * h, j * h); isY.push(1);
    }
  const r: number[] = [], cc: number[] = [], v: number[] = [];
  for (let ej = 0; ej < nx; ej++)
    for (let ei = 0; ei < nx; ei++) {
      const nodes = [ej * (nx + 1) + ei, ej * (nx + 1) + ei + 1, (ej + 1) * (nx + 1) + ei + 1, (ej + 1) * (nx + 1) + ei];
      for (let a = 0; a < 8; a++) {
        const ga = dof[2 * nodes[a >> 1] + (a & 1)];
        if (ga < 0) continue;
        for (let q = 0; q < 8; q++) {
          const gq = dof[2 * nodes[q >> 1] + (q & 1)];
          if (gq < 0) continue;
          r.push(ga); cc.push(gq); v.push(Ke[a * 8 + q]);
        }
      }
    }
  return { A: csrFromTriplets(k, r, cc, v), coordinates: Float64Array.from(coords), isY: Uint8Array.from(isY) };
}
