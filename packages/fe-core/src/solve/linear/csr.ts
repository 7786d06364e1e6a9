/**
 * Small CSR helpers shared by the direct and iterative solvers: products, norms, diagonals and a
 * pattern check. Our own code, kept free of Node-only APIs so it runs in a web worker.
 */
import type { CsrMatrix } from './types';

/** y = A x (y is overwritten). */
export function csrMultiply(A: CsrMatrix, x: Float64Array, y: Float64Array): Float64Array {
  const { n, rowPtr, colIdx, values } = A;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) s += values[p] * x[colIdx[p]];
    y[i] = s;
  }
  return y;
}

/** r = b − A x. */
export function csrResidual(A: CsrMatrix, x: Float64Array, b: Float64Array, r: Float64Array): Float64Array {
  const { n, rowPtr, colIdx, values } = A;
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) s -= values[p] * x[colIdx[p]];
    r[i] = s;
  }
  return r;
}

export function norm2(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i] * v[i];
  return Math.sqrt(s);
}

export function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

/** Value index of each diagonal entry (−1 where the pattern lacks it). */
export function diagonalIndex(A: CsrMatrix): Int32Array {
  const { n, rowPtr, colIdx } = A;
  const di = new Int32Array(n).fill(-1);
  for (let i = 0; i < n; i++) {
    // Columns are sorted: binary search.
    let lo = rowPtr[i];
    let hi = rowPtr[i + 1] - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const c = colIdx[mid];
      if (c === i) {
        di[i] = mid;
        break;
      }
      if (c < i) lo = mid + 1;
      else hi = mid - 1;
    }
  }
  return di;
}

/**
 * Threshold below which a pivot counts as vanished, per unknown: tol·|a_ii|, or tol·max|a_jj|
 * when a_ii is zero (saddle-point rows). Relative to the unknown's own diagonal so that units and
 * scaling of different unknowns (displacements, rotations, multipliers) do not interfere.
 */
export function pivotFloors(A: CsrMatrix, diag: Int32Array, tol: number, out: Float64Array): Float64Array {
  let maxDiag = 0;
  for (let i = 0; i < A.n; i++) {
    const a = diag[i] >= 0 ? Math.abs(A.values[diag[i]]) : 0;
    out[i] = a;
    if (a > maxDiag) maxDiag = a;
  }
  const fallback = maxDiag > 0 ? maxDiag : 1;
  for (let i = 0; i < A.n; i++) out[i] = tol * (out[i] > 0 ? out[i] : fallback);
  return out;
}

/** Throws unless rowPtr/colIdx describe an n×n pattern with sorted, in-range column indices. */
export function checkCsr(A: CsrMatrix): void {
  const { n, rowPtr, colIdx, values } = A;
  if (rowPtr.length !== n + 1 || rowPtr[0] !== 0) throw new Error('CSR rowPtr must have n+1 entries starting at 0');
  const nnz = rowPtr[n];
  if (colIdx.length < nnz || values.length < nnz) throw new Error('CSR colIdx/values shorter than rowPtr[n]');
  for (let i = 0; i < n; i++) {
    let prev = -1;
    for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) {
      const c = colIdx[p];
      if (c <= prev || c >= n) throw new Error(`CSR row ${i}: column indices must be sorted, unique and < n`);
      prev = c;
    }
  }
}
