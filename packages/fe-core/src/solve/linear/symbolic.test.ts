import { describe, expect, it } from 'vitest';
import { eliminationTree } from './etree';
import { bruteForceFactorPattern, laplace2d, q4Patch, randomSparse } from './fixtures';
import { invertPermutation, isPermutation, permutedPattern } from './graph';
import { analyseSymbolic } from './symbolic';
import type { CsrMatrix } from './types';

function check(A: CsrMatrix, coordinates?: Float64Array): void {
  const sym = analyseSymbolic(A, { coordinates });
  expect(isPermutation(sym.perm, A.n)).toBe(true);
  const L = bruteForceFactorPattern(A, sym.perm);
  const n = A.n;
  let brute = 0;
  for (const v of L) brute += v;
  // nnz(L) of the fast analysis equals the brute-force count of the same order.
  expect(sym.nnzL).toBe(brute);
  // Elimination tree: parent(j) = first off-diagonal row of column j of L.
  const parent = eliminationTree(n, permutedPattern(A, sym.perm, invertPermutation(sym.perm)));
  for (let j = 0; j < n; j++) {
    let first = -1;
    for (let i = j + 1; i < n; i++)
      if (L[i * n + j]) {
        first = i;
        break;
      }
    expect(parent[j]).toBe(first);
  }
  // Supernodes: contiguous columns; stored structure covers the true pattern of every column.
  expect(sym.superStart[sym.nsuper]).toBe(n);
  let stored = 0;
  for (let s = 0; s < sym.nsuper; s++) {
    const f = sym.superStart[s];
    const e = sym.superStart[s + 1];
    const rows = new Set(sym.rowIdx.subarray(sym.rowStart[s], sym.rowStart[s + 1]));
    for (let j = f; j < e; j++)
      for (let i = e; i < n; i++) if (L[i * n + j]) expect(rows.has(i)).toBe(true);
    const k = e - f;
    stored += (k * (k + 1)) / 2 + k * rows.size;
    // Children come before their parent (postorder).
    if (sym.sparent[s] !== -1) expect(sym.sparent[s]).toBeGreaterThan(s);
  }
  expect(sym.storedEntries).toBe(stored);
  expect(stored).toBeGreaterThanOrEqual(brute);
}

describe('supernodal symbolic analysis', () => {
  it('matches brute-force symbolic elimination on a grid, a Q4 mesh and a random matrix', () => {
    const g = laplace2d(12);
    check(g.A, g.coordinates);
    check(g.A);
    const q = q4Patch(6, 1, 0.3, 1);
    check(q.A, q.coordinates);
    check(randomSparse(150, 6, 11, true));
  });
});
