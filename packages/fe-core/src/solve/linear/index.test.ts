import { describe, expect, it } from 'vitest';
import { q4Patch, randomSparse } from './fixtures';
import { createLinearSolver } from './index';
import { csrResidual, norm2 } from './csr';

describe('createLinearSolver', () => {
  it('chooses the direct solver within the memory budget and the iterative one beyond it', () => {
    const p = q4Patch(12, 1000, 0.3, 1);
    const direct = createLinearSolver();
    direct.analyse(p.A, { symmetric: true, coordinates: p.coordinates });
    expect(direct.method).toBe('direct');
    expect(direct.predictedFactorBytes).toBeGreaterThan(0);
    const tight = createLinearSolver({ memoryBudgetBytes: 1000, iterative: { tolerance: 1e-12 } });
    tight.analyse(p.A, { symmetric: true, coordinates: p.coordinates });
    expect(tight.method).toBe('iterative');
    for (const s of [direct, tight]) {
      s.factor(p.A);
      const x = s.solve(p.b);
      let worst = 0;
      for (let i = 0; i < p.A.n; i++) worst = Math.max(worst, Math.abs(x[i] - p.exact[i]));
      expect(worst).toBeLessThan(1e-9);
    }
    expect(tight.lastIterativeResult?.converged).toBe(true);
    expect(direct.lastIterativeResult).toBeNull();
  });

  it('uses LU for non-symmetric values when asked for symmetric: false', () => {
    const A = randomSparse(200, 5, 4, false);
    const s = createLinearSolver({ method: 'direct' });
    s.analyse(A, { symmetric: false });
    s.factor(A);
    const b = new Float64Array(A.n).fill(1);
    const x = s.solve(b);
    expect(norm2(csrResidual(A, x, b, new Float64Array(A.n))) / norm2(b)).toBeLessThan(1e-10);
    expect(s.stats().perturbedPivots).toBe(0);
  });
});

describe('createLinearSolver on degenerate sizes', () => {
  it('solves 1×1 and empty systems on both paths', () => {
    for (const symmetric of [true, false]) {
      const one = { n: 1, rowPtr: Int32Array.from([0, 1]), colIdx: Int32Array.from([0]), values: Float64Array.from([4]) };
      const s = createLinearSolver();
      s.analyse(one, { symmetric });
      s.factor(one);
      expect(s.solve(Float64Array.from([2]))[0]).toBe(0.5);
      const empty = { n: 0, rowPtr: Int32Array.from([0]), colIdx: new Int32Array(0), values: new Float64Array(0) };
      const z = createLinearSolver();
      z.analyse(empty, { symmetric });
      z.factor(empty);
      expect(z.solve(new Float64Array(0)).length).toBe(0);
    }
  });
});
