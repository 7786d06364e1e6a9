/**
 * Elimination tree, postorder and column counts of the Cholesky factor of a symmetrically
 * permuted, structurally symmetric matrix.
 *
 * Our own code (see anchors.md: no npm package gives a usable sparse Cholesky analysis). All three
 * run in O(nnz(A)·α) time without forming the factor's pattern: the tree by path-compressed
 * ancestor links, the counts by summing, over each row subtree, +1 at its leaves and −1 at the
 * least common ancestors of consecutive leaves and at the parent of its root.
 */
import type { PatternView, PermutedPattern } from './graph';

/** parent[j] of the elimination tree of P A Pᵀ (−1 for roots). */
export function eliminationTree(n: number, pat: PermutedPattern): Int32Array {
  const parent = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n).fill(-1);
  const { ptr, idx } = pat;
  for (let j = 0; j < n; j++) {
    for (let p = ptr[j]; p < ptr[j + 1]; p++) {
      let r = idx[p];
      if (r >= j) continue;
      // Climb from r to the root of its current subtree, pointing every visited node at j.
      while (r !== -1 && r !== j) {
        const next = ancestor[r];
        ancestor[r] = j;
        if (next === -1) parent[r] = j;
        r = next;
      }
    }
  }
  return parent;
}

/**
 * Depth-first postorder of a forest: post[k] is the k-th node. Children are visited in ascending
 * order, which keeps nested-dissection halves apart and the result deterministic.
 */
export function postorder(parent: Int32Array): Int32Array {
  const n = parent.length;
  const head = new Int32Array(n).fill(-1);
  const next = new Int32Array(n).fill(-1);
  // Insert in descending order so each child list ends up ascending.
  for (let j = n - 1; j >= 0; j--) {
    const p = parent[j];
    if (p === -1) continue;
    next[j] = head[p];
    head[p] = j;
  }
  const post = new Int32Array(n);
  const stack = new Int32Array(n);
  let k = 0;
  for (let root = 0; root < n; root++) {
    if (parent[root] !== -1) continue;
    let top = 0;
    stack[0] = root;
    while (top >= 0) {
      const v = stack[top];
      const c = head[v];
      if (c === -1) {
        top--;
        post[k++] = v;
      } else {
        head[v] = next[c];
        stack[++top] = c;
      }
    }
  }
  return post;
}

/**
 * Column counts of L (diagonal included) for a postordered elimination tree (every node's index
 * exceeds its descendants'). The pattern is read through `view` (row j = view.rowOf[j]) when given.
 */
export function columnCounts(n: number, pat: PermutedPattern, parent: Int32Array, view?: PatternView): Int32Array {
  const { ptr, idx } = pat;
  const rowOf = view?.rowOf;
  const map = view?.map;
  const delta = new Int32Array(n);
  const first = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    // Leaves of the elimination tree start a row subtree of their own.
    if (first[k] === -1) delta[k] = 1;
    for (let r = k; r !== -1 && first[r] === -1; r = parent[r]) first[r] = k;
  }
  const maxfirst = new Int32Array(n).fill(-1);
  const prevleaf = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n);
  for (let i = 0; i < n; i++) ancestor[i] = i;
  for (let j = 0; j < n; j++) {
    if (parent[j] !== -1) delta[parent[j]]--;
    const fj = first[j];
    const row = rowOf ? rowOf[j] : j;
    for (let p = ptr[row]; p < ptr[row + 1]; p++) {
      const i = map ? map[idx[p]] : idx[p];
      if (i <= j || fj <= maxfirst[i]) continue;
      // j is a leaf of row subtree i.
      maxfirst[i] = fj;
      delta[j]++;
      const jprev = prevleaf[i];
      prevleaf[i] = j;
      if (jprev === -1) continue;
      let q = jprev;
      while (q !== ancestor[q]) q = ancestor[q];
      for (let r = jprev; r !== q; ) {
        const nx = ancestor[r];
        ancestor[r] = q;
        r = nx;
      }
      delta[q]--; // q = lca(jprev, j)
    }
    if (parent[j] !== -1) ancestor[j] = parent[j];
  }
  const counts = delta;
  for (let j = 0; j < n; j++) if (parent[j] !== -1) counts[parent[j]] += counts[j];
  return counts;
}
