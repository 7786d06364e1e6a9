/**
 * Patch recovery of nodal values from integration-point values (in the spirit of
 * superconvergent patch recovery): for each node, a least-squares polynomial in x, y is fitted
 * through the material points of the elements around it — linear for linear elements, complete
 * quadratic for quadratic ones — and evaluated at the node. A patch with too few points for a
 * stable fit is widened by one ring of elements. At boundary nodes and for constant-strain
 * triangles this is far more accurate than averaging per-element extrapolations, because the
 * gradient comes from the whole patch.
 */
import type { Problem } from '../assembly/problem';
import { nodalAverage } from './frame';

const adjacency = new WeakMap<Problem, number[][]>();

function nodeElements(problem: Problem): number[][] {
  let adj = adjacency.get(problem);
  if (!adj) {
    adj = Array.from({ length: problem.nodeCount }, () => []);
    problem.elements.forEach((el, e) => {
      for (const n of el.nodes) adj![n].push(e);
    });
    adjacency.set(problem, adj);
  }
  return adj;
}

function isQuadratic(problem: Problem, e: number): boolean {
  const el = problem.elements[e];
  return el.nodes.length > 4;
}

/**
 * Nodal values of a per-point field (`width` components per point) by patch recovery.
 * `elements` restricts the patches (e.g. to one material region); nodes without a contributing
 * element get NaN. Beams (fibre points) take no part.
 */
export function patchRecovery(problem: Problem, field: Float64Array, width: number, elements?: readonly number[], only?: Uint8Array): Float64Array {
  const adj = nodeElements(problem);
  const allowed = new Uint8Array(problem.elements.length);
  for (const e of elements ?? problem.elements.map((_, i) => i)) if (problem.elements[e].kernel.dofsPerNode === 2) allowed[e] = 1;
  const out = new Float64Array(problem.nodeCount * width).fill(Number.NaN);
  const mark = new Int32Array(problem.elements.length).fill(-1);
  const A = new Float64Array(36);
  const B = new Float64Array(6 * width);
  const row = new Float64Array(6);
  for (let n = 0; n < problem.nodeCount; n++) {
    if (only && !only[n]) continue;
    let patch = adj[n].filter((e) => allowed[e]);
    if (patch.length === 0) continue;
    const basis = patch.some((e) => isQuadratic(problem, e)) ? 6 : 3;
    let points = patch.reduce((s, e) => s + problem.elements[e].points, 0);
    if (points < basis + 2) {
      for (const e of patch) mark[e] = n;
      const wider = [...patch];
      for (const e of patch) {
        for (const m of problem.elements[e].nodes) {
          for (const f of adj[m]) {
            if (allowed[f] && mark[f] !== n) {
              mark[f] = n;
              wider.push(f);
            }
          }
        }
      }
      patch = wider;
      points = patch.reduce((s, e) => s + problem.elements[e].points, 0);
    }
    if (points < basis) {
      // Not enough points for a fit (an isolated element): plain average of its points.
      averageInto(problem, field, width, patch, out, n);
      continue;
    }
    const x0 = problem.coords[2 * n];
    const y0 = problem.coords[2 * n + 1];
    let h = 0;
    for (const e of patch) for (let p = 0; p < problem.elements[e].points; p++) {
      const k = problem.elements[e].pointOffset + p;
      h = Math.max(h, Math.abs(problem.pointCoords[2 * k] - x0), Math.abs(problem.pointCoords[2 * k + 1] - y0));
    }
    h = h || 1;
    A.fill(0);
    B.fill(0);
    for (const e of patch) {
      const el = problem.elements[e];
      for (let p = 0; p < el.points; p++) {
        const k = el.pointOffset + p;
        const X = (problem.pointCoords[2 * k] - x0) / h;
        const Y = (problem.pointCoords[2 * k + 1] - y0) / h;
        row[0] = 1;
        row[1] = X;
        row[2] = Y;
        row[3] = X * X;
        row[4] = X * Y;
        row[5] = Y * Y;
        for (let i = 0; i < basis; i++) {
          for (let j = 0; j < basis; j++) A[i * basis + j] += row[i] * row[j];
          for (let c = 0; c < width; c++) B[i * width + c] += row[i] * field[k * width + c];
        }
      }
    }
    if (!choleskySolve(A, B, basis, width)) {
      averageInto(problem, field, width, patch, out, n);
      continue;
    }
    // The polynomial is centred on the node: its value there is the constant term.
    for (let c = 0; c < width; c++) out[n * width + c] = B[c];
  }
  return out;
}

function averageInto(problem: Problem, field: Float64Array, width: number, patch: readonly number[], out: Float64Array, n: number): void {
  let count = 0;
  for (let c = 0; c < width; c++) out[n * width + c] = 0;
  for (const e of patch) {
    const el = problem.elements[e];
    for (let p = 0; p < el.points; p++) {
      count++;
      for (let c = 0; c < width; c++) out[n * width + c] += field[(el.pointOffset + p) * width + c];
    }
  }
  for (let c = 0; c < width; c++) out[n * width + c] /= count;
}

/** Solves the small SPD normal equations in place; false when they are (nearly) singular. */
function choleskySolve(A: Float64Array, B: Float64Array, n: number, m: number): boolean {
  let maxDiag = 0;
  for (let i = 0; i < n; i++) maxDiag = Math.max(maxDiag, A[i * n + i]);
  for (let j = 0; j < n; j++) {
    let d = A[j * n + j];
    for (let k = 0; k < j; k++) d -= A[j * n + k] * A[j * n + k];
    if (!(d > 1e-12 * maxDiag)) return false;
    d = Math.sqrt(d);
    A[j * n + j] = d;
    for (let i = j + 1; i < n; i++) {
      let s = A[i * n + j];
      for (let k = 0; k < j; k++) s -= A[i * n + k] * A[j * n + k];
      A[i * n + j] = s / d;
    }
  }
  for (let c = 0; c < m; c++) {
    for (let i = 0; i < n; i++) {
      let s = B[i * m + c];
      for (let k = 0; k < i; k++) s -= A[i * n + k] * B[k * m + c];
      B[i * m + c] = s / A[i * n + i];
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = B[i * m + c];
      for (let k = i + 1; k < n; k++) s -= A[k * n + i] * B[k * m + c];
      B[i * m + c] = s / A[i * n + i];
    }
  }
  return true;
}

/**
 * The nodal values fe-core reports: at nodes surrounded only by triangles, patch recovery (a
 * constant-strain triangle has a single point, so per-element extrapolation cannot see the
 * gradient); elsewhere the average of the per-element extrapolations, which for quadrilaterals
 * is the usual Gauss-point extrapolation and is exact for the element's own field.
 */
export function recoverNodal(problem: Problem, field: Float64Array, width: number, elements?: readonly number[]): Float64Array {
  const out = nodalAverage(problem, field, width, elements);
  const adj = nodeElements(problem);
  const allowed = new Uint8Array(problem.elements.length);
  for (const e of elements ?? problem.elements.map((_, i) => i)) if (problem.elements[e].kernel.dofsPerNode === 2) allowed[e] = 1;
  const triangleOnly = new Uint8Array(problem.nodeCount);
  let any = false;
  for (let n = 0; n < problem.nodeCount; n++) {
    const patch = adj[n].filter((e) => allowed[e]);
    if (patch.length > 0 && patch.every((e) => problem.elements[e].kernel.edges.length === 3)) {
      triangleOnly[n] = 1;
      any = true;
    }
  }
  if (!any) return out;
  const fitted = patchRecovery(problem, field, width, elements, triangleOnly);
  for (let n = 0; n < problem.nodeCount; n++) {
    if (triangleOnly[n]) for (let c = 0; c < width; c++) out[n * width + c] = fitted[n * width + c];
  }
  return out;
}
