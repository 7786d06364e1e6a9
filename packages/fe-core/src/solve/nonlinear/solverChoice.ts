/**
 * Which sparse direct solver the driver uses for a problem.
 *
 * The profile LU of solve/fallback.ts is exact and robust but its work grows with the square of
 * the band; it is used until the sparse direct solver of solve/linear/ is wired in here.
 */
import type { Problem } from '../../assembly/problem';
import { ProfileLuSolver } from '../fallback';
import type { SparseDirectSolver } from '../linear/types';

export function defaultSolverFactory(_problem: Problem): () => SparseDirectSolver {
  return () => new ProfileLuSolver();
}
