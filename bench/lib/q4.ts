/**
 * Benchmark matrix: plane-stress Q4 stiffness of a unit square (n×n elements, 2×2 Gauss), clamped
 * at x = 0, uniform downward edge traction at x = 1. Assembled here, independently of the engine's
 * element library, so the solver benchmark has no dependency on code still being written.
 * Unknowns are node-major (ux, uy of a node adjacent); clamped nodes are removed.
 */
import type { CsrMatrix } from '../../packages/fe-core/src/solve/linear/types';

export interface Q4Problem {
  readonly A: CsrMatrix;
  readonly b: Float64Array;
  /** x, y of each unknown's node, interleaved (length 2n). */
  readonly coordinates: Float64Array;
  /** Unknown index of uy at the loaded corner (x = 1, y = 0). */
  readonly tipUy: number;
}

/** 8×8 element stiffness of a square Q4 of side h, plane stress, thickness 1, 2×2 Gauss. */
export function q4Stiffness(E: number, nu: number, h: number): Float64Array {
  const c = E / (1 - nu * nu);
  const D = [c, c * nu, 0, c * nu, c, 0, 0, 0, (c * (1 - nu)) / 2];
  const xi = [-1, 1, 1, -1];
  const eta = [-1, -1, 1, 1];
  const g = 1 / Math.sqrt(3);
  const K = new Float64Array(64);
  const B = new Float64Array(24);
  for (const gx of [-g, g]) {
    for (const gy of [-g, g]) {
      // Square element: x = h(ξ+1)/2, so dN/dx = (2/h) dN/dξ and det J = h²/4.
      B.fill(0);
      for (let a = 0; a < 4; a++) {
        const dx = ((xi[a] * (1 + eta[a] * gy)) / 4) * (2 / h);
        const dy = ((eta[a] * (1 + xi[a] * gx)) / 4) * (2 / h);
        B[0 * 8 + 2 * a] = dx;
        B[1 * 8 + 2 * a + 1] = dy;
        B[2 * 8 + 2 * a] = dy;
        B[2 * 8 + 2 * a + 1] = dx;
      }
      const w = (h * h) / 4;
      for (let i = 0; i < 8; i++) {
        for (let j = 0; j < 8; j++) {
          let s = 0;
          for (let p = 0; p < 3; p++) for (let q = 0; q < 3; q++) s += B[p * 8 + i] * D[p * 3 + q] * B[q * 8 + j];
          K[i * 8 + j] += s * w;
        }
      }
    }
  }
  return K;
}

/** Assembles the clamped square with n×n elements: 2·n·(n+1) unknowns. */
export function q4Square(n: number, E = 70000, nu = 0.33): Q4Problem {
  const h = 1 / n;
  const Ke = q4Stiffness(E, nu, h);
  const nodesPerRow = n; // ix = 1..n (ix = 0 is clamped)
  const nodeId = (ix: number, iy: number): number => (ix === 0 ? -1 : iy * nodesPerRow + (ix - 1));
  const nn = (n + 1) * nodesPerRow;
  const ndof = 2 * nn;
  // Row pattern: neighbouring nodes (ix±1, iy±1) that are free, sorted by node id.
  const rowPtr = new Int32Array(ndof + 1);
  const cols: number[] = [];
  const neigh: number[] = [];
  for (let iy = 0; iy <= n; iy++) {
    for (let ix = 1; ix <= n; ix++) {
      neigh.length = 0;
      for (let dy = -1; dy <= 1; dy++) {
        for (let dx = -1; dx <= 1; dx++) {
          const jx = ix + dx;
          const jy = iy + dy;
          if (jx < 1 || jx > n || jy < 0 || jy > n) continue;
          neigh.push(nodeId(jx, jy));
        }
      }
      neigh.sort((a, b) => a - b);
      const id = nodeId(ix, iy);
      for (let d = 0; d < 2; d++) {
        for (const m of neigh) cols.push(2 * m, 2 * m + 1);
        rowPtr[2 * id + d + 1] = cols.length;
      }
    }
  }
  const colIdx = Int32Array.from(cols);
  const values = new Float64Array(colIdx.length);
  const find = (row: number, col: number): number => {
    for (let p = rowPtr[row]; p < rowPtr[row + 1]; p++) if (colIdx[p] === col) return p;
    throw new Error('pattern');
  };
  const en = [0, 0, 0, 0];
  for (let ey = 0; ey < n; ey++) {
    for (let ex = 0; ex < n; ex++) {
      en[0] = nodeId(ex, ey);
      en[1] = nodeId(ex + 1, ey);
      en[2] = nodeId(ex + 1, ey + 1);
      en[3] = nodeId(ex, ey + 1);
      for (let a = 0; a < 4; a++) {
        if (en[a] < 0) continue;
        for (let da = 0; da < 2; da++) {
          const row = 2 * en[a] + da;
          for (let c = 0; c < 4; c++) {
            if (en[c] < 0) continue;
            for (let dc = 0; dc < 2; dc++) values[find(row, 2 * en[c] + dc)] += Ke[(2 * a + da) * 8 + 2 * c + dc];
          }
        }
      }
    }
  }
  const b = new Float64Array(ndof);
  // Uniform traction t_y = −1 on x = 1: consistent nodal forces h/2 per element end.
  for (let iy = 0; iy < n; iy++) {
    b[2 * nodeId(n, iy) + 1] -= h / 2;
    b[2 * nodeId(n, iy + 1) + 1] -= h / 2;
  }
  const coordinates = new Float64Array(2 * ndof);
  for (let iy = 0; iy <= n; iy++) {
    for (let ix = 1; ix <= n; ix++) {
      const id = nodeId(ix, iy);
      for (let d = 0; d < 2; d++) {
        coordinates[2 * (2 * id + d)] = ix * h;
        coordinates[2 * (2 * id + d) + 1] = iy * h;
      }
    }
  }
  return { A: { n: ndof, rowPtr, colIdx, values }, b, coordinates, tipUy: 2 * nodeId(n, 0) + 1 };
}
