/**
 * Sparse matrix and linear-solver contracts shared by assembly and the nonlinear driver.
 */

/**
 * Compressed sparse row matrix with the FULL pattern (both triangles stored, even when the
 * values are symmetric), column indices sorted ascending within each row. Finite-element
 * tangents are structurally symmetric, so the pattern of A equals the pattern of Aᵀ.
 */
export interface CsrMatrix {
  readonly n: number;
  readonly rowPtr: Int32Array;
  readonly colIdx: Int32Array;
  readonly values: Float64Array;
}

export interface DirectSolverOptions {
  /** true: LDLᵀ/Cholesky path. false: LU for non-symmetric values on the symmetric pattern. */
  readonly symmetric: boolean;
  /** Optional node coordinates per unknown (x, y interleaved, length 2n) to guide the ordering. */
  readonly coordinates?: Float64Array;
  /** Dimension of `coordinates` (2: x, y interleaved; 3: x, y, z interleaved). Default 2. */
  readonly coordinateDimension?: 2 | 3;
}

export interface FactorStats {
  readonly nnzL: number;
  readonly flops: number;
  readonly supernodes: number;
  /** Entries stored for the factors (explicit zeros from supernode amalgamation included). */
  readonly storedEntries?: number;
  /** Negative pivots of the last LDLᵀ factorisation (matrix inertia): a stable structure has none. */
  readonly negativePivots?: number;
  /** Tiny pivots replaced by static pivoting in the last LU factorisation. */
  readonly perturbedPivots?: number;
}

/**
 * A sparse direct solver whose symbolic analysis (ordering, elimination tree, factor pattern) is
 * done once and reused for every numeric factorisation with the same pattern (Newton iterations).
 */
export interface SparseDirectSolver {
  analyse(A: CsrMatrix, options: DirectSolverOptions): void;
  /** Numeric factorisation; throws SingularMatrixError naming the pivot's unknown on failure. */
  factor(A: CsrMatrix): void;
  /** Solves A x = b with the current factors. Writes into x when given. */
  solve(b: Float64Array, x?: Float64Array): Float64Array;
  stats(): FactorStats;
}

export class SingularMatrixError extends Error {
  constructor(
    message: string,
    /** Index of the unknown (original numbering) where the pivot vanished. */
    readonly unknown: number,
  ) {
    super(message);
    this.name = 'SingularMatrixError';
  }
}
