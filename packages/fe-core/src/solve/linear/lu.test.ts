import { recordCheck } from '@phaseloop/tests/support/verification';
import { describe, expect, it } from 'vitest';
import { csrResidual, norm2 } from './csr';
import { csrFromTriplets, q4Patch, randomSparse } from './fixtures';
import { SupernodalLu } from './lu';
import { SingularMatrixError, type CsrMatrix } from './types';

function relativeResidual(A: CsrMatrix, x: Float64Array, b: Float64Array): number {
  return norm2(csrResidual(A, x, b, new Float64Array(A.n))) / norm2(b);
}

describe('multifrontal LU (non-symmetric values, symmetric pattern)', () => {
  it('solves 1D convection–diffusion exactly: u_i = (1 − ρ^i)/(1 − ρ^(N)), ρ = (1 + ch/2)/(1 − ch/2)', () => {
    // −u″ + c u′ = 0 on (0, 1), u(0) = 0, u(1) = 1, central differences, N = 100 intervals, c = 20.
    const N = 100, c = 20, h = 1 / N, n = N - 1;
    const lo = -1 - (c * h) / 2, hi = -1 + (c * h) / 2;
    const r: number[] = [], cc: number[] = [], v: number[] = [];
    for (let i = 0; i < n; i++) {
      r.push(i); cc.push(i); v.push(2);
      if (i > 0) { r.push(i); cc.push(i - 1); v.push(lo); }
      if (i < n - 1) { r.push(i); cc.push(i + 1); v.push(hi); }
    }
    const A = csrFromTriplets(n, r, cc, v);
    const b = new Float64Array(n);
    b[n - 1] = -hi * 1; // boundary value u(1) = 1 moved to the right-hand side
    const lu = new SupernodalLu();
    lu.analyse(A, { symmetric: false });
    lu.factor(A);
    const x = lu.solve(b);
    const rho = (1 + (c * h) / 2) / (1 - (c * h) / 2);
    const i = 89; // node 90, x = 0.9
    const exact = (1 - rho ** 90) / (1 - rho ** N);
    const check = recordCheck({
      suite: 'Linear solvers', name: 'LU, 1D convection–diffusion Pe_h = 0.1, N = 100: u(0.9)', computed: x[i], target: exact,
      unit: '–', tolerance: 1e-12, source: 'closed form: discrete solution (1 − ρ^i)/(1 − ρ^N) of the central scheme', tag: 'closed',
    });
    expect(check.pass).toBe(true);
  });

  it('solves random non-symmetric, structurally symmetric matrices to ‖Ax − b‖/‖b‖ < 1e-10', () => {
    for (const [n, per, seed] of [[60, 4, 21], [300, 5, 22], [600, 4, 23]]) {
      const A = randomSparse(n, per, seed, false);
      const b = Float64Array.from({ length: n }, (_, i) => Math.cos(i));
      const lu = new SupernodalLu();
      lu.analyse(A, { symmetric: false });
      lu.factor(A);
      expect(relativeResidual(A, lu.solve(b), b)).toBeLessThan(1e-10);
    }
  });

  it('solves an FE-like non-symmetric tangent (Q4 mesh with skewed couplings) and re-factors it', () => {
    const p = q4Patch(20, 70000, 0.33, 10);
    const A = p.A;
    const skewed = (amp: number): CsrMatrix => {
      const values = A.values.slice();
      for (let i = 0; i < A.n; i++)
        for (let q = A.rowPtr[i]; q < A.rowPtr[i + 1]; q++) if (A.colIdx[q] > i) values[q] *= 1 + amp * Math.sin(3 * i + A.colIdx[q]);
      return { ...A, values };
    };
    const lu = new SupernodalLu();
    lu.analyse(A, { symmetric: false, coordinates: p.coordinates });
    for (const amp of [0.1, 0.3]) {
      const B = skewed(amp);
      lu.factor(B);
      expect(relativeResidual(B, lu.solve(p.b), p.b)).toBeLessThan(1e-10);
    }
    // With symmetric values LU reproduces the patch test exactly as well.
    lu.factor(A);
    const x = lu.solve(p.b);
    let worst = 0;
    for (let i = 0; i < A.n; i++) worst = Math.max(worst, Math.abs(x[i] - p.exact[i]));
    expect(worst).toBeLessThan(1e-12);
  });

  it('pivots inside a supernode when diagonal entries vanish (pairs coupled only across)', () => {
    // Unknown pairs (2i, 2i+1) with a zero diagonal block [[0, a], [b, 0]] and couplings to the next
    // pair: LDLᵀ without pivoting would stop at the first pivot; row exchange in the block works.
    const m = 40, n = 2 * m;
    const r: number[] = [], c: number[] = [], v: number[] = [];
    for (let i = 0; i < m; i++) {
      const a = 2 * i;
      r.push(a, a, a + 1, a + 1); c.push(a, a + 1, a, a + 1); v.push(0, 4 + (i % 3), 3 + (i % 2), 0);
      if (i + 1 < m)
        for (const [x, y] of [[0, 0], [0, 1], [1, 0], [1, 1]]) {
          r.push(a + x, a + 2 + y); c.push(a + 2 + y, a + x); v.push(0.3 * (x - y + 0.5), -0.2 * (x + y - 0.7));
        }
    }
    const A = csrFromTriplets(n, r, c, v);
    const b = Float64Array.from({ length: n }, (_, i) => 1 + (i % 5));
    const lu = new SupernodalLu();
    lu.analyse(A, { symmetric: false });
    lu.factor(A);
    expect(relativeResidual(A, lu.solve(b), b)).toBeLessThan(1e-12);
  });

  it('replaces a tiny pivot outside any usable block (static pivoting) and refines the solution', () => {
    // Natural order, no amalgamation: unknown 0 is a supernode of its own with a zero diagonal.
    const A = csrFromTriplets(3, [0, 0, 1, 1, 1, 2, 2], [0, 1, 0, 1, 2, 1, 2], [0, 1, 1, 1, 1, 1, 2]);
    const lu = new SupernodalLu({ ordering: Int32Array.from([0, 1, 2]), relax: { always: 0, rules: [] } });
    lu.analyse(A, { symmetric: false });
    lu.factor(A);
    expect(lu.stats().perturbedPivots).toBe(1);
    const b = Float64Array.from([0.3, 0.7, 1.9]);
    const x = lu.solve(b);
    // Exact solution of [[0,1,0],[1,1,1],[0,1,2]] x = b: x1 = b0, x2 = (b2 − x1)/2, x0 = b1 − x1 − x2.
    const x1 = 0.3, x2 = (1.9 - x1) / 2, x0 = 0.7 - x1 - x2;
    expect(x[0]).toBeCloseTo(x0, 12);
    expect(x[1]).toBeCloseTo(x1, 12);
    expect(x[2]).toBeCloseTo(x2, 12);
  });

  it('reports a singular matrix with the unknown whose column vanished', () => {
    const base = randomSparse(30, 4, 9, false);
    const r: number[] = [], c: number[] = [], v: number[] = [];
    for (let i = 0; i < base.n; i++)
      for (let q = base.rowPtr[i]; q < base.rowPtr[i + 1]; q++) {
        const j = base.colIdx[q];
        r.push(i); c.push(j); v.push(i === 11 || j === 11 ? 0 : base.values[q]);
      }
    const A = csrFromTriplets(base.n, r, c, v);
    const lu = new SupernodalLu();
    lu.analyse(A, { symmetric: false });
    let err: unknown = null;
    try {
      lu.factor(A);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SingularMatrixError);
    expect((err as SingularMatrixError).unknown).toBe(11);
  });
});

describe('LU solve in place', () => {
  it('accepts the right-hand side array as the output array', () => {
    const A = randomSparse(80, 4, 31, false);
    const b = Float64Array.from({ length: A.n }, (_, i) => 1 + (i % 7));
    const lu = new SupernodalLu();
    lu.analyse(A, { symmetric: false });
    lu.factor(A);
    const expected = lu.solve(b);
    const inPlace = b.slice();
    lu.solve(inPlace, inPlace);
    for (let i = 0; i < A.n; i++) expect(inPlace[i]).toBeCloseTo(expected[i], 12);
  });
});
