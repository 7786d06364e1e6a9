/**
 * A small profile (skyline) LU solver with a reverse Cuthill–McKee ordering.
 *
 * Why it exists: it is the stand-in used by the tests and by tiny models when the sparse direct
 * solver of solve/linear/ is not wanted (or not there). Work is about n·b² for a band b, which is
 * fine for a few thousand unknowns and hopeless for large models. It factorises without pivoting
 * (finite-element tangents with Dirichlet rows eliminated are strongly diagonal), stores both
 * triangles so non-symmetric tangents (SMA) factor correctly, and reports a vanishing pivot as a
 * SingularMatrixError naming the unknown in the caller's numbering.
 */
import { SingularMatrixError, type CsrMatrix, type DirectSolverOptions, type FactorStats, type SparseDirectSolver } from './linear/types';

/** Pivot smaller than this fraction of the original diagonal means a zero-energy mode. */
const PIVOT_TOLERANCE = 1e-11;

export class ProfileLuSolver implements SparseDirectSolver {
  private n = 0;
  /** perm[new] = old, inv[old] = new. */
  private perm: Int32Array = new Int32Array(0);
  private inv = new Int32Array(0);
  /** First column (new numbering) of the profile of row/column i. */
  private first = new Int32Array(0);
  /** Start of row i of L (strict lower) and of column i of U (strict upper) in `lower`/`upper`. */
  private start = new Int32Array(0);
  private lower = new Float64Array(0);
  private upper = new Float64Array(0);
  private diag = new Float64Array(0);
  private work = new Float64Array(0);
  private flops = 0;

  analyse(A: CsrMatrix, _options: DirectSolverOptions): void {
    const n = A.n;
    this.n = n;
    this.perm = reverseCuthillMcKee(A);
    this.inv = new Int32Array(n);
    for (let i = 0; i < n; i++) this.inv[this.perm[i]] = i;
    this.first = new Int32Array(n);
    this.start = new Int32Array(n + 1);
    for (let i = 0; i < n; i++) {
      const old = this.perm[i];
      let f = i;
      for (let p = A.rowPtr[old]; p < A.rowPtr[old + 1]; p++) f = Math.min(f, this.inv[A.colIdx[p]]);
      this.first[i] = f;
      this.start[i + 1] = this.start[i] + (i - f);
    }
    const size = this.start[n];
    this.lower = new Float64Array(size);
    this.upper = new Float64Array(size);
    this.diag = new Float64Array(n);
    this.work = new Float64Array(n);
  }

  factor(A: CsrMatrix): void {
    const { n, perm, inv, first, start, lower, upper, diag } = this;
    if (A.n !== n) throw new Error('factor: matrix size differs from the analysed one');
    lower.fill(0);
    upper.fill(0);
    diag.fill(0);
    // Scatter A into the profile in the new numbering.
    for (let oi = 0; oi < n; oi++) {
      const i = inv[oi];
      for (let p = A.rowPtr[oi]; p < A.rowPtr[oi + 1]; p++) {
        const j = inv[A.colIdx[p]];
        const v = A.values[p];
        if (j === i) diag[i] = v;
        else if (j < i) lower[start[i] + j - first[i]] = v;
        else upper[start[j] + i - first[j]] = v;
      }
    }
    let flops = 0;
    for (let i = 0; i < n; i++) {
      const fi = first[i];
      const si = start[i] - fi;
      // Row i of L and column i of U, left to right (Doolittle in profile form).
      for (let j = fi; j < i; j++) {
        const fj = first[j];
        const sj = start[j] - fj;
        const k0 = fi > fj ? fi : fj;
        let sl = lower[si + j];
        let su = upper[si + j];
        for (let k = k0; k < j; k++) {
          sl -= lower[si + k] * upper[sj + k];
          su -= lower[sj + k] * upper[si + k];
        }
        flops += 4 * (j - k0);
        lower[si + j] = sl / diag[j];
        upper[si + j] = su;
      }
      let d = diag[i];
      for (let k = fi; k < i; k++) d -= lower[si + k] * upper[si + k];
      flops += 2 * (i - fi);
      const scale = Math.abs(diag[i]) > 0 ? Math.abs(diag[i]) : 1;
      if (!(Math.abs(d) > PIVOT_TOLERANCE * scale)) {
        throw new SingularMatrixError(`zero pivot at unknown ${perm[i]}`, perm[i]);
      }
      diag[i] = d;
    }
    this.flops = flops;
  }

  solve(b: Float64Array, x?: Float64Array): Float64Array {
    const { n, perm, first, start, lower, upper, diag } = this;
    const y = this.work;
    for (let i = 0; i < n; i++) y[i] = b[perm[i]];
    for (let i = 0; i < n; i++) {
      const s = start[i] - first[i];
      let v = y[i];
      for (let k = first[i]; k < i; k++) v -= lower[s + k] * y[k];
      y[i] = v;
    }
    for (let i = n - 1; i >= 0; i--) {
      const v = y[i] / diag[i];
      y[i] = v;
      const s = start[i] - first[i];
      for (let k = first[i]; k < i; k++) y[k] -= upper[s + k] * v;
    }
    const out = x ?? new Float64Array(n);
    for (let i = 0; i < n; i++) out[perm[i]] = y[i];
    return out;
  }

  stats(): FactorStats {
    return { nnzL: this.start[this.n] + this.n, flops: this.flops, supernodes: 0 };
  }
}

/** Reverse Cuthill–McKee ordering (perm[new] = old) of the pattern of A, per connected part. */
export function reverseCuthillMcKee(A: CsrMatrix): Int32Array {
  const n = A.n;
  const degree = new Int32Array(n);
  for (let i = 0; i < n; i++) degree[i] = A.rowPtr[i + 1] - A.rowPtr[i];
  const visited = new Uint8Array(n);
  const order = new Int32Array(n);
  let count = 0;
  const neighbours: number[] = [];
  while (count < n) {
    let startNode = -1;
    for (let i = 0; i < n; i++) if (!visited[i] && (startNode < 0 || degree[i] < degree[startNode])) startNode = i;
    startNode = peripheralNode(A, startNode, degree);
    let head = count;
    order[count++] = startNode;
    visited[startNode] = 1;
    while (head < count) {
      const v = order[head++];
      neighbours.length = 0;
      for (let p = A.rowPtr[v]; p < A.rowPtr[v + 1]; p++) {
        const w = A.colIdx[p];
        if (!visited[w]) {
          visited[w] = 1;
          neighbours.push(w);
        }
      }
      neighbours.sort((a, b) => degree[a] - degree[b]);
      for (const w of neighbours) order[count++] = w;
    }
  }
  order.reverse();
  return order;
}

/** A few BFS sweeps towards the far end of the graph give a good RCM start. */
function peripheralNode(A: CsrMatrix, start: number, degree: Int32Array): number {
  let node = start;
  let depth = -1;
  const level = new Int32Array(A.n);
  for (let sweep = 0; sweep < 4; sweep++) {
    level.fill(-1);
    level[node] = 0;
    const queue = [node];
    for (let h = 0; h < queue.length; h++) {
      const v = queue[h];
      for (let p = A.rowPtr[v]; p < A.rowPtr[v + 1]; p++) {
        const w = A.colIdx[p];
        if (level[w] < 0) {
          level[w] = level[v] + 1;
          queue.push(w);
        }
      }
    }
    let last = queue[queue.length - 1];
    const far = level[last];
    for (const v of queue) if (level[v] === far && degree[v] < degree[last]) last = v;
    if (far <= depth) break;
    depth = far;
    node = last;
  }
  return node;
}
