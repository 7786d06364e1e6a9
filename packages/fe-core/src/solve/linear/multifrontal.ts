/**
 * The multifrontal machinery shared by the LDLᵀ and LU drivers: storage layout, the work arrays
 * sized once per analysis, the supernode loop that assembles each frontal matrix (A's entries,
 * the children's update matrices) and pushes its Schur complement, and the forward sweep.
 *
 * The symmetric path keeps lower triangles only (front, packed update stack); the non-symmetric
 * path keeps full squares. What differs per front (dense factorisation, storing the factor,
 * singularity reports) is left to the driver's step callback, called once per supernode.
 */
import { checkCsr, diagonalIndex, pivotFloors } from './csr';
import { PackBuffers } from './kernels';
import {
  analyseSymbolic,
  assemblyMap,
  FRONT_PAD,
  type AssemblyMap,
  type RelaxOptions,
  type SupernodalSymbolic,
} from './symbolic';
import { gemvColumns, unitLowerSolve } from './triangular';
import type { CsrMatrix, DirectSolverOptions } from './types';

export interface SupernodalOptions {
  /** A pivot counts as zero when |d_j| ≤ pivotTolerance·|a_jj| (default 1e-12). */
  readonly pivotTolerance?: number;
  /** Reject values that are not symmetric (relative difference > 1e-8) instead of using one triangle. */
  readonly checkSymmetry?: boolean;
  readonly relax?: RelaxOptions;
  readonly leafSize?: number;
  /** Fill-reducing order to use instead of nested dissection (perm[new] = old). */
  readonly ordering?: Int32Array;
}

/** Offsets and sizes shared by the multifrontal LDLᵀ and LU drivers. */
export interface FrontLayout {
  /** Start of each supernode's block in the factor storage (int32: typed-array indices stay small integers). */
  readonly lOffset: Int32Array;
  readonly factorSize: number;
  /** Largest (m + pad)² over the fronts. */
  readonly frontSize: number;
  readonly stackSize: number;
  readonly maxRows: number;
  readonly maxCols: number;
}

/**
 * Sizes of the factor storage (dense m×k blocks per supernode, times `blocks` for LU's L and U),
 * the largest front and the peak of the update-matrix stack (packed lower triangles when
 * `packedUpdates`, full squares otherwise).
 */
export function frontLayout(sym: SupernodalSymbolic, packedUpdates: boolean, blocks: 1 | 2): FrontLayout {
  const { nsuper, superStart, rowStart, childStart, children } = sym;
  const lOffset = new Int32Array(nsuper + 1);
  let total = 0;
  const updSize = new Float64Array(nsuper);
  let frontSize = 0;
  let sp = 0;
  let peak = 0;
  let maxRows = 0;
  let maxCols = 0;
  for (let s = 0; s < nsuper; s++) {
    const k = superStart[s + 1] - superStart[s];
    const r = rowStart[s + 1] - rowStart[s];
    const m = k + r;
    // LU keeps the m×k column block and the k×r row block; LDLᵀ the m×k block.
    total += blocks === 1 ? m * k : m * k + k * r;
    if (total > 2 ** 31 - 1) throw new Error('factor storage exceeds 2³¹ entries: use an iterative solver');
    lOffset[s + 1] = total;
    frontSize = Math.max(frontSize, (m + FRONT_PAD) * (m + FRONT_PAD));
    maxRows = Math.max(maxRows, m);
    maxCols = Math.max(maxCols, k);
    for (let c = childStart[s]; c < childStart[s + 1]; c++) sp -= updSize[children[c]];
    updSize[s] = packedUpdates ? (r * (r + 1)) / 2 : r * r;
    sp += updSize[s];
    if (sp > peak) peak = sp;
  }
  return { lOffset, factorSize: lOffset[nsuper], frontSize, stackSize: peak, maxRows, maxCols };
}

/** Checks A and runs the symbolic analysis with the solver's ordering and amalgamation options. */
export function analyseWithOptions(
  A: CsrMatrix,
  options: DirectSolverOptions,
  solverOptions: SupernodalOptions,
): SupernodalSymbolic {
  checkCsr(A);
  return analyseSymbolic(A, {
    coordinates: options.coordinates,
    coordinateDimension: options.coordinateDimension,
    leafSize: solverOptions.leafSize,
    relax: solverOptions.relax,
    ordering: solverOptions.ordering,
  });
}

/**
 * Factors the front of supernode s in place: F (leading dimension ld) holds the m×m frontal
 * matrix, its first k columns are the pivots (first column f in the permuted order), and the
 * pivot floors of those columns are in `MultifrontalCore.floorLocal`. Must leave the Schur
 * complement in F[k:m, k:m].
 */
export type FrontStep = (s: number, f: number, m: number, k: number, ld: number) => void;

/** Pattern-dependent maps and work arrays of one analysis, reused by every factorisation. */
export class MultifrontalCore {
  readonly amap: AssemblyMap;
  readonly layout: FrontLayout;
  readonly diag: Int32Array;
  /** Dense factor blocks, `layout.lOffset[s]` onwards for supernode s. */
  readonly factors: Float64Array;
  readonly front: Float64Array;
  readonly floorLocal: Float64Array;
  /** Length n: the permuted right-hand side during solves. */
  readonly work: Float64Array;
  /** Length maxRows: the off-diagonal block's product during solves. */
  readonly tmp: Float64Array;
  readonly pack = new PackBuffers();
  private readonly stack: Float64Array;
  private readonly stackOff: Int32Array;
  private readonly floors: Float64Array;

  /** `symmetric`: lower triangles only (LDLᵀ); otherwise full fronts and L plus U storage (LU). */
  constructor(
    A: CsrMatrix,
    readonly sym: SupernodalSymbolic,
    readonly symmetric: boolean,
  ) {
    this.amap = assemblyMap(A, sym, symmetric);
    this.diag = diagonalIndex(A);
    const layout = frontLayout(sym, symmetric, symmetric ? 1 : 2);
    this.layout = layout;
    this.factors = new Float64Array(layout.factorSize);
    this.front = new Float64Array(layout.frontSize);
    this.stack = new Float64Array(Math.max(1, layout.stackSize));
    this.stackOff = new Int32Array(sym.nsuper);
    this.floors = new Float64Array(A.n);
    this.floorLocal = new Float64Array(layout.maxCols);
    this.work = new Float64Array(A.n);
    this.tmp = new Float64Array(layout.maxRows);
  }

  /** Assembles every front in postorder, lets `step` factor it and stacks its update matrix. */
  factorFronts(A: CsrMatrix, pivotTolerance: number, step: FrontStep): void {
    const sym = this.sym;
    if (A.n !== sym.n) throw new Error('factor(): pattern differs from analyse()');
    pivotFloors(A, this.diag, pivotTolerance, this.floors);
    const { nsuper, superStart, rowStart, childStart, children, relIdx, perm } = sym;
    const { aStart, aSrc, aDst } = this.amap;
    const lower = this.symmetric;
    const F = this.front;
    const U = this.stack;
    const Av = A.values;
    const stackOff = this.stackOff;
    const floors = this.floors;
    const floor = this.floorLocal;
    let sp = 0;
    for (let s = 0; s < nsuper; s++) {
      const f = superStart[s];
      const k = superStart[s + 1] - f;
      const r = rowStart[s + 1] - rowStart[s];
      const m = k + r;
      const ld = m + FRONT_PAD;
      // Only the part the dense kernels read is cleared: the lower triangle when symmetric.
      for (let j = 0; j < m; j++) F.fill(0, j * ld + (lower ? j : 0), j * ld + m);
      for (let t = aStart[s]; t < aStart[s + 1]; t++) F[aDst[t]] += Av[aSrc[t]];
      const c0 = childStart[s];
      const c1 = childStart[s + 1];
      for (let c = c0; c < c1; c++) {
        const ch = children[c];
        extendAdd(F, ld, U, stackOff[ch], relIdx, rowStart[ch], rowStart[ch + 1] - rowStart[ch], lower);
      }
      // The children's updates sit on top of the stack in order: popping them all frees from the first.
      if (c1 > c0) sp = stackOff[children[c0]];
      for (let j = 0; j < k; j++) floor[j] = floors[perm[f + j]];
      step(s, f, m, k, ld);
      stackOff[s] = sp;
      sp = pushUpdate(F, ld, m, k, U, sp, lower);
    }
  }

  /**
   * Forward sweep with the unit lower factor, y in the permuted order. With `piv` (LU) the rows
   * of each pivot block are first swapped as the factorisation swapped them.
   */
  forward(y: Float64Array, piv: Int32Array | null): void {
    const { nsuper, superStart, rowStart, rowIdx } = this.sym;
    const lOffset = this.layout.lOffset;
    const L = this.factors;
    const tmp = this.tmp;
    for (let s = 0; s < nsuper; s++) {
      const f = superStart[s];
      const k = superStart[s + 1] - f;
      const rb = rowStart[s];
      const r = rowStart[s + 1] - rb;
      const m = k + r;
      const o = lOffset[s];
      if (piv) swapPivotRows(y, piv, f, k);
      unitLowerSolve(L, o, m, k, y, f);
      if (r === 0) continue;
      tmp.fill(0, 0, r);
      gemvColumns(L, o + k, m, r, k, y, f, tmp);
      for (let i = 0; i < r; i++) y[rowIdx[rb + i]] -= tmp[i];
    }
  }
}

function swapPivotRows(y: Float64Array, piv: Int32Array, f: number, k: number): void {
  for (let j = 0; j < k; j++) {
    const p = piv[f + j];
    if (p !== j) {
      const t = y[f + j];
      y[f + j] = y[f + p];
      y[f + p] = t;
    }
  }
}

/**
 * F[rel[i], rel[j]] += U[i, j] for one child's update matrix: packed lower triangle by columns
 * when `lower`, full r×r column-major otherwise.
 */
function extendAdd(
  F: Float64Array,
  ld: number,
  U: Float64Array,
  uOff: number,
  rel: Int32Array,
  relOff: number,
  r: number,
  lower: boolean,
): void {
  let q = uOff;
  for (let j = 0; j < r; j++) {
    const col = rel[relOff + j] * ld;
    for (let i = lower ? j : 0; i < r; i++) F[rel[relOff + i] + col] += U[q++];
  }
}

/** Copies the update matrix F[k:m, k:m] onto the stack (lower triangle packed by columns when `lower`). */
function pushUpdate(
  F: Float64Array,
  ld: number,
  m: number,
  k: number,
  U: Float64Array,
  sp: number,
  lower: boolean,
): number {
  for (let j = k; j < m; j++) {
    const c = j * ld;
    for (let i = lower ? j : k; i < m; i++) U[sp++] = F[c + i];
  }
  return sp;
}
