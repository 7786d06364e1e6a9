/**
 * Which rigid-body motions the supports leave free. A plane model has three (translation in x,
 * in y, rotation in the plane); an axisymmetric one only the axial translation (a radial shift
 * strains the hoop direction). Each held direction is a linear condition on the motion
 * (tx, ty, θ): u_x = tx − θ y, u_y = ty + θ x, r_z = θ. The motions that satisfy all of them are
 * the null space of that small system; we describe it in words for the analyst.
 */
import type { Problem } from '../assembly/problem';

export interface RigidBodyReport {
  /** Empty when the supports stop every rigid-body motion. */
  free: string[];
}

/** Eigen-decomposition of a symmetric 3×3 matrix by cyclic Jacobi rotations. */
function jacobi3(a: number[][]): { values: number[]; vectors: number[][] } {
  const A = a.map((r) => r.slice());
  const V = [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  for (let sweep = 0; sweep < 50; sweep++) {
    let off = 0;
    for (let p = 0; p < 3; p++) for (let q = p + 1; q < 3; q++) off += A[p][q] ** 2;
    if (off < 1e-30) break;
    for (let p = 0; p < 3; p++) {
      for (let q = p + 1; q < 3; q++) {
        if (Math.abs(A[p][q]) < 1e-300) continue;
        const theta = (A[q][q] - A[p][p]) / (2 * A[p][q]);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < 3; k++) {
          const akp = A[k][p], akq = A[k][q];
          A[k][p] = c * akp - s * akq;
          A[k][q] = s * akp + c * akq;
        }
        for (let k = 0; k < 3; k++) {
          const apk = A[p][k], aqk = A[q][k];
          A[p][k] = c * apk - s * aqk;
          A[q][k] = s * apk + c * aqk;
        }
        for (let k = 0; k < 3; k++) {
          const vkp = V[k][p], vkq = V[k][q];
          V[k][p] = c * vkp - s * vkq;
          V[k][q] = s * vkp + c * vkq;
        }
      }
    }
  }
  return { values: [A[0][0], A[1][1], A[2][2]], vectors: [0, 1, 2].map((j) => [V[0][j], V[1][j], V[2][j]]) };
}

export function freeRigidBodyMotions(problem: Problem): RigidBodyReport {
  const axisymmetric = problem.elements.length > 0 && problem.elements.every((e) => e.section.kind === 'continuum' && e.section.analysis === 'axisymmetric');
  let held = [false, false, false];
  // Coordinates about the centroid, scaled by the model size, keep the system well conditioned.
  let cx = 0, cy = 0;
  for (let i = 0; i < problem.nodeCount; i++) {
    cx += problem.coords[2 * i] / problem.nodeCount;
    cy += problem.coords[2 * i + 1] / problem.nodeCount;
  }
  const L = problem.size;
  const G = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
  const add = (row: number[]) => {
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) G[i][j] += row[i] * row[j];
  };
  for (const d of problem.dirichlet) {
    let node = 0;
    while (node + 1 < problem.nodeCount && problem.dofStart[node + 1] <= d.dof) node++;
    const dir = d.dof - problem.dofStart[node];
    const x = (problem.coords[2 * node] - cx) / L;
    const y = (problem.coords[2 * node + 1] - cy) / L;
    if (dir === 0) add([1, 0, -y]);
    else if (dir === 1) add([0, 1, x]);
    else add([0, 0, 1]);
    held[dir] = true;
  }
  if (axisymmetric) return { free: held[1] ? [] : ['translation along the axis (z)'] };
  const { values, vectors } = jacobi3(G);
  const scale = Math.max(...values.map(Math.abs), 1e-300);
  const free: string[] = [];
  values.forEach((v, k) => {
    if (v > 1e-10 * scale && scale > 1e-300) return;
    const [tx, ty, th] = vectors[k];
    if (Math.abs(th) < 1e-8) {
      free.push(Math.abs(tx) > 0.99 ? 'translation in x' : Math.abs(ty) > 0.99 ? 'translation in y' : `translation along (${tx.toFixed(2)}, ${ty.toFixed(2)})`);
    } else {
      const px = cx - (ty / th) * L;
      const py = cy + (tx / th) * L;
      free.push(`rotation in the plane about (${px.toPrecision(4)}, ${py.toPrecision(4)})`);
    }
  });
  return { free };
}
