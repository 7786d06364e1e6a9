/**
 * Symbolic analysis for the multifrontal factorisations: fill-reducing order, postordered
 * elimination tree, column counts, fundamental supernodes, relaxed amalgamation, supernodal row
 * structures and the precomputed maps that place A's entries and the children's update matrices
 * into each frontal matrix.
 *
 * Our own code (npm sparse packages measured 70–300× slower than CHOLMOD, see anchors.md). Every
 * array here depends on the pattern only, so Newton iterations that re-factor the same pattern
 * pay for it once.
 */
import { columnCounts, eliminationTree, postorder } from './etree';
import { invertPermutation, permutedPattern, type PatternView } from './graph';
import { nestedDissectionOrder, type OrderingOptions } from './ordering';
import type { CsrMatrix } from './types';

/** Rows of padding below and columns beyond every frontal matrix, so 4×4 kernels need no edge code. */
export const FRONT_PAD = 3;

export interface RelaxOptions {
  /** Merge a child into its parent whenever the merged width is at most this (default 8). */
  readonly always: number;
  /** [maximum merged width, maximum fraction of explicit zeros] pairs, tried in order. */
  readonly rules: ReadonlyArray<readonly [number, number]>;
}

export const DEFAULT_RELAX: RelaxOptions = {
  always: 8,
  rules: [
    [24, 0.5],
    [64, 0.15],
    [Infinity, 0.03],
  ],
};

export interface SymbolicOptions extends OrderingOptions {
  /** A fill-reducing order to use instead of nested dissection (perm[new] = old). */
  readonly ordering?: Int32Array;
  readonly relax?: RelaxOptions;
}

export interface SupernodalSymbolic {
  readonly n: number;
  /** perm[new] = old; the factorisation works on P A Pᵀ. */
  readonly perm: Int32Array;
  readonly iperm: Int32Array;
  readonly nsuper: number;
  /** Columns of supernode s: superStart[s] .. superStart[s+1]-1 (new numbering). */
  readonly superStart: Int32Array;
  /** Off-diagonal row indices of supernode s: rowIdx[rowStart[s] .. rowStart[s+1]), ascending. */
  readonly rowStart: Int32Array;
  readonly rowIdx: Int32Array;
  readonly sparent: Int32Array;
  /** Children of s: children[childStart[s] .. childStart[s+1]), ascending (= stack order). */
  readonly childStart: Int32Array;
  readonly children: Int32Array;
  /** Exact nonzeros of L including the diagonal (explicit zeros of amalgamation excluded). */
  readonly nnzL: number;
  /** Σ_j cc_j² over the exact column counts: the usual Cholesky flop count. */
  readonly flops: number;
  /** Entries of the lower trapezoids actually stored (amalgamation zeros included). */
  readonly storedEntries: number;
  /** Front position of each child's off-diagonal rows inside its parent's front (parallel to rowIdx). */
  readonly relIdx: Int32Array;
}

/** Full analysis: order, tree, counts, supernodes, structures. */
export function analyseSymbolic(A: CsrMatrix, options: SymbolicOptions = {}): SupernodalSymbolic {
  const n = A.n;
  const perm0 = options.ordering ?? nestedDissectionOrder(A, options);
  const pat0 = permutedPattern(A, perm0, invertPermutation(perm0));
  const parent0 = eliminationTree(n, pat0);
  const post = postorder(parent0);
  const perm1 = new Int32Array(n);
  for (let k = 0; k < n; k++) perm1[k] = perm0[post[k]];
  // Relabel the tree instead of recomputing it.
  const ipost = invertPermutation(post);
  const parent1 = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const p = parent0[post[k]];
    parent1[k] = p === -1 ? -1 : ipost[p];
  }
  const cc = columnCounts(n, pat0, parent1, { pat: pat0, rowOf: post, map: ipost });
  let nnzL = 0;
  let flops = 0;
  for (let j = 0; j < n; j++) {
    nnzL += cc[j];
    flops += cc[j] * cc[j];
  }
  const fund = fundamentalSupernodes(parent1, cc);
  const { order, groupWidth } = amalgamate(fund, parent1, cc, options.relax ?? DEFAULT_RELAX);
  const perm = new Int32Array(n);
  for (let k = 0; k < n; k++) perm[k] = perm1[order[k]];
  const iperm = invertPermutation(perm);
  // Final numbering seen from pat0: row k is pat0 row post[order[k]].
  const rowOf = new Int32Array(n);
  for (let k = 0; k < n; k++) rowOf[k] = post[order[k]];
  const view: PatternView = { pat: pat0, rowOf, map: invertPermutation(rowOf) };
  const nsuper = groupWidth.length;
  const superStart = new Int32Array(nsuper + 1);
  for (let s = 0; s < nsuper; s++) superStart[s + 1] = superStart[s] + groupWidth[s];
  const rows = rowStructures(n, view, superStart);
  const tree = supernodalTree(superStart, rows.rowStart, rows.rowIdx);
  let stored = 0;
  for (let s = 0; s < nsuper; s++) {
    const k = superStart[s + 1] - superStart[s];
    const r = rows.rowStart[s + 1] - rows.rowStart[s];
    stored += (k * (k + 1)) / 2 + k * r;
  }
  const relIdx = relativeIndices(n, superStart, rows.rowStart, rows.rowIdx, tree.sparent);
  return {
    n,
    perm,
    iperm,
    nsuper,
    superStart,
    rowStart: rows.rowStart,
    rowIdx: rows.rowIdx,
    sparent: tree.sparent,
    childStart: tree.childStart,
    children: tree.children,
    nnzL,
    flops,
    storedEntries: stored,
    relIdx,
  };
}

interface Fundamental {
  readonly count: number;
  readonly start: Int32Array;
  /** Supernode of each column. */
  readonly of: Int32Array;
}

/**
 * Column j+1 continues j's supernode when it is j's parent and its structure is j's minus j.
 * Several children are allowed: identical structure is all a dense block needs.
 */
function fundamentalSupernodes(parent: Int32Array, cc: Int32Array): Fundamental {
  const n = parent.length;
  const of = new Int32Array(n);
  const starts: number[] = [];
  for (let j = 0; j < n; j++) {
    const joins = j > 0 && parent[j - 1] === j && cc[j - 1] === cc[j] + 1;
    if (!joins) starts.push(j);
    of[j] = starts.length - 1;
  }
  starts.push(n);
  return { count: starts.length - 1, start: Int32Array.from(starts), of };
}

/**
 * Relaxed amalgamation: merges a supernode into its parent when the merged front stays narrow or
 * gains few explicit zeros; wider fronts run the dense kernels faster than the zeros cost.
 * Returns the new column order (old index per new position, relative to the postorder) and the
 * width of each merged supernode in the new order.
 */
function amalgamate(
  fund: Fundamental,
  parent: Int32Array,
  cc: Int32Array,
  relax: RelaxOptions,
): { order: Int32Array; groupWidth: Int32Array } {
  const nf = fund.count;
  const start = fund.start;
  const fparent = new Int32Array(nf);
  const width = new Float64Array(nf);
  const rowsBelow = new Float64Array(nf);
  const trueNz = new Float64Array(nf);
  for (let s = 0; s < nf; s++) {
    const last = start[s + 1] - 1;
    const p = parent[last];
    fparent[s] = p === -1 ? -1 : fund.of[p];
    const k = start[s + 1] - start[s];
    width[s] = k;
    rowsBelow[s] = cc[start[s]] - k;
    trueNz[s] = (k * (k + 1)) / 2 + k * rowsBelow[s];
  }
  // Children lists of the fundamental tree.
  const childHead = new Int32Array(nf).fill(-1);
  const childNext = new Int32Array(nf).fill(-1);
  for (let s = nf - 1; s >= 0; s--) {
    const p = fparent[s];
    if (p === -1) continue;
    childNext[s] = childHead[p];
    childHead[p] = s;
  }
  const top = new Int32Array(nf);
  for (let s = 0; s < nf; s++) top[s] = s;
  for (let p = 0; p < nf; p++) {
    for (let c = childHead[p]; c !== -1; c = childNext[c]) {
      const K = width[p] + width[c];
      const r = rowsBelow[p];
      const stored = (K * (K + 1)) / 2 + K * r;
      const zeros = stored - trueNz[p] - trueNz[c];
      if (!relaxAccepts(relax, K, zeros / stored)) continue;
      width[p] = K;
      trueNz[p] = stored - zeros;
      top[c] = p;
    }
  }
  // Group root of each fundamental supernode (parents come after children, so one pass downward).
  for (let s = nf - 1; s >= 0; s--) if (top[s] !== s) top[s] = top[top[s]];
  // Number the groups by their top, build the group tree and postorder it.
  const gid = new Int32Array(nf).fill(-1);
  let ng = 0;
  for (let s = 0; s < nf; s++) if (top[s] === s) gid[s] = ng++;
  const gparent = new Int32Array(ng);
  for (let s = 0; s < nf; s++) {
    if (top[s] !== s) continue;
    const p = fparent[s];
    gparent[gid[s]] = p === -1 ? -1 : gid[top[p]];
  }
  const gpost = postorder(gparent);
  // Members of each group in ascending order (a topological order of the original tree).
  const memberStart = new Int32Array(ng + 1);
  for (let s = 0; s < nf; s++) memberStart[gid[top[s]] + 1]++;
  for (let g = 0; g < ng; g++) memberStart[g + 1] += memberStart[g];
  const cursor = memberStart.slice(0, ng);
  const members = new Int32Array(nf);
  for (let s = 0; s < nf; s++) members[cursor[gid[top[s]]]++] = s;
  const n = parent.length;
  const order = new Int32Array(n);
  const groupWidth = new Int32Array(ng);
  let k = 0;
  for (let q = 0; q < ng; q++) {
    const g = gpost[q];
    const k0 = k;
    for (let t = memberStart[g]; t < memberStart[g + 1]; t++) {
      const s = members[t];
      for (let j = start[s]; j < start[s + 1]; j++) order[k++] = j;
    }
    groupWidth[q] = k - k0;
  }
  return { order, groupWidth };
}

function relaxAccepts(relax: RelaxOptions, width: number, zeroFraction: number): boolean {
  if (width <= relax.always) return true;
  for (const [maxWidth, maxZeros] of relax.rules) {
    if (width <= maxWidth) return zeroFraction <= maxZeros;
  }
  return false;
}

/**
 * Off-diagonal row structure of each supernode: A's entries below the diagonal block in its
 * columns, merged with its children's structures. The pattern is that of L (amalgamated).
 */
function rowStructures(
  n: number,
  view: PatternView,
  superStart: Int32Array,
): { rowStart: Int32Array; rowIdx: Int32Array } {
  const ns = superStart.length - 1;
  const superOf = new Int32Array(n);
  for (let s = 0; s < ns; s++) superOf.fill(s, superStart[s], superStart[s + 1]);
  const tag = new Int32Array(n).fill(-1);
  const buf = new Int32Array(n);
  const rowStart = new Int32Array(ns + 1);
  // Children's structures are merged through a linked list of children per supernode.
  const childHead = new Int32Array(ns).fill(-1);
  const childNext = new Int32Array(ns).fill(-1);
  let total = 0;
  let store = new Int32Array(Math.max(16, 4 * n));
  const { ptr, idx } = view.pat;
  const { rowOf, map } = view;
  for (let s = 0; s < ns; s++) {
    const f = superStart[s];
    const end = superStart[s + 1];
    let cnt = 0;
    for (let j = f; j < end; j++) {
      const row = rowOf[j];
      for (let p = ptr[row]; p < ptr[row + 1]; p++) {
        const i = map[idx[p]];
        if (i >= end && tag[i] !== s) {
          tag[i] = s;
          buf[cnt++] = i;
        }
      }
    }
    for (let c = childHead[s]; c !== -1; c = childNext[c]) {
      for (let p = rowStart[c]; p < rowStart[c + 1]; p++) {
        const i = store[p];
        if (i >= end && tag[i] !== s) {
          tag[i] = s;
          buf[cnt++] = i;
        }
      }
    }
    const rows = buf.subarray(0, cnt);
    rows.sort();
    if (total + cnt > store.length) {
      const bigger = new Int32Array(Math.max(2 * store.length, total + cnt));
      bigger.set(store.subarray(0, total));
      store = bigger;
    }
    store.set(rows, total);
    rowStart[s] = total;
    total += cnt;
    rowStart[s + 1] = total;
    if (cnt > 0) {
      const p = superOf[rows[0]];
      childNext[s] = childHead[p];
      childHead[p] = s;
    }
  }
  return { rowStart, rowIdx: store.slice(0, total) };
}

function supernodalTree(
  superStart: Int32Array,
  rowStart: Int32Array,
  rowIdx: Int32Array,
): { sparent: Int32Array; childStart: Int32Array; children: Int32Array } {
  const ns = superStart.length - 1;
  const n = superStart[ns];
  const superOf = new Int32Array(n);
  for (let s = 0; s < ns; s++) superOf.fill(s, superStart[s], superStart[s + 1]);
  const sparent = new Int32Array(ns).fill(-1);
  const childStart = new Int32Array(ns + 1);
  for (let s = 0; s < ns; s++) {
    if (rowStart[s + 1] > rowStart[s]) {
      sparent[s] = superOf[rowIdx[rowStart[s]]];
      childStart[sparent[s] + 1]++;
    }
  }
  for (let s = 0; s < ns; s++) childStart[s + 1] += childStart[s];
  const cursor = childStart.slice(0, ns);
  const children = new Int32Array(childStart[ns]);
  for (let s = 0; s < ns; s++) if (sparent[s] !== -1) children[cursor[sparent[s]]++] = s;
  return { sparent, childStart, children };
}

/** Position of every child row inside the parent's front: rows of the pivot block first, then its off-diagonal rows. */
function relativeIndices(
  n: number,
  superStart: Int32Array,
  rowStart: Int32Array,
  rowIdx: Int32Array,
  sparent: Int32Array,
): Int32Array {
  const ns = superStart.length - 1;
  const rel = new Int32Array(rowIdx.length);
  const pos = new Int32Array(n);
  // Fill each parent's row positions once, then translate all its children.
  const childHead = new Int32Array(ns).fill(-1);
  const childNext = new Int32Array(ns).fill(-1);
  for (let s = ns - 1; s >= 0; s--) {
    const p = sparent[s];
    if (p === -1) continue;
    childNext[s] = childHead[p];
    childHead[p] = s;
  }
  for (let p = 0; p < ns; p++) {
    if (childHead[p] === -1) continue;
    const f = superStart[p];
    const k = superStart[p + 1] - f;
    for (let j = 0; j < k; j++) pos[f + j] = j;
    for (let t = rowStart[p]; t < rowStart[p + 1]; t++) pos[rowIdx[t]] = k + (t - rowStart[p]);
    for (let c = childHead[p]; c !== -1; c = childNext[c]) {
      for (let t = rowStart[c]; t < rowStart[c + 1]; t++) rel[t] = pos[rowIdx[t]];
    }
  }
  return rel;
}

/** Leading dimension of the front of supernode s (rows plus padding). */
export function frontLd(sym: SupernodalSymbolic, s: number): number {
  return frontRows(sym, s) + FRONT_PAD;
}

export function frontRows(sym: SupernodalSymbolic, s: number): number {
  return sym.superStart[s + 1] - sym.superStart[s] + sym.rowStart[s + 1] - sym.rowStart[s];
}

/**
 * Where each entry of A goes in the fronts. For supernode s, entries aStart[s]..aStart[s+1]-1
 * copy A.values[aSrc[t]] into front position aDst[t] (column-major, leading dimension frontLd).
 * lowerOnly: the symmetric path assembles the lower triangle of P A Pᵀ; otherwise both triangles
 * of the pivot rows and columns are placed (LU).
 */
export interface AssemblyMap {
  readonly aStart: Int32Array;
  readonly aSrc: Int32Array;
  readonly aDst: Int32Array;
}

export function assemblyMap(A: CsrMatrix, sym: SupernodalSymbolic, lowerOnly: boolean): AssemblyMap {
  const { n, superStart, rowStart, rowIdx, perm, iperm, nsuper } = sym;
  const { rowPtr, colIdx } = A;
  const pos = new Int32Array(n);
  const aStart = new Int32Array(nsuper + 1);
  // Count: entries whose smaller permuted index lies in s (once for lowerOnly, both triangles otherwise).
  for (let s = 0; s < nsuper; s++) {
    let cnt = 0;
    for (let j = superStart[s]; j < superStart[s + 1]; j++) {
      const o = perm[j];
      for (let p = rowPtr[o]; p < rowPtr[o + 1]; p++) {
        const i = iperm[colIdx[p]];
        if (i > j) cnt += lowerOnly ? 1 : 2;
        else if (i === j) cnt++;
      }
    }
    aStart[s + 1] = aStart[s] + cnt;
  }
  const aSrc = new Int32Array(aStart[nsuper]);
  const aDst = new Int32Array(aStart[nsuper]);
  const tpos = transposeIndex(A);
  let t = 0;
  for (let s = 0; s < nsuper; s++) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const ld = k + rowStart[s + 1] - rowStart[s] + FRONT_PAD;
    for (let j = 0; j < k; j++) pos[f + j] = j;
    for (let q = rowStart[s]; q < rowStart[s + 1]; q++) pos[rowIdx[q]] = k + (q - rowStart[s]);
    for (let j = f; j < f + k; j++) {
      const o = perm[j];
      const cj = (j - f) * ld;
      for (let p = rowPtr[o]; p < rowPtr[o + 1]; p++) {
        const i = iperm[colIdx[p]];
        if (i < j) continue;
        // p is A(perm j, perm i): row j, column i of P A Pᵀ. Its transpose is entry (i, j).
        const pi = pos[i];
        if (i === j) {
          aSrc[t] = p;
          aDst[t++] = pi + cj;
          continue;
        }
        aSrc[t] = tpos[p];
        aDst[t++] = pi + cj; // lower: row i, column j
        if (!lowerOnly) {
          aSrc[t] = p;
          aDst[t++] = j - f + pi * ld; // upper: row j, column i
        }
      }
    }
  }
  return { aStart, aSrc, aDst };
}

/**
 * tpos[p] is the value index of the transpose of entry p. Throws when the pattern is not
 * structurally symmetric: every factorisation here relies on it.
 */
export function transposeIndex(A: CsrMatrix): Int32Array {
  const { n, rowPtr, colIdx } = A;
  const cursor = rowPtr.slice(0, n);
  const tpos = new Int32Array(rowPtr[n]);
  for (let r = 0; r < n; r++) {
    for (let p = rowPtr[r]; p < rowPtr[r + 1]; p++) {
      const c = colIdx[p];
      const q = cursor[c]++;
      if (q >= rowPtr[c + 1] || colIdx[q] !== r) {
        throw new Error(`matrix pattern is not structurally symmetric at (${r}, ${c})`);
      }
      tpos[p] = q;
    }
  }
  return tpos;
}
