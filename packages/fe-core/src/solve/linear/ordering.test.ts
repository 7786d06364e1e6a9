import { describe, expect, it } from 'vitest';
import { columnCounts, eliminationTree, postorder } from './etree';
import { bruteForceFactorPattern, laplace2d, q4Patch, randomSparse, csrFromTriplets } from './fixtures';
import { compressedGraph, invertPermutation, isPermutation, permutedPattern } from './graph';
import { nestedDissectionOrder } from './ordering';
import type { CsrMatrix } from './types';

function nnzL(A: CsrMatrix, perm: Int32Array): number {
  const pat = permutedPattern(A, perm, invertPermutation(perm));
  const parent = eliminationTree(A.n, pat);
  const post = postorder(parent);
  const p2 = new Int32Array(A.n);
  for (let k = 0; k < A.n; k++) p2[k] = perm[post[k]];
  const pat2 = permutedPattern(A, p2, invertPermutation(p2));
  const cc = columnCounts(A.n, pat2, eliminationTree(A.n, pat2));
  return cc.reduce((s, c) => s + c, 0);
}

describe('nested dissection ordering', () => {
  it('returns a valid permutation with and without coordinates, on connected and disconnected graphs', () => {
    const g = laplace2d(20);
    expect(isPermutation(nestedDissectionOrder(g.A, { coordinates: g.coordinates }), g.A.n)).toBe(true);
    expect(isPermutation(nestedDissectionOrder(g.A), g.A.n)).toBe(true);
    const r = randomSparse(300, 4, 7, true);
    expect(isPermutation(nestedDissectionOrder(r), r.n)).toBe(true);
    // Two separate blocks and an isolated unknown.
    const d = csrFromTriplets(5, [0, 0, 1, 1, 2, 3, 3, 4, 4], [0, 1, 0, 1, 2, 3, 4, 3, 4], [2, 1, 1, 2, 1, 2, 1, 1, 2]);
    expect(isPermutation(nestedDissectionOrder(d), 5)).toBe(true);
  });

  it('keeps the unknowns of one node together (indistinguishable rows compressed)', () => {
    const p = q4Patch(6, 1000, 0.3, 1);
    const { graph, groupStart } = compressedGraph(p.A);
    // 7×7 nodes, the corner (0,0) fully constrained: 48 vertices.
    expect(graph.n).toBe(48);
    const perm = nestedDissectionOrder(p.A, { coordinates: p.coordinates });
    const iperm = invertPermutation(perm);
    for (let v = 0; v < graph.n; v++)
      for (let u = groupStart[v] + 1; u < groupStart[v + 1]; u++) expect(iperm[u]).toBe(iperm[u - 1] + 1);
  });

  it('fills far less than the natural (banded) order on a 2D grid', () => {
    // For a k×k five-point grid, the natural order fills the band: nnz(L) ≈ k³; nested dissection
    // gives O(k² log k) (George 1973, "Nested dissection of a regular finite element mesh").
    const g = laplace2d(64); // 63×63 unknowns
    const natural = Int32Array.from({ length: g.A.n }, (_, i) => i);
    const nd = nnzL(g.A, nestedDissectionOrder(g.A, { coordinates: g.coordinates }));
    const graphNd = nnzL(g.A, nestedDissectionOrder(g.A));
    const band = nnzL(g.A, natural);
    expect(band).toBeGreaterThan(63 ** 3 * 0.95);
    expect(nd).toBeLessThan(band / 2.5);
    expect(graphNd).toBeLessThan(band / 2);
  });

  it('column counts equal a brute-force symbolic elimination', () => {
    for (const A of [laplace2d(9).A, randomSparse(120, 5, 3, true), q4Patch(5, 1, 0.3, 1).A]) {
      const perm = nestedDissectionOrder(A);
      const L = bruteForceFactorPattern(A, perm);
      let brute = 0;
      for (const v of L) brute += v;
      expect(nnzL(A, perm)).toBe(brute);
    }
  });
});
