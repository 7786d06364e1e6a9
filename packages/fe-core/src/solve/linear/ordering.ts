/**
 * Fill-reducing orderings: nested dissection guided by node coordinates (recursive coordinate
 * bisection with vertex separators), and graph nested dissection by breadth-first level
 * structures when no coordinates are given.
 *
 * Our own code: no npm package offers a fill-reducing ordering fit for 10⁵–10⁶ unknowns (the
 * general sparse packages measured 70–300× slower than CHOLMOD, mostly through poor orderings;
 * see /work/shared/bench/anchors.md). Ordering matters more than kernels: band orderings cost
 * O(N²) fill on these meshes, nested dissection O(N log N).
 */
import { compressedGraph, type Graph } from './graph';
import type { CsrMatrix } from './types';

export interface OrderingOptions {
  /** Coordinates per unknown, interleaved (x, y[, z]); length dim·n. */
  readonly coordinates?: Float64Array;
  /** Coordinate dimension, 2 (default) or 3. */
  readonly coordinateDimension?: 2 | 3;
  /** Subgraphs of at most this many vertices (mesh nodes) are not dissected further. */
  readonly leafSize?: number;
}

/** Work arrays shared by the recursive dissection of one graph. */
interface Dissection {
  readonly g: Graph;
  /** Vertices; every subproblem owns a contiguous range, reordered in place into its final order. */
  readonly verts: Int32Array;
  /** Stamp per vertex telling which side of the current split it lies on. */
  readonly mark: Int32Array;
  stamp: number;
  readonly coords: Float64Array[] | null;
  readonly scratch: Float64Array;
  readonly level: Int32Array;
  readonly queue: Int32Array;
  readonly leafSize: number;
  /** Number of vertices reached by the last breadth-first search (they are queue[0..bfsCount)). */
  bfsCount: number;
}

/**
 * Returns perm with perm[new] = old: a nested-dissection order of the unknowns of A.
 * Vertices are the groups of unknowns with identical rows; a group's unknowns stay consecutive.
 */
export function nestedDissectionOrder(A: CsrMatrix, options: OrderingOptions = {}): Int32Array {
  const { graph, groupStart } = compressedGraph(A);
  const nv = graph.n;
  const dim = options.coordinateDimension ?? 2;
  let coords: Float64Array[] | null = null;
  if (options.coordinates && options.coordinates.length >= dim * A.n) {
    coords = [];
    for (let d = 0; d < dim; d++) {
      const c = new Float64Array(nv);
      for (let v = 0; v < nv; v++) c[v] = options.coordinates[dim * groupStart[v] + d];
      coords.push(c);
    }
  }
  const verts = new Int32Array(nv);
  for (let v = 0; v < nv; v++) verts[v] = v;
  const state: Dissection = {
    g: graph,
    verts,
    mark: new Int32Array(nv),
    stamp: 0,
    coords,
    scratch: new Float64Array(nv),
    level: new Int32Array(nv),
    queue: new Int32Array(nv),
    leafSize: Math.max(2, options.leafSize ?? 6),
    bfsCount: 0,
  };
  dissect(state, 0, nv);

  const perm = new Int32Array(A.n);
  let k = 0;
  for (let p = 0; p < nv; p++) {
    const v = verts[p];
    for (let u = groupStart[v]; u < groupStart[v + 1]; u++) perm[k++] = u;
  }
  return perm;
}

/** Orders verts[lo, hi): left part, right part, then the separator that splits them. */
function dissect(s: Dissection, lo: number, hi: number): void {
  // An explicit stack keeps the depth independent of how unbalanced the splits are.
  const stack: number[] = [lo, hi];
  while (stack.length > 0) {
    const h = stack.pop()!;
    const l = stack.pop()!;
    if (h - l <= s.leafSize) continue;
    let split = s.coords ? coordinateSplit(s, l, h) : null;
    if (!split) split = levelSplit(s, l, h);
    if (!split) continue;
    const [nl, nr] = split;
    stack.push(l, l + nl, l + nl, l + nl + nr);
  }
}

/** Places the vertices stamped `left` first, `right` next, the rest (separator) last. */
function partitionRange(s: Dissection, lo: number, hi: number, left: number, right: number): [number, number] {
  const { verts, mark } = s;
  const tmp = s.queue;
  let a = 0;
  for (let p = lo; p < hi; p++) if (mark[verts[p]] === left) tmp[a++] = verts[p];
  const nl = a;
  for (let p = lo; p < hi; p++) if (mark[verts[p]] === right) tmp[a++] = verts[p];
  const nr = a - nl;
  for (let p = lo; p < hi; p++) {
    const m = mark[verts[p]];
    if (m !== left && m !== right) tmp[a++] = verts[p];
  }
  verts.set(tmp.subarray(0, a), lo);
  return [nl, nr];
}

/**
 * Splits at the median coordinate along the longest box edge, then takes as separator the
 * smaller of the two one-sided boundaries (vertices with a neighbour across the cut). On a
 * structured mesh this is a mesh line, the optimal separator.
 */
function coordinateSplit(s: Dissection, lo: number, hi: number): [number, number] | null {
  const coords = s.coords!;
  const { verts, mark, g } = s;
  let axis = 0;
  let widest = -1;
  for (let d = 0; d < coords.length; d++) {
    const c = coords[d];
    let mn = Infinity;
    let mx = -Infinity;
    for (let p = lo; p < hi; p++) {
      const x = c[verts[p]];
      if (x < mn) mn = x;
      if (x > mx) mx = x;
    }
    if (mx - mn > widest) {
      widest = mx - mn;
      axis = d;
    }
  }
  if (!(widest > 0)) return null;
  const c = coords[axis];
  const size = hi - lo;
  const vals = s.scratch;
  for (let p = 0; p < size; p++) vals[p] = c[verts[lo + p]];
  const med = selectKth(vals, 0, size - 1, size >> 1);
  const L = ++s.stamp;
  const R = ++s.stamp;
  let nl = 0;
  for (let p = lo; p < hi; p++) {
    const v = verts[p];
    if (c[v] < med) {
      mark[v] = L;
      nl++;
    } else mark[v] = R;
  }
  if (nl === 0) return null;
  // Boundary sizes on both sides of the cut.
  const { xadj, adj } = g;
  let bl = 0;
  let br = 0;
  for (let p = lo; p < hi; p++) {
    const v = verts[p];
    const mv = mark[v];
    const other = mv === L ? R : L;
    for (let e = xadj[v]; e < xadj[v + 1]; e++) {
      if (mark[adj[e]] === other) {
        if (mv === L) bl++;
        else br++;
        break;
      }
    }
  }
  const sepSide = br <= bl ? R : L;
  const keepSide = sepSide === R ? L : R;
  const S = ++s.stamp;
  for (let p = lo; p < hi; p++) {
    const v = verts[p];
    if (mark[v] !== sepSide) continue;
    for (let e = xadj[v]; e < xadj[v + 1]; e++) {
      if (mark[adj[e]] === keepSide) {
        mark[v] = S;
        break;
      }
    }
  }
  return partitionRange(s, lo, hi, L, R);
}

/** k-th smallest of a[lo..hi] (inclusive), rearranging a; Hoare selection with median of three. */
function selectKth(a: Float64Array, lo: number, hi: number, k: number): number {
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    let x = a[lo];
    let y = a[mid];
    let z = a[hi];
    if (x > y) [x, y] = [y, x];
    if (y > z) [y, z] = [z, y];
    if (x > y) [x, y] = [y, x];
    const pivot = y;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[lo];
}

/**
 * Breadth-first level structure from a pseudo-peripheral vertex; the separator is the smallest
 * level near the weighted middle. A subgraph that is not connected splits into the reached
 * component and the rest with an empty separator.
 */
function levelSplit(s: Dissection, lo: number, hi: number): [number, number] | null {
  const { verts, mark, level, queue, g } = s;
  const inRange = ++s.stamp;
  for (let p = lo; p < hi; p++) mark[verts[p]] = inRange;
  const size = hi - lo;
  let root = verts[lo];
  let depth = bfsLevels(s, root, inRange);
  // Pseudo-peripheral vertex: restart from a vertex of minimum degree in the last level while
  // the eccentricity grows.
  for (let sweep = 0; sweep < 4; sweep++) {
    const reached = s.bfsCount;
    let best = -1;
    let bestDeg = Infinity;
    for (let q = 0; q < reached; q++) {
      const v = queue[q];
      if (level[v] !== depth) continue;
      const d = g.xadj[v + 1] - g.xadj[v];
      if (d < bestDeg) {
        bestDeg = d;
        best = v;
      }
    }
    if (best < 0 || best === root) break;
    const d2 = bfsLevels(s, best, inRange);
    if (d2 <= depth) {
      bfsLevels(s, root, inRange);
      break;
    }
    root = best;
    depth = d2;
  }
  const reached = s.bfsCount;
  const L = ++s.stamp;
  const R = ++s.stamp;
  if (reached < size) {
    // Disconnected: component versus the rest, nothing to separate.
    for (let p = lo; p < hi; p++) mark[verts[p]] = R;
    for (let q = 0; q < reached; q++) mark[queue[q]] = L;
    return partitionRange(s, lo, hi, L, R);
  }
  if (depth < 2) return null; // (nearly) a clique: no useful separator
  const counts = new Int32Array(depth + 1);
  for (let q = 0; q < reached; q++) counts[level[queue[q]]]++;
  // Median level, then the smallest level whose sides stay within 35–65 % of the vertices.
  let cum = 0;
  let medianLevel = 1;
  for (let l = 0; l <= depth; l++) {
    if (cum + counts[l] > size / 2) {
      medianLevel = l;
      break;
    }
    cum += counts[l];
  }
  let sepLevel = Math.min(Math.max(medianLevel, 1), depth - 1);
  let bestSize = counts[sepLevel];
  let below = 0;
  for (let l = 0; l < depth; l++) {
    if (l >= 1) {
      const above = size - below - counts[l];
      if (below >= 0.35 * size && above >= 0.35 * size && counts[l] < bestSize) {
        bestSize = counts[l];
        sepLevel = l;
      }
    }
    below += counts[l];
  }
  const S = ++s.stamp;
  for (let q = 0; q < reached; q++) {
    const v = queue[q];
    const lv = level[v];
    mark[v] = lv < sepLevel ? L : lv > sepLevel ? R : S;
  }
  // Separator vertices with no neighbour beyond the separator belong to the near side.
  const { xadj, adj } = g;
  for (let q = 0; q < reached; q++) {
    const v = queue[q];
    if (mark[v] !== S) continue;
    let touchesR = false;
    for (let e = xadj[v]; e < xadj[v + 1]; e++) {
      if (mark[adj[e]] === R) {
        touchesR = true;
        break;
      }
    }
    if (!touchesR) mark[v] = L;
  }
  return partitionRange(s, lo, hi, L, R);
}

/** Breadth-first search restricted to vertices stamped `inRange`; returns the depth. */
function bfsLevels(s: Dissection, root: number, inRange: number): number {
  const { mark, level, queue, g } = s;
  const visited = ++s.stamp;
  const { xadj, adj } = g;
  let head = 0;
  let tail = 0;
  queue[tail++] = root;
  level[root] = 0;
  mark[root] = visited;
  let depth = 0;
  while (head < tail) {
    const v = queue[head++];
    const lv = level[v];
    for (let e = xadj[v]; e < xadj[v + 1]; e++) {
      const w = adj[e];
      if (mark[w] !== inRange) continue;
      mark[w] = visited;
      level[w] = lv + 1;
      if (lv + 1 > depth) depth = lv + 1;
      queue[tail++] = w;
    }
  }
  // Restore the range stamp so later sweeps see the whole subgraph again.
  for (let q = 0; q < tail; q++) mark[queue[q]] = inRange;
  s.bfsCount = tail;
  return depth;
}
