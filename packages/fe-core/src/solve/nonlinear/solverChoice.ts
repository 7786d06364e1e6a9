/**
 * Which sparse direct solver the driver uses for a problem: the multifrontal solvers of
 * solve/linear/ (LDLᵀ for symmetric tangents, LU otherwise, iterative when the factor would not
 * fit the memory budget). The profile LU of solve/fallback.ts stays available for very small
 * models and as an independent cross-check in tests.
 */
import type { Problem } from '../../assembly/problem';
import { ProfileLuSolver } from '../fallback';
import { createLinearSolver } from '../linear';
import type { SparseDirectSolver } from '../linear/types';

export type SolverKind = 'auto' | 'multifrontal' | 'profile';

/** Below this many unknowns the profile LU is as fast and has no set-up cost. */
const TINY = 64;

export function defaultSolverFactory(problem: Pick<Problem, 'nDof'>, kind: SolverKind = 'auto'): () => SparseDirectSolver {
  if (kind === 'profile' || (kind === 'auto' && problem.nDof <= TINY)) return () => new ProfileLuSolver();
  return () => createLinearSolver();
}
