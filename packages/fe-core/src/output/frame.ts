/**
 * Frames (saved points of the solution) and the fields derived from them: nodal displacements
 * and reactions, integration-point stress/strain and material state, nodally averaged fields,
 * von Mises and principal values, point outputs and reaction sums.
 */
import type { Problem } from '../assembly/problem';
import { createMaterialReport } from '../material/types';

export interface Frame {
  index: number;
  segment: number;
  segmentName: string;
  /** Converged increment within the segment (0 for the initial frame). */
  increment: number;
  time: number;
  iterations: number;
  /** ux, uy, rz per node (rz = 0 where the node does not rotate). */
  displacement: Float64Array;
  /** Fx, Fy, Mz per node: support reactions (zero on free directions). */
  reaction: Float64Array;
  temperature: Float64Array;
  /** Per material point, Kelvin–Mandel (shear × √2), length 6·points. */
  pointStress: Float64Array;
  pointStrain: Float64Array;
  /** Per material point: martensite fraction, equivalent plastic strain, transformation strain (KM). */
  pointXi: Float64Array;
  pointEqPlastic: Float64Array;
  pointTransformationStrain: Float64Array;
  /** Scalar history values: point outputs "<name>.ux", reaction sums "<name>.Fx" and "time". */
  history: Record<string, number>;
}

const SQRT2 = Math.SQRT2;

/** von Mises stress of a Kelvin–Mandel stress vector at `o`. */
export function vonMises(s: ArrayLike<number>, o = 0): number {
  const a = s[o], b = s[o + 1], c = s[o + 2];
  const q = s[o + 3] * s[o + 3] + s[o + 4] * s[o + 4] + s[o + 5] * s[o + 5];
  // Kelvin–Mandel shears are √2·τ, so 3τ² = 1.5·(√2τ)².
  return Math.sqrt(Math.max(0, 0.5 * ((a - b) ** 2 + (b - c) ** 2 + (c - a) ** 2) + 1.5 * q));
}

/** Principal values (descending) of a symmetric tensor given in Kelvin–Mandel form. */
export function principalValues(s: ArrayLike<number>, o: number, out: Float64Array | number[], oo = 0): void {
  const xx = s[o], yy = s[o + 1], zz = s[o + 2];
  const yz = s[o + 3] / SQRT2, xz = s[o + 4] / SQRT2, xy = s[o + 5] / SQRT2;
  const p1 = xy * xy + xz * xz + yz * yz;
  let e1: number, e2: number, e3: number;
  const m = (xx + yy + zz) / 3;
  if (p1 <= 1e-30 * (xx * xx + yy * yy + zz * zz + 1e-300)) {
    [e1, e2, e3] = [xx, yy, zz].sort((x, y) => y - x);
  } else {
    // Closed-form eigenvalues of a symmetric 3×3 matrix (trigonometric solution of the cubic).
    const p2 = (xx - m) ** 2 + (yy - m) ** 2 + (zz - m) ** 2 + 2 * p1;
    const p = Math.sqrt(p2 / 6);
    const bxx = (xx - m) / p, byy = (yy - m) / p, bzz = (zz - m) / p;
    const bxy = xy / p, bxz = xz / p, byz = yz / p;
    const det = bxx * (byy * bzz - byz * byz) - bxy * (bxy * bzz - byz * bxz) + bxz * (bxy * byz - byy * bxz);
    const r = Math.min(1, Math.max(-1, det / 2));
    const phi = Math.acos(r) / 3;
    e1 = m + 2 * p * Math.cos(phi);
    e3 = m + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
    e2 = 3 * m - e1 - e3;
  }
  out[oo] = e1;
  out[oo + 1] = e2;
  out[oo + 2] = e3;
}

/**
 * Values of a per-point field (`width` components per point) extrapolated to one element's
 * nodes: a least-squares polynomial in x, y through the element's points (constant for 1 point,
 * linear for 3, bilinear for 4, complete quadratic for 6 or more), evaluated at the nodes.
 * This reproduces the usual Gauss-point extrapolation without needing the element's shape
 * functions, so it works for every kernel.
 */
export function extrapolateToNodes(problem: Problem, elementIndex: number, field: Float64Array, width: number, out: Float64Array): void {
  const el = problem.elements[elementIndex];
  const np = el.points;
  const nn = el.nodes.length;
  const basis = np >= 6 ? 6 : np >= 4 ? 4 : np >= 3 ? 3 : 1;
  // Local, scaled coordinates keep the normal equations well conditioned.
  let cx = 0, cy = 0;
  for (let a = 0; a < nn; a++) {
    cx += el.coords[2 * a] / nn;
    cy += el.coords[2 * a + 1] / nn;
  }
  let h = 0;
  for (let a = 0; a < nn; a++) h = Math.max(h, Math.abs(el.coords[2 * a] - cx), Math.abs(el.coords[2 * a + 1] - cy));
  h = h || 1;
  const phi = (x: number, y: number, row: Float64Array) => {
    const X = (x - cx) / h, Y = (y - cy) / h;
    row[0] = 1;
    if (basis >= 3) {
      row[1] = X;
      row[2] = Y;
    }
    if (basis === 4) row[3] = X * Y;
    if (basis === 6) {
      row[3] = X * X;
      row[4] = X * Y;
      row[5] = Y * Y;
    }
  };
  const A = new Float64Array(basis * basis);
  const rhs = new Float64Array(basis * width);
  const row = new Float64Array(basis);
  for (let p = 0; p < np; p++) {
    phi(problem.pointCoords[2 * (el.pointOffset + p)], problem.pointCoords[2 * (el.pointOffset + p) + 1], row);
    for (let i = 0; i < basis; i++) {
      for (let j = 0; j < basis; j++) A[i * basis + j] += row[i] * row[j];
      for (let c = 0; c < width; c++) rhs[i * width + c] += row[i] * field[(el.pointOffset + p) * width + c];
    }
  }
  solveDenseInPlace(A, rhs, basis, width);
  for (let a = 0; a < nn; a++) {
    phi(el.coords[2 * a], el.coords[2 * a + 1], row);
    for (let c = 0; c < width; c++) {
      let v = 0;
      for (let i = 0; i < basis; i++) v += row[i] * rhs[i * width + c];
      out[a * width + c] = v;
    }
  }
}

/** Gaussian elimination with partial pivoting on a small dense system (several right-hand sides). */
function solveDenseInPlace(A: Float64Array, B: Float64Array, n: number, m: number): void {
  for (let k = 0; k < n; k++) {
    let piv = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(A[i * n + k]) > Math.abs(A[piv * n + k])) piv = i;
    if (piv !== k) {
      for (let j = 0; j < n; j++) [A[k * n + j], A[piv * n + j]] = [A[piv * n + j], A[k * n + j]];
      for (let j = 0; j < m; j++) [B[k * m + j], B[piv * m + j]] = [B[piv * m + j], B[k * m + j]];
    }
    const d = A[k * n + k];
    if (Math.abs(d) < 1e-300) continue;
    for (let i = k + 1; i < n; i++) {
      const f = A[i * n + k] / d;
      if (f === 0) continue;
      for (let j = k; j < n; j++) A[i * n + j] -= f * A[k * n + j];
      for (let j = 0; j < m; j++) B[i * m + j] -= f * B[k * m + j];
    }
  }
  for (let k = n - 1; k >= 0; k--) {
    const d = A[k * n + k];
    for (let j = 0; j < m; j++) {
      let v = B[k * m + j];
      for (let i = k + 1; i < n; i++) v -= A[k * n + i] * B[i * m + j];
      B[k * m + j] = Math.abs(d) < 1e-300 ? 0 : v / d;
    }
  }
}

/** Whether an element takes part in nodal averaging (2D continuum and bars; not beam fibres). */
function averages(problem: Problem, e: number): boolean {
  return problem.elements[e].kernel.dofsPerNode === 2;
}

/**
 * Nodally averaged field: every element's extrapolated nodal values, averaged over the elements
 * that share the node. `elements` restricts the average (e.g. to one material's region).
 * Nodes no contributing element touches get NaN.
 */
export function nodalAverage(problem: Problem, field: Float64Array, width: number, elements?: readonly number[]): Float64Array {
  const out = new Float64Array(problem.nodeCount * width);
  const count = new Uint32Array(problem.nodeCount);
  const list = elements ?? problem.elements.map((_, i) => i);
  let buf = new Float64Array(0);
  for (const e of list) {
    if (!averages(problem, e)) continue;
    const el = problem.elements[e];
    if (buf.length < el.nodes.length * width) buf = new Float64Array(el.nodes.length * width);
    extrapolateToNodes(problem, e, field, width, buf);
    for (let a = 0; a < el.nodes.length; a++) {
      const n = el.nodes[a];
      count[n]++;
      for (let c = 0; c < width; c++) out[n * width + c] += buf[a * width + c];
    }
  }
  for (let n = 0; n < problem.nodeCount; n++) {
    for (let c = 0; c < width; c++) out[n * width + c] = count[n] > 0 ? out[n * width + c] / count[n] : Number.NaN;
  }
  return out;
}

/** Per-point scalar from a Kelvin–Mandel field. */
export function pointScalar(field: Float64Array, fn: (s: Float64Array, o: number) => number): Float64Array {
  const n = field.length / 6;
  const out = new Float64Array(n);
  for (let p = 0; p < n; p++) out[p] = fn(field, 6 * p);
  return out;
}

export function principalField(field: Float64Array): Float64Array {
  const n = field.length / 6;
  const out = new Float64Array(3 * n);
  for (let p = 0; p < n; p++) principalValues(field, 6 * p, out, 3 * p);
  return out;
}

/** Material-state scalars per point via Material.report. */
export function reportPoints(problem: Problem, state: Float64Array): { xi: Float64Array; eqPlastic: Float64Array; transformationStrain: Float64Array } {
  const xi = new Float64Array(problem.pointCount);
  const eqPlastic = new Float64Array(problem.pointCount);
  const transformationStrain = new Float64Array(6 * problem.pointCount);
  const report = createMaterialReport();
  for (const el of problem.elements) {
    for (let p = 0; p < el.points; p++) {
      el.material.report(state, el.stateOffset + p * el.material.stateSize, report);
      xi[el.pointOffset + p] = report.xi;
      eqPlastic[el.pointOffset + p] = report.eqPlastic;
      transformationStrain.set(report.transformationStrain, 6 * (el.pointOffset + p));
    }
  }
  return { xi, eqPlastic, transformationStrain };
}

/** Index of the node nearest to (x, y). */
export function nearestNode(problem: Problem, x: number, y: number): number {
  let best = 0;
  let bestD = Infinity;
  for (let i = 0; i < problem.nodeCount; i++) {
    const d = (problem.coords[2 * i] - x) ** 2 + (problem.coords[2 * i + 1] - y) ** 2;
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  }
  return best;
}

