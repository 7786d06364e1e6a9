import { describe, expect, it } from 'vitest';
import { ProfileLuSolver, reverseCuthillMcKee } from './fallback';
import { SingularMatrixError, type CsrMatrix } from './linear/types';

/** CSR of a dense row-major matrix, keeping structural zeros where the mirror entry is non-zero. */
function csr(n: number, dense: number[]): CsrMatrix {
  const rowPtr = new Int32Array(n + 1);
  const cols: number[] = [];
  const vals: number[] = [];
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      if (dense[i * n + j] !== 0 || dense[j * n + i] !== 0) {
        cols.push(j);
        vals.push(dense[i * n + j]);
      }
    }
    rowPtr[i + 1] = cols.length;
  }
  return { n, rowPtr, colIdx: Int32Array.from(cols), values: Float64Array.from(vals) };
}

/** 1D Laplacian with a non-symmetric convection term on a shuffled numbering. */
function shuffledBand(n: number, convection: number): { A: CsrMatrix; dense: number[] } {
  const perm = Array.from({ length: n }, (_, i) => (i * 7) % n);
  const dense = new Array(n * n).fill(0);
  for (let k = 0; k < n; k++) {
    const i = perm[k];
    dense[i * n + i] = 2.5;
    if (k > 0) dense[i * n + perm[k - 1]] = -1 - convection;
    if (k < n - 1) dense[i * n + perm[k + 1]] = -1 + convection;
  }
  return { A: csr(n, dense), dense };
}

describe('profile LU fallback solver', () => {
  it('solves symmetric and non-symmetric systems to round-off (residual check)', () => {
    for (const c of [0, 0.3]) {
      const n = 30;
      const { A, dense } = shuffledBand(n, c);
      const x = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
      const b = new Float64Array(n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) b[i] += dense[i * n + j] * x[j];
      const s = new ProfileLuSolver();
      s.analyse(A, { symmetric: c === 0 });
      s.factor(A);
      const y = s.solve(b);
      for (let i = 0; i < n; i++) expect(y[i]).toBeCloseTo(x[i], 12);
    }
  });

  it('RCM turns a shuffled chain back into a narrow band', () => {
    const n = 40;
    const { A } = shuffledBand(n, 0);
    const perm = reverseCuthillMcKee(A);
    const inv = new Int32Array(n);
    perm.forEach((old, k) => (inv[old] = k));
    let band = 0;
    for (let i = 0; i < n; i++) for (let p = A.rowPtr[i]; p < A.rowPtr[i + 1]; p++) band = Math.max(band, Math.abs(inv[i] - inv[A.colIdx[p]]));
    expect(band).toBe(1);
  });

  it('reports a zero-energy mode as a singular pivot naming the unknown', () => {
    // Two springs in series with no support: a rigid translation.
    const A = csr(3, [1, -1, 0, -1, 2, -1, 0, -1, 1]);
    const s = new ProfileLuSolver();
    s.analyse(A, { symmetric: true });
    expect(() => s.factor(A)).toThrow(SingularMatrixError);
    try {
      s.factor(A);
    } catch (err) {
      expect((err as SingularMatrixError).unknown).toBeGreaterThanOrEqual(0);
      expect((err as SingularMatrixError).unknown).toBeLessThan(3);
    }
  });
});
