/**
 * Linear solvers of fe-core: a factory choosing between the multifrontal direct solvers (LDLᵀ for
 * symmetric tangents, LU for non-symmetric ones) and preconditioned Krylov solvers.
 *
 * All of it is our own code: npm sparse packages measured 70–300× slower than CHOLMOD at 100k
 * unknowns (/work/shared/bench/anchors.md); ours stays within a small factor of it
 * (bench/results.md).
 */
import { checkCsr } from './csr';
import { IterativeSolver, type IterativeOptions, type IterativeResult } from './iterative';
import { SupernodalLu, type LuOptions } from './lu';
import { frontLayout } from './multifrontal';
import { SupernodalLdlt, type SupernodalOptions } from './supernodal';
import { analyseSymbolic } from './symbolic';
import type { CsrMatrix, DirectSolverOptions, FactorStats, SparseDirectSolver } from './types';

export * from './types';
export { SupernodalLdlt, type SupernodalOptions } from './supernodal';
export { SupernodalLu, type LuOptions } from './lu';
export {
  IterativeSolver,
  IterativeConvergenceError,
  conjugateGradient,
  bicgstab,
  JacobiPreconditioner,
  IncompleteLu,
  incompleteCholesky,
  type IterativeOptions,
  type IterativeResult,
  type Preconditioner,
  type PreconditionerKind,
} from './iterative';
export { nestedDissectionOrder, type OrderingOptions } from './ordering';
export { analyseSymbolic, type SupernodalSymbolic } from './symbolic';
export { csrMultiply, csrResidual, norm2 } from './csr';

export type LinearSolverMethod = 'auto' | 'direct' | 'iterative';

export interface LinearSolverOptions {
  /**
   * direct: multifrontal LDLᵀ / LU. iterative: CG / BiCGStab. auto (default): direct unless the
   * predicted factor memory exceeds memoryBudgetBytes.
   */
  readonly method?: LinearSolverMethod;
  /** Default 2 GiB (a browser worker may need less). */
  readonly memoryBudgetBytes?: number;
  readonly direct?: SupernodalOptions & LuOptions;
  readonly iterative?: IterativeOptions;
}

export interface LinearSolver extends SparseDirectSolver {
  /** The method in use; known after analyse(). */
  readonly method: 'direct' | 'iterative' | 'undecided';
  /** Bytes the direct factorisation would need (set by analyse() when it was considered). */
  readonly predictedFactorBytes: number;
  /** Iterations and residual of the last iterative solve (null for direct solves). */
  readonly lastIterativeResult: IterativeResult | null;
}

const DEFAULT_BUDGET = 2 * 1024 ** 3;

class ChosenLinearSolver implements LinearSolver {
  private impl: SparseDirectSolver | null = null;
  method: 'direct' | 'iterative' | 'undecided' = 'undecided';
  predictedFactorBytes = 0;

  constructor(private readonly options: LinearSolverOptions) {}

  get lastIterativeResult(): IterativeResult | null {
    return this.impl instanceof IterativeSolver ? this.impl.lastResult : null;
  }

  analyse(A: CsrMatrix, options: DirectSolverOptions): void {
    checkCsr(A);
    const want = this.options.method ?? 'auto';
    if (want === 'iterative') {
      this.useIterative(A, options);
      return;
    }
    const sym = analyseSymbolic(A, {
      coordinates: options.coordinates,
      coordinateDimension: options.coordinateDimension,
      leafSize: this.options.direct?.leafSize,
      relax: this.options.direct?.relax,
      ordering: this.options.direct?.ordering,
    });
    const layout = frontLayout(sym, options.symmetric, options.symmetric ? 1 : 2);
    this.predictedFactorBytes = 8 * (layout.factorSize + layout.stackSize + layout.frontSize);
    if (want === 'auto' && this.predictedFactorBytes > (this.options.memoryBudgetBytes ?? DEFAULT_BUDGET)) {
      this.useIterative(A, options);
      return;
    }
    if (options.symmetric) {
      const d = new SupernodalLdlt(this.options.direct);
      d.analyseFromSymbolic(A, sym);
      this.impl = d;
    } else {
      const d = new SupernodalLu(this.options.direct);
      d.analyseFromSymbolic(A, sym);
      this.impl = d;
    }
    this.method = 'direct';
  }

  factor(A: CsrMatrix): void {
    this.require().factor(A);
  }

  solve(b: Float64Array, x?: Float64Array): Float64Array {
    return this.require().solve(b, x);
  }

  stats(): FactorStats {
    return this.impl ? this.impl.stats() : { nnzL: 0, flops: 0, supernodes: 0 };
  }

  private useIterative(A: CsrMatrix, options: DirectSolverOptions): void {
    const it = new IterativeSolver(this.options.iterative);
    it.analyse(A, options);
    this.impl = it;
    this.method = 'iterative';
  }

  private require(): SparseDirectSolver {
    if (!this.impl) throw new Error('linear solver used before analyse()');
    return this.impl;
  }
}

/** A linear solver following the SparseDirectSolver life cycle (analyse once, factor/solve often). */
export function createLinearSolver(options: LinearSolverOptions = {}): LinearSolver {
  return new ChosenLinearSolver(options);
}
