/**
 * Matrices for the linear-solver tests: seeded random sparse matrices, finite-difference and Q4
 * plane-stress grids with closed-form discrete solutions, and a brute-force symbolic factorisation
 * to check the fast analysis against. Test support only; nothing in the engine imports it.
 */
import type { CsrMatrix } from './types';

/** Deterministic uniform numbers in [0, 1) (mulberry32), so failures reproduce. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Builds a CSR matrix from (row, col, value) triplets, summing duplicates. */
export function csrFromTriplets(n: number, rows: number[], cols: number[], vals: number[]): CsrMatrix {
  const perRow: Map<number, number>[] = Array.from({ length: n }, () => new Map());
  for (let t = 0; t < rows.length; t++) {
    const m = perRow[rows[t]];
    m.set(cols[t], (m.get(cols[t]) ?? 0) + vals[t]);
  }
  const rowPtr = new Int32Array(n + 1);
  const colIdx: number[] = [];
  const values: number[] = [];
  for (let i = 0; i < n; i++) {
    const entries = [...perRow[i].entries()].sort((a, b) => a[0] - b[0]);
    for (const [c, v] of entries) {
      colIdx.push(c);
      values.push(v);
    }
    rowPtr[i + 1] = colIdx.length;
  }
  return { n, rowPtr, colIdx: Int32Array.from(colIdx), values: Float64Array.from(values) };
}

/** Dense copy (row-major) of a small CSR matrix. */
export function toDense(A: CsrMatrix): Float64Array {
  const D = new Float64Array(A.n * A.n);
  for (let i = 0; i < A.n; i++) for (let p = A.rowPtr[i]; p < A.rowPtr[i + 1]; p++) D[i * A.n + A.colIdx[p]] = A.values[p];
  return D;
}

/**
 * Random structurally symmetric matrix: about `perRow` off-diagonal entries per row. symmetric:
 * a_ij = a_ji; otherwise independent values. The diagonal dominates (SPD when symmetric).
 */
export function randomSparse(n: number, perRow: number, seed: number, symmetric: boolean): CsrMatrix {
  const rnd = seededRandom(seed);
  const rows: number[] = [];
  const cols: number[] = [];
  const vals: number[] = [];
  const rowSum = new Float64Array(n);
  const seen = new Set<number>();
  for (let i = 0; i < n; i++) {
    for (let e = 0; e < perRow / 2; e++) {
      const j = Math.floor(rnd() * n);
      if (j === i || seen.has(Math.min(i, j) * n + Math.max(i, j))) continue;
      seen.add(Math.min(i, j) * n + Math.max(i, j));
      const a = rnd() * 2 - 1;
      const b = symmetric ? a : rnd() * 2 - 1;
      rows.push(i, j);
      cols.push(j, i);
      vals.push(a, b);
      rowSum[i] += Math.abs(a);
      rowSum[j] += Math.abs(b);
    }
  }
  for (let i = 0; i < n; i++) {
    rows.push(i);
    cols.push(i);
    vals.push(rowSum[i] + 1 + rnd());
  }
  return csrFromTriplets(n, rows, cols, vals);
}

/**
 * Five-point finite-difference matrix of −Δu on the unit square with (nx+1)×(ny+1) grid points,
 * Dirichlet boundary eliminated, scaled by h². Coordinates per unknown (x, y interleaved).
 */
export function laplace2d(nx: number): { A: CsrMatrix; coordinates: Float64Array; x: Float64Array; y: Float64Array } {
  const m = nx - 1; // interior points per direction
  const n = m * m;
  const h = 1 / nx;
  const rows: number[] = [];
  const cols: number[] = [];
  const vals: number[] = [];
  const id = (i: number, j: number): number => j * m + i;
  const coordinates = new Float64Array(2 * n);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let j = 0; j < m; j++) {
    for (let i = 0; i < m; i++) {
      const k = id(i, j);
      x[k] = (i + 1) * h;
      y[k] = (j + 1) * h;
      coordinates[2 * k] = x[k];
      coordinates[2 * k + 1] = y[k];
      rows.push(k);
      cols.push(k);
      vals.push(4);
      for (const [di, dj] of [[-1, 0], [1, 0], [0, -1], [0, 1]]) {
        const a = i + di;
        const b = j + dj;
        if (a < 0 || a >= m || b < 0 || b >= m) continue;
        rows.push(k);
        cols.push(id(a, b));
        vals.push(-1);
      }
    }
  }
  return { A: csrFromTriplets(n, rows, cols, vals), coordinates, x, y };
}

/** 8×8 stiffness of a square Q4 of side h, plane stress, thickness 1, 2×2 Gauss (node-major u, v). */
export function q4PlaneStressKe(E: number, nu: number, h: number): Float64Array {
  const c = E / (1 - nu * nu);
  const Dm = [c, c * nu, 0, c * nu, c, 0, 0, 0, (c * (1 - nu)) / 2];
  const Ke = new Float64Array(64);
  const g = 1 / Math.sqrt(3);
  const xi = [-1, 1, 1, -1];
  const eta = [-1, -1, 1, 1];
  for (const gx of [-g, g]) {
    for (const gy of [-g, g]) {
      const B = new Float64Array(24);
      for (let a = 0; a < 4; a++) {
        const dx = ((xi[a] * (1 + eta[a] * gy)) / 4) * (2 / h);
        const dy = ((eta[a] * (1 + xi[a] * gx)) / 4) * (2 / h);
        B[2 * a] = dx;
        B[8 + 2 * a + 1] = dy;
        B[16 + 2 * a] = dy;
        B[16 + 2 * a + 1] = dx;
      }
      for (let i = 0; i < 8; i++)
        for (let j = 0; j < 8; j++) {
          let s = 0;
          for (let p = 0; p < 3; p++) for (let q = 0; q < 3; q++) s += B[p * 8 + i] * Dm[p * 3 + q] * B[q * 8 + j];
          Ke[i * 8 + j] += (s * h * h) / 4;
        }
    }
  }
  return Ke;
}

/**
 * Q4 plane-stress square (nx × nx elements of the unit square, 2×2 Gauss, thickness 1) with
 * rollers on x = 0 (u_x = 0) and y = 0 (u_y = 0) and a uniform traction σ on x = 1. The exact
 * solution u_x = σx/E, u_y = −νσy/E is linear, so Q4 reproduces it at the nodes (patch test).
 * Unknowns are node-major; nodes on the rollers keep one unknown, the others two.
 */
export function q4Patch(
  nx: number,
  E: number,
  nu: number,
  sigma: number,
): { A: CsrMatrix; b: Float64Array; coordinates: Float64Array; exact: Float64Array; dofOf: Int32Array } {
  const h = 1 / nx;
  const Ke = q4PlaneStressKe(E, nu, h);
  // Global dof numbering: node (i, j) → dofs, skipping constrained components.
  const nn = (nx + 1) * (nx + 1);
  const dofOf = new Int32Array(2 * nn).fill(-1);
  let ndof = 0;
  const coordList: number[] = [];
  const exactList: number[] = [];
  for (let j = 0; j <= nx; j++) {
    for (let i = 0; i <= nx; i++) {
      const node = j * (nx + 1) + i;
      if (i > 0) {
        dofOf[2 * node] = ndof++;
        coordList.push(i * h, j * h);
        exactList.push((sigma * i * h) / E);
      }
      if (j > 0) {
        dofOf[2 * node + 1] = ndof++;
        coordList.push(i * h, j * h);
        exactList.push((-nu * sigma * j * h) / E);
      }
    }
  }
  const rows: number[] = [];
  const cols: number[] = [];
  const vals: number[] = [];
  const b = new Float64Array(ndof);
  for (let ej = 0; ej < nx; ej++) {
    for (let ei = 0; ei < nx; ei++) {
      const nodes = [ej * (nx + 1) + ei, ej * (nx + 1) + ei + 1, (ej + 1) * (nx + 1) + ei + 1, (ej + 1) * (nx + 1) + ei];
      for (let a = 0; a < 8; a++) {
        const ga = dofOf[2 * nodes[a >> 1] + (a & 1)];
        if (ga < 0) continue;
        for (let q = 0; q < 8; q++) {
          const gq = dofOf[2 * nodes[q >> 1] + (q & 1)];
          if (gq < 0) continue;
          rows.push(ga);
          cols.push(gq);
          vals.push(Ke[a * 8 + q]);
        }
      }
    }
    // Traction σ on the element edge at x = 1 of this row: σ·h/2 to each end node.
    const n0 = ej * (nx + 1) + nx;
    const n1 = (ej + 1) * (nx + 1) + nx;
    b[dofOf[2 * n0]] += (sigma * h) / 2;
    b[dofOf[2 * n1]] += (sigma * h) / 2;
  }
  return {
    A: csrFromTriplets(ndof, rows, cols, vals),
    b,
    coordinates: Float64Array.from(coordList),
    exact: Float64Array.from(exactList),
    dofOf,
  };
}

/** Pattern of L (row-major boolean, lower incl. diagonal) of P A Pᵀ by dense symbolic elimination. */
export function bruteForceFactorPattern(A: CsrMatrix, perm: Int32Array): Uint8Array {
  const n = A.n;
  const iperm = new Int32Array(n);
  for (let k = 0; k < n; k++) iperm[perm[k]] = k;
  const S = new Uint8Array(n * n);
  for (let i = 0; i < n; i++)
    for (let p = A.rowPtr[i]; p < A.rowPtr[i + 1]; p++) {
      const a = iperm[i];
      const c = iperm[A.colIdx[p]];
      S[a * n + c] = 1;
      S[c * n + a] = 1;
    }
  for (let k = 0; k < n; k++) {
    S[k * n + k] = 1;
    const below: number[] = [];
    for (let i = k + 1; i < n; i++) if (S[i * n + k]) below.push(i);
    for (const i of below) for (const j of below) S[i * n + j] = 1;
  }
  const L = new Uint8Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) L[i * n + j] = S[i * n + j];
  return L;
}
