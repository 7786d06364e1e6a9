import { recordCheck } from '@phaseloop/tests/support/verification';
import { describe, expect, it } from 'vitest';
import { csrResidual, norm2 } from './csr';
import { csrFromTriplets, laplace2d, q4Patch } from './fixtures';
import {
  bicgstab,
  conjugateGradient,
  incompleteCholesky,
  IncompleteLu,
  IterativeSolver,
  JacobiPreconditioner,
} from './iterative';
import { SupernodalLu } from './lu';

describe('preconditioned iterative solvers', () => {
  it('CG with Jacobi and with IC(0) converges on the Q4 patch test and reproduces u_x = σx/E', () => {
    const E = 70000, sigma = 10;
    const p = q4Patch(20, E, 0.33, sigma);
    const iterations: number[] = [];
    for (const M of [new JacobiPreconditioner(p.A), incompleteCholesky(p.A)]) {
      const x = new Float64Array(p.A.n);
      const res = conjugateGradient(p.A, p.b, x, M, 1e-12, 5000);
      expect(res.converged).toBe(true);
      iterations.push(res.iterations);
      const ux = x[p.dofOf[2 * (20 * 21 + 20)]];
      const check = recordCheck({
        suite: 'Linear solvers', name: `PCG (${iterations.length === 1 ? 'Jacobi' : 'IC(0)'}), Q4 patch 20×20: u_x at (1, 1)`,
        computed: ux, target: sigma / E, unit: 'mm', tolerance: 1e-8,
        source: 'closed form: uniform tension u_x = σx/E (patch test)', tag: 'closed',
      });
      expect(check.pass).toBe(true);
    }
    // IC(0) is the stronger preconditioner.
    expect(iterations[1]).toBeLessThan(iterations[0]);
  });

  it('BiCGStab with ILU(0) converges on a non-symmetric convection–diffusion grid and matches LU', () => {
    const g = laplace2d(32);
    const A = g.A;
    // Add central-difference convection (c·h/2 = 0.4) in x: a_{i,i±1} −= ±0.4 along x.
    const r: number[] = [], c: number[] = [], v: number[] = [];
    for (let i = 0; i < A.n; i++)
      for (let q = A.rowPtr[i]; q < A.rowPtr[i + 1]; q++) {
        const j = A.colIdx[q];
        let val = A.values[q];
        if (j === i + 1 && g.y[j] === g.y[i]) val += 0.4;
        if (j === i - 1 && g.y[j] === g.y[i]) val -= 0.4;
        r.push(i); c.push(j); v.push(val);
      }
    const B = csrFromTriplets(A.n, r, c, v);
    const b = Float64Array.from({ length: B.n }, (_, i) => 1 + Math.sin(i));
    const x = new Float64Array(B.n);
    const res = bicgstab(B, b, x, new IncompleteLu(B), 1e-11, 2000);
    expect(res.converged).toBe(true);
    expect(norm2(csrResidual(B, x, b, new Float64Array(B.n))) / norm2(b)).toBeLessThan(1e-10);
    const lu = new SupernodalLu();
    lu.analyse(B, { symmetric: false, coordinates: g.coordinates });
    lu.factor(B);
    const xd = lu.solve(b);
    let diff = 0, scale = 0;
    for (let i = 0; i < B.n; i++) {
      diff = Math.max(diff, Math.abs(x[i] - xd[i]));
      scale = Math.max(scale, Math.abs(xd[i]));
    }
    expect(diff / scale).toBeLessThan(1e-8);
  });

  it('IterativeSolver follows the analyse/factor/solve life cycle and reports non-convergence', () => {
    const p = q4Patch(10, 1000, 0.3, 1);
    const s = new IterativeSolver({ tolerance: 1e-12 });
    s.analyse(p.A, { symmetric: true });
    s.factor(p.A);
    const x = s.solve(p.b);
    expect(s.lastResult?.converged).toBe(true);
    let worst = 0;
    for (let i = 0; i < p.A.n; i++) worst = Math.max(worst, Math.abs(x[i] - p.exact[i]));
    expect(worst).toBeLessThan(1e-9);
    const capped = new IterativeSolver({ preconditioner: 'none', maxIterations: 3 });
    capped.analyse(p.A, { symmetric: true });
    capped.factor(p.A);
    expect(() => capped.solve(p.b)).toThrow(/stopped after 3 iterations/);
  });

  it('IC(0) falls back to a diagonal shift when a pivot is not positive', () => {
    // An indefinite-looking pattern for IC(0): strong off-diagonal couplings (not an M-matrix).
    const A = csrFromTriplets(3, [0, 0, 0, 1, 1, 1, 2, 2, 2], [0, 1, 2, 0, 1, 2, 0, 1, 2], [1, 0.9, 0.9, 0.9, 1, 0.9, 0.9, 0.9, 1]);
    const M = incompleteCholesky(A); // SPD (eigenvalues 0.1, 0.1, 2.8): IC(0) is exact here
    const z = new Float64Array(3);
    M.apply(Float64Array.from([1, 1, 1]), z);
    // A·(1,1,1) = 2.8·(1,1,1): z = (1,1,1)/2.8 when no shift was needed.
    expect(z[0]).toBeCloseTo(1 / 2.8, 10);
  });
});
