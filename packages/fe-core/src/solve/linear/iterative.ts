/**
 * Preconditioned Krylov solvers for models too large to factor: conjugate gradients for
 * symmetric positive definite matrices, BiCGStab for non-symmetric ones; Jacobi, incomplete
 * Cholesky IC(0) and incomplete LU ILU(0) preconditioners on A's own pattern.
 *
 * Our own code (anchors.md: the npm options are either direct solvers 70–300× slower than CHOLMOD
 * or plain unpreconditioned loops). On these meshes a simple preconditioner needs O(√N)
 * iterations, so the factory picks this path only when the direct factor would not fit in memory.
 */
import { checkCsr, csrMultiply, csrResidual, diagonalIndex, dot, norm2 } from './csr';
import type { CsrMatrix, DirectSolverOptions, FactorStats, SparseDirectSolver } from './types';

export type PreconditionerKind = 'jacobi' | 'ic0' | 'ilu0' | 'none';

export interface Preconditioner {
  /** z = M⁻¹ r. */
  apply(r: Float64Array, z: Float64Array): void;
  /** Entries stored by the preconditioner. */
  readonly size: number;
}

export interface IterativeResult {
  readonly iterations: number;
  /** True residual ‖b − A x‖ / ‖b‖ at exit. */
  readonly relativeResidual: number;
  readonly converged: boolean;
}

export class IterativeConvergenceError extends Error {
  constructor(
    message: string,
    readonly result: IterativeResult,
  ) {
    super(message);
    this.name = 'IterativeConvergenceError';
  }
}

export class JacobiPreconditioner implements Preconditioner {
  private readonly inv: Float64Array;
  readonly size: number;

  constructor(A: CsrMatrix) {
    const di = diagonalIndex(A);
    this.inv = new Float64Array(A.n);
    for (let i = 0; i < A.n; i++) {
      const d = di[i] >= 0 ? A.values[di[i]] : 0;
      this.inv[i] = d !== 0 ? 1 / d : 1;
    }
    this.size = A.n;
  }

  apply(r: Float64Array, z: Float64Array): void {
    const inv = this.inv;
    for (let i = 0; i < inv.length; i++) z[i] = r[i] * inv[i];
  }
}

/**
 * Incomplete LU with zero fill on A's pattern (row-wise IKJ elimination). On a symmetric matrix
 * U = D·Lᵀ, so the same factor serves as IC(0) for conjugate gradients. `shift` adds shift·|a_ii|
 * to the diagonal before factoring: the usual cure when IC(0) of an elasticity matrix (not an
 * M-matrix) meets a non-positive pivot.
 */
export class IncompleteLu implements Preconditioner {
  private readonly A: CsrMatrix;
  private readonly lu: Float64Array;
  private readonly diag: Int32Array;
  readonly size: number;

  constructor(A: CsrMatrix, shift = 0, requirePositive = false) {
    const { n, rowPtr, colIdx } = A;
    this.A = A;
    this.size = rowPtr[n];
    const diag = diagonalIndex(A);
    for (let i = 0; i < n; i++) if (diag[i] < 0) throw new Error(`ILU(0): row ${i} has no diagonal entry`);
    const lu = A.values.slice(0, rowPtr[n]);
    if (shift !== 0) for (let i = 0; i < n; i++) lu[diag[i]] += shift * Math.abs(lu[diag[i]]);
    const where = new Int32Array(n).fill(-1);
    for (let i = 0; i < n; i++) {
      for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) where[colIdx[p]] = p;
      for (let p = rowPtr[i]; p < diag[i]; p++) {
        const k = colIdx[p];
        const lik = lu[p] / lu[diag[k]];
        lu[p] = lik;
        for (let q = diag[k] + 1; q < rowPtr[k + 1]; q++) {
          const w = where[colIdx[q]];
          if (w >= 0) lu[w] -= lik * lu[q];
        }
      }
      for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) where[colIdx[p]] = -1;
      const d = lu[diag[i]];
      if (!Number.isFinite(d) || d === 0 || (requirePositive && d <= 0)) {
        throw new Error(`incomplete factorisation broke down at row ${i} (pivot ${d})`);
      }
    }
    this.lu = lu;
    this.diag = diag;
  }

  apply(r: Float64Array, z: Float64Array): void {
    const { n, rowPtr, colIdx } = this.A;
    const lu = this.lu;
    const diag = this.diag;
    for (let i = 0; i < n; i++) {
      let s = r[i];
      for (let p = rowPtr[i]; p < diag[i]; p++) s -= lu[p] * z[colIdx[p]];
      z[i] = s;
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = z[i];
      for (let p = diag[i] + 1; p < rowPtr[i + 1]; p++) s -= lu[p] * z[colIdx[p]];
      z[i] = s / lu[diag[i]];
    }
  }
}

/** IC(0) with increasing diagonal shifts until every pivot is positive. */
export function incompleteCholesky(A: CsrMatrix): IncompleteLu {
  let lastError: unknown = null;
  for (const shift of [0, 1e-3, 1e-2, 5e-2, 0.2, 1]) {
    try {
      return new IncompleteLu(A, shift, true);
    } catch (e) {
      lastError = e;
    }
  }
  throw lastError instanceof Error ? lastError : new Error('IC(0) failed');
}

/** Preconditioned conjugate gradients; x holds the initial guess and receives the solution. */
export function conjugateGradient(
  A: CsrMatrix,
  b: Float64Array,
  x: Float64Array,
  M: Preconditioner,
  tolerance: number,
  maxIterations: number,
): IterativeResult {
  const n = A.n;
  const r = csrResidual(A, x, b, new Float64Array(n));
  const z = new Float64Array(n);
  const p = new Float64Array(n);
  const q = new Float64Array(n);
  const bn = norm2(b) || 1;
  M.apply(r, z);
  p.set(z);
  let rz = dot(r, z);
  let it = 0;
  let rn = norm2(r);
  while (rn > tolerance * bn && it < maxIterations) {
    csrMultiply(A, p, q);
    const pq = dot(p, q);
    if (!(pq > 0)) break; // not positive definite along p: CG cannot continue
    const alpha = rz / pq;
    for (let i = 0; i < n; i++) {
      x[i] += alpha * p[i];
      r[i] -= alpha * q[i];
    }
    M.apply(r, z);
    const rzNew = dot(r, z);
    const beta = rzNew / rz;
    rz = rzNew;
    for (let i = 0; i < n; i++) p[i] = z[i] + beta * p[i];
    rn = norm2(r);
    it++;
  }
  const rel = norm2(csrResidual(A, x, b, r)) / bn;
  return { iterations: it, relativeResidual: rel, converged: rel <= tolerance * 10 && rn <= tolerance * bn };
}

/** Right-preconditioned BiCGStab for non-symmetric A. */
export function bicgstab(
  A: CsrMatrix,
  b: Float64Array,
  x: Float64Array,
  M: Preconditioner,
  tolerance: number,
  maxIterations: number,
): IterativeResult {
  const n = A.n;
  const r = csrResidual(A, x, b, new Float64Array(n));
  const rhat = r.slice();
  const p = new Float64Array(n);
  const v = new Float64Array(n);
  const phat = new Float64Array(n);
  const s = new Float64Array(n);
  const shat = new Float64Array(n);
  const t = new Float64Array(n);
  const bn = norm2(b) || 1;
  let rho = 1;
  let alpha = 1;
  let omega = 1;
  let it = 0;
  let rn = norm2(r);
  while (rn > tolerance * bn && it < maxIterations) {
    it++;
    let rhoNew = dot(rhat, r);
    if (rhoNew === 0) {
      // Breakdown of the shadow residual: restart from the current residual.
      rhat.set(r);
      p.fill(0);
      v.fill(0);
      rho = alpha = omega = 1;
      rhoNew = dot(rhat, r);
    }
    const beta = (rhoNew / rho) * (alpha / omega);
    for (let i = 0; i < n; i++) p[i] = r[i] + beta * (p[i] - omega * v[i]);
    M.apply(p, phat);
    csrMultiply(A, phat, v);
    alpha = rhoNew / dot(rhat, v);
    for (let i = 0; i < n; i++) s[i] = r[i] - alpha * v[i];
    if (norm2(s) <= tolerance * bn) {
      for (let i = 0; i < n; i++) x[i] += alpha * phat[i];
      rn = norm2(s);
      break;
    }
    M.apply(s, shat);
    csrMultiply(A, shat, t);
    const tt = dot(t, t);
    omega = tt > 0 ? dot(t, s) / tt : 0;
    for (let i = 0; i < n; i++) {
      x[i] += alpha * phat[i] + omega * shat[i];
      r[i] = s[i] - omega * t[i];
    }
    rho = rhoNew;
    rn = norm2(r);
    if (omega === 0) break;
  }
  const rel = norm2(csrResidual(A, x, b, r)) / bn;
  return { iterations: it, relativeResidual: rel, converged: rel <= tolerance * 10 };
}

export interface IterativeOptions {
  /** Default: ic0 for symmetric matrices, ilu0 otherwise (Jacobi if those break down). */
  readonly preconditioner?: PreconditionerKind;
  /** Relative residual ‖b − Ax‖/‖b‖ to reach (default 1e-10). */
  readonly tolerance?: number;
  /** Default max(1000, 20·√n). */
  readonly maxIterations?: number;
}

/** The SparseDirectSolver interface over CG / BiCGStab: factor() builds the preconditioner. */
export class IterativeSolver implements SparseDirectSolver {
  private symmetric = true;
  private A: CsrMatrix | null = null;
  private M: Preconditioner | null = null;
  /** Outcome of the last solve. */
  lastResult: IterativeResult | null = null;

  constructor(private readonly options: IterativeOptions = {}) {}

  analyse(A: CsrMatrix, options: DirectSolverOptions): void {
    checkCsr(A);
    this.symmetric = options.symmetric;
    this.A = null;
    this.M = null;
  }

  factor(A: CsrMatrix): void {
    const kind = this.options.preconditioner ?? (this.symmetric ? 'ic0' : 'ilu0');
    this.M = buildPreconditioner(A, kind, this.symmetric);
    this.A = A;
  }

  solve(b: Float64Array, x?: Float64Array): Float64Array {
    const A = this.A;
    const M = this.M;
    if (!A || !M) throw new Error('solve() called before factor()');
    const out = x ?? new Float64Array(A.n);
    out.fill(0);
    const tol = this.options.tolerance ?? 1e-10;
    const maxIt = this.options.maxIterations ?? Math.max(1000, Math.ceil(20 * Math.sqrt(A.n)));
    const res = this.symmetric ? conjugateGradient(A, b, out, M, tol, maxIt) : bicgstab(A, b, out, M, tol, maxIt);
    this.lastResult = res;
    if (!res.converged) {
      throw new IterativeConvergenceError(
        `${this.symmetric ? 'CG' : 'BiCGStab'} stopped after ${res.iterations} iterations at relative residual ${res.relativeResidual.toExponential(2)}`,
        res,
      );
    }
    return out;
  }

  stats(): FactorStats {
    return { nnzL: this.M?.size ?? 0, flops: 0, supernodes: 0 };
  }
}

function buildPreconditioner(A: CsrMatrix, kind: PreconditionerKind, symmetric: boolean): Preconditioner {
  if (kind === 'none') return { apply: (r, z) => z.set(r), size: 0 };
  if (kind === 'jacobi') return new JacobiPreconditioner(A);
  try {
    return symmetric || kind === 'ic0' ? incompleteCholesky(A) : new IncompleteLu(A);
  } catch {
    return new JacobiPreconditioner(A);
  }
}
