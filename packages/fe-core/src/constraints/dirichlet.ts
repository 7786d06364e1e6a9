/**
 * Dirichlet conditions by elimination. Every prescribed direction (supports held at zero and
 * prescribed displacements/rotations) loses its equation; the remaining (free) dofs are numbered
 * 0…n−1 in global order, so the tangent is assembled straight onto the free dofs and the driver
 * writes the prescribed values into the displacement vector before each evaluation. Reactions
 * are the internal forces at the prescribed dofs minus any load applied there.
 */
import type { Problem } from '../assembly/problem';

export interface DofNumbering {
  /** Equation number of every global dof, −1 when prescribed. */
  readonly equation: Int32Array;
  /** Global dof of every equation. */
  readonly freeDofs: Int32Array;
  readonly prescribed: Int32Array;
  /** Position of every global dof in `prescribed`, −1 when free. */
  readonly prescribedIndex: Int32Array;
}

export function numberDofs(problem: Problem): DofNumbering {
  const equation = new Int32Array(problem.nDof);
  for (const d of problem.dirichlet) equation[d.dof] = -1;
  let n = 0;
  for (let i = 0; i < problem.nDof; i++) if (equation[i] === 0) equation[i] = n++;
  const freeDofs = new Int32Array(n);
  for (let i = 0; i < problem.nDof; i++) if (equation[i] >= 0) freeDofs[equation[i]] = i;
  const prescribed = Int32Array.from(problem.dirichlet, (d) => d.dof);
  const prescribedIndex = new Int32Array(problem.nDof).fill(-1);
  prescribed.forEach((d, k) => (prescribedIndex[d] = k));
  return { equation, freeDofs, prescribed, prescribedIndex };
}

/** Reactions at the prescribed dofs: R = f_int − f_ext (written into `out`, zero elsewhere). */
export function recoverReactions(numbering: DofNumbering, fint: Float64Array, fext: Float64Array, out: Float64Array): void {
  out.fill(0);
  for (const d of numbering.prescribed) out[d] = fint[d] - fext[d];
}
