/**
 * Dense kernels on column-major Float64Array blocks for the multifrontal factorisations.
 *
 * Our own code: npm sparse solvers run 70–300× slower than CHOLMOD (anchors.md), mostly because
 * their inner loops are scalar. Here the Schur-complement update, which carries nearly all flops,
 * runs on operands packed into 4-wide panels so a 4×4 register block streams two contiguous arrays
 * (≈5 GFLOPS in V8 on this machine, against ≈1.8 for a plain triple loop). Fronts are padded by
 * FRONT_PAD rows and columns and panels are zero-padded, so full 4×4 blocks may be written at the
 * edges: the padded positions receive −0 and are never read.
 */

/**
 * Packs the nr×kc block src[off + i + p·ld] into 4-row panels:
 * dst[(i>>2)·4kc + 4p + (i&3)], rows nr..⌈nr/4⌉·4−1 zero. Column p is multiplied by scale[p]
 * when scale is given (D of LDLᵀ).
 */
export function packRows(
  src: Float64Array,
  off: number,
  ld: number,
  nr: number,
  kc: number,
  dst: Float64Array,
  scale: Float64Array | null,
): void {
  const full = nr & ~3;
  let o = 0;
  for (let i = 0; i < full; i += 4) {
    let s = off + i;
    for (let p = 0; p < kc; p++) {
      const f = scale === null ? 1 : scale[p];
      dst[o] = src[s] * f;
      dst[o + 1] = src[s + 1] * f;
      dst[o + 2] = src[s + 2] * f;
      dst[o + 3] = src[s + 3] * f;
      o += 4;
      s += ld;
    }
  }
  // The ragged last panel is written out apart on purpose: a shared loop would put the zero-padding test in the hot 4-row body.
  if (full < nr) {
    const rem = nr - full;
    let s = off + full;
    for (let p = 0; p < kc; p++) {
      const f = scale === null ? 1 : scale[p];
      for (let q = 0; q < 4; q++) dst[o + q] = q < rem ? src[s + q] * f : 0;
      o += 4;
      s += ld;
    }
  }
}

/**
 * Packs the kc×nc block src[off + p + j·ld] by columns into 4-column panels:
 * dst[(j>>2)·4kc + 4p + (j&3)]. Used for the U rows of LU, whose update is A·B with B row-wise.
 */
export function packCols(
  src: Float64Array,
  off: number,
  ld: number,
  nc: number,
  kc: number,
  dst: Float64Array,
): void {
  let o = 0;
  for (let j = 0; j < nc; j += 4) {
    const c0 = off + j * ld;
    const rem = Math.min(4, nc - j);
    for (let p = 0; p < kc; p++) {
      for (let q = 0; q < 4; q++) dst[o + q] = q < rem ? src[c0 + q * ld + p] : 0;
      o += 4;
    }
  }
}

/** C[0..3, 0..3] −= A_panel · B_panelᵀ over kc terms (C column-major with leading dimension ldc). */
export function kernel4x4(
  A: Float64Array,
  ao: number,
  B: Float64Array,
  bo: number,
  kc: number,
  C: Float64Array,
  co: number,
  ldc: number,
): void {
  let c00 = 0, c10 = 0, c20 = 0, c30 = 0;
  let c01 = 0, c11 = 0, c21 = 0, c31 = 0;
  let c02 = 0, c12 = 0, c22 = 0, c32 = 0;
  let c03 = 0, c13 = 0, c23 = 0, c33 = 0;
  const end = ao + 4 * kc;
  while (ao < end) {
    const a0 = A[ao], a1 = A[ao + 1], a2 = A[ao + 2], a3 = A[ao + 3];
    const b0 = B[bo], b1 = B[bo + 1], b2 = B[bo + 2], b3 = B[bo + 3];
    c00 += a0 * b0; c10 += a1 * b0; c20 += a2 * b0; c30 += a3 * b0;
    c01 += a0 * b1; c11 += a1 * b1; c21 += a2 * b1; c31 += a3 * b1;
    c02 += a0 * b2; c12 += a1 * b2; c22 += a2 * b2; c32 += a3 * b2;
    c03 += a0 * b3; c13 += a1 * b3; c23 += a2 * b3; c33 += a3 * b3;
    ao += 4;
    bo += 4;
  }
  C[co] -= c00; C[co + 1] -= c10; C[co + 2] -= c20; C[co + 3] -= c30;
  co += ldc;
  C[co] -= c01; C[co + 1] -= c11; C[co + 2] -= c21; C[co + 3] -= c31;
  co += ldc;
  C[co] -= c02; C[co + 1] -= c12; C[co + 2] -= c22; C[co + 3] -= c32;
  co += ldc;
  C[co] -= c03; C[co + 1] -= c13; C[co + 2] -= c23; C[co + 3] -= c33;
}

/** Rows of packed A kept hot per pass (≈ ROWS_L2·kc·8 bytes ≤ L2). */
const ROWS_L2 = 256;

/**
 * C (nr×nc at co, leading dimension ldc) −= A·B over kc terms, A packed by packRows (nr rows) and
 * B by packRows or packCols (nc columns), in 4×4 tiles. With `lowerOnly` (nr = nc, symmetric
 * update) only the tiles on or below the diagonal are computed; those straddling it are computed
 * whole and their strict upper part is scratch.
 */
export function gemmPacked(
  Ap: Float64Array,
  nr: number,
  Bp: Float64Array,
  nc: number,
  kc: number,
  C: Float64Array,
  co: number,
  ldc: number,
  lowerOnly: boolean,
): void {
  const stride = 4 * kc;
  // Rows in blocks of ROWS_L2 so the A panels in use stay in L2 while every B panel passes.
  for (let i0 = 0; i0 < nr; i0 += ROWS_L2) {
    const i1 = Math.min(i0 + ROWS_L2, nr);
    const jEnd = lowerOnly ? Math.min(i1, nc) : nc;
    for (let j = 0; j < jEnd; j += 4) {
      const bo = (j >> 2) * stride;
      const cj = co + j * ldc;
      const iStart = lowerOnly && j > i0 ? j : i0;
      for (let i = iStart; i < i1; i += 4) kernel4x4(Ap, (i >> 2) * stride, Bp, bo, kc, C, cj + i, ldc);
    }
  }
}

/** Scratch buffers for packing; grown on demand and kept across fronts. */
export class PackBuffers {
  a = new Float64Array(0);
  b = new Float64Array(0);
  private d = new Float64Array(64);

  /** Scratch for D of a column block. */
  diag(kc: number): Float64Array {
    if (this.d.length < kc) this.d = new Float64Array(kc);
    return this.d;
  }

  ensure(rows: number, kc: number): void {
    const need = (((rows + 3) >> 2) << 2) * kc;
    if (this.a.length < need) {
      this.a = new Float64Array(need * 1.25 + 64);
      this.b = new Float64Array(need * 1.25 + 64);
    }
  }
}

/**
 * Partial LDLᵀ of a front: eliminates its first k of m columns in place (lower triangle,
 * column-major, leading dimension ld). Afterwards F[j,j] = d_j and F[i,j] = l_ij for j < k, and
 * F[k:m, k:m] holds the Schur complement (the update matrix). Returns the local index of the first
 * pivot with |d_j| ≤ floor[j] (or not finite), or −1.
 *
 * Columns are taken in blocks of up to BLOCK: each block is factored recursively (halves, the
 * left half updating the right one through the packed 4×4 kernel) and then updates the trailing
 * matrix in one rank-BLOCK pass, so nearly all flops run in kernel4x4.
 */
export function ldltFront(
  F: Float64Array,
  ld: number,
  m: number,
  k: number,
  floor: Float64Array,
  buf: PackBuffers,
): number {
  for (let p0 = 0; p0 < k; p0 += BLOCK) {
    const p1 = Math.min(p0 + BLOCK, k);
    const bad = ldltRecursive(F, ld, m, p0, p1, floor, buf);
    if (bad >= 0) return bad;
    if (m > p1) ldltUpdate(F, ld, m, p0, p1, m, true, buf);
  }
  return -1;
}

/** Columns per trailing-update pass of ldltFront (the kernel's inner dimension stays ≤ BLOCK). */
export const BLOCK = 192;
/** Below this width a column block is factored without the packed kernel. */
const LEAF = 8;

/** LDLᵀ of columns a..b-1 (all rows below), which already carry every update from columns < a. */
function ldltRecursive(
  F: Float64Array,
  ld: number,
  m: number,
  a: number,
  b: number,
  floor: Float64Array,
  buf: PackBuffers,
): number {
  if (b - a <= LEAF) return ldltPanel(F, ld, m, a, b, floor);
  const mid = a + Math.max(4, ((b - a) >> 1) & ~3); // a multiple of 4 past a, LEAF ≥ 4 keeps it below b
  const bad = ldltRecursive(F, ld, m, a, mid, floor, buf);
  if (bad >= 0) return bad;
  ldltUpdate(F, ld, m, a, mid, b, false, buf);
  return ldltRecursive(F, ld, m, mid, b, floor, buf);
}

/**
 * After columns a..mid-1 are factored: columns mid..end-1, rows mid..m-1 −= L[mid:m, a:mid]·D·
 * L[mid:end, a:mid]ᵀ; `lowerOnly` for the whole trailing matrix (end = m), of which only the
 * lower triangle is kept.
 */
function ldltUpdate(
  F: Float64Array,
  ld: number,
  m: number,
  a: number,
  mid: number,
  end: number,
  lowerOnly: boolean,
  buf: PackBuffers,
): void {
  const kc = mid - a;
  const nr = m - mid;
  const nc = end - mid;
  const d = buf.diag(kc);
  for (let p = 0; p < kc; p++) d[p] = F[(a + p) * (ld + 1)];
  buf.ensure(nr, kc);
  const off = mid + a * ld;
  packRows(F, off, ld, nr, kc, buf.a, null);
  packRows(F, off, ld, nc, kc, buf.b, d);
  gemmPacked(buf.a, nr, buf.b, nc, kc, F, mid + mid * ld, ld, lowerOnly);
}

/**
 * LDLᵀ of columns p0..p1-1 (rows p0..m-1), updating only those columns: groups of four columns are
 * factored among themselves, then applied to the rest of the panel four at a time, so each pass
 * over a target column does four multiply-adds per load/store of it instead of one.
 */
function ldltPanel(F: Float64Array, ld: number, m: number, p0: number, p1: number, floor: Float64Array): number {
  for (let j0 = p0; j0 < p1; j0 += 4) {
    const j1 = Math.min(j0 + 4, p1);
    for (let j = j0; j < j1; j++) {
      const cj = j * ld;
      const d = F[cj + j];
      if (!(Math.abs(d) > floor[j])) return j;
      const inv = 1 / d;
      for (let i = j + 1; i < m; i++) F[cj + i] *= inv;
      rank1Columns(F, ld, m, j, d, j + 1, j1);
    }
    if (j1 < p1) {
      if (j1 - j0 === 4) rank4PanelUpdate(F, ld, m, j0, j1, p1);
      else
        for (let j = j0; j < j1; j++) rank1Columns(F, ld, m, j, F[j * ld + j], j1, p1);
    }
  }
  return -1;
}

/** Columns c0..c1-1 (rows from their diagonal down) −= L[:, j]·d_j·L[c, j]ᵀ (one factored column). */
function rank1Columns(F: Float64Array, ld: number, m: number, j: number, d: number, c0: number, c1: number): void {
  const cj = j * ld;
  for (let c = c0; c < c1; c++) {
    const t = F[cj + c] * d;
    if (t === 0) continue;
    const cc = c * ld;
    for (let i = c; i < m; i++) F[cc + i] -= F[cj + i] * t;
  }
}

/** Columns j1..p1-1 (rows from their diagonal down) −= L[:, j0..j0+3]·D·L[c, j0..j0+3]ᵀ. */
function rank4PanelUpdate(F: Float64Array, ld: number, m: number, j0: number, j1: number, p1: number): void {
  const a0 = j0 * ld;
  const a1 = a0 + ld;
  const a2 = a1 + ld;
  const a3 = a2 + ld;
  const d0 = F[a0 + j0];
  const d1 = F[a1 + j0 + 1];
  const d2 = F[a2 + j0 + 2];
  const d3 = F[a3 + j0 + 3];
  for (let c = j1; c < p1; c++) {
    const w0 = F[a0 + c] * d0;
    const w1 = F[a1 + c] * d1;
    const w2 = F[a2 + c] * d2;
    const w3 = F[a3 + c] * d3;
    const cc = c * ld;
    for (let i = c; i < m; i++) F[cc + i] -= F[a0 + i] * w0 + F[a1 + i] * w1 + F[a2 + i] * w2 + F[a3 + i] * w3;
  }
}

/** Outcome of a partial LU of one front. */
export interface LuFrontResult {
  /** Local index of a pivot column that vanished entirely (singular), or −1. */
  singular: number;
  /** Pivots replaced by ±√ε·scale because no usable pivot lay inside the supernode's rows. */
  perturbed: number;
}

/** Prefer the diagonal unless another candidate row is this much larger (keeps the symmetric-like order stable). */
export const LU_THRESHOLD = 0.1;

/**
 * Partial LU of a front with row pivoting restricted to the k pivot rows (the pattern stays the
 * symmetric one computed by the analysis). F is m×m column-major (leading dimension ld); after the
 * call F[0:k, 0:k] holds L11 (unit, strictly lower) and U11, F[k:m, 0:k] holds L21, F[0:k, k:m]
 * U12 and F[k:m, k:m] the Schur complement. piv[j] is the local row swapped with row j at step j.
 * A pivot column whose remaining entries all lie below floor[j] is reported as singular; a pivot
 * that is only tiny inside the block is replaced (static pivoting) and counted, and the caller's
 * iterative refinement recovers the accuracy.
 */
export function luFront(
  F: Float64Array,
  ld: number,
  m: number,
  k: number,
  piv: Int32Array,
  floor: Float64Array,
  perturbation: Float64Array,
  buf: PackBuffers,
  result: LuFrontResult,
): void {
  result.singular = -1;
  result.perturbed = 0;
  const ctx: LuContext = { F, ld, m, k, piv, floor, perturbation, buf, result };
  for (let p0 = 0; p0 < k; p0 += BLOCK) {
    const p1 = Math.min(p0 + BLOCK, k);
    if (!luRecursive(ctx, p0, p1)) return;
    const nr = m - p1;
    if (nr <= 0) continue;
    luBlockUpdate(ctx, p0, p1, m);
  }
}

interface LuContext {
  readonly F: Float64Array;
  readonly ld: number;
  readonly m: number;
  readonly k: number;
  readonly piv: Int32Array;
  readonly floor: Float64Array;
  readonly perturbation: Float64Array;
  readonly buf: PackBuffers;
  readonly result: LuFrontResult;
}

/** LU of columns a..b-1 (all rows below), which already carry every update from columns < a. */
function luRecursive(c: LuContext, a: number, b: number): boolean {
  if (b - a <= LEAF) {
    for (let j = a; j < b; j++) {
      if (!luPivotStep(c.F, c.ld, c.m, c.k, j, b, c.piv, c.floor, c.perturbation, c.result)) return false;
    }
    return true;
  }
  const mid = a + Math.max(4, ((b - a) >> 1) & ~3); // a multiple of 4 past a, LEAF ≥ 4 keeps it below b
  if (!luRecursive(c, a, mid)) return false;
  luBlockUpdate(c, a, mid, b);
  return luRecursive(c, mid, b);
}

/**
 * After columns a..mid-1 are factored: U rows a..mid-1 of columns mid..end-1 by forward
 * substitution with the unit lower block, then F[mid:m, mid:end] −= L[mid:m, a:mid]·U[a:mid, mid:end].
 */
function luBlockUpdate(c: LuContext, a: number, mid: number, end: number): void {
  const { F, ld, m, buf } = c;
  for (let col = mid; col < end; col++) {
    const cc = col * ld;
    for (let j = a; j < mid; j++) {
      const t = F[cc + j];
      if (t === 0) continue;
      const cj = j * ld;
      for (let i = j + 1; i < mid; i++) F[cc + i] -= F[cj + i] * t;
    }
  }
  const kc = mid - a;
  const nr = m - mid;
  const nc = end - mid;
  buf.ensure(Math.max(nr, nc), kc);
  packRows(F, mid + a * ld, ld, nr, kc, buf.a, null);
  packCols(F, a + mid * ld, ld, nc, kc, buf.b);
  gemmPacked(buf.a, nr, buf.b, nc, kc, F, mid + mid * ld, ld, false);
}

/** One column of the LU panel: pivot choice, row swap, scaling, update of the panel's later columns. */
function luPivotStep(
  F: Float64Array,
  ld: number,
  m: number,
  k: number,
  j: number,
  p1: number,
  piv: Int32Array,
  floor: Float64Array,
  perturbation: Float64Array,
  result: LuFrontResult,
): boolean {
  const cj = j * ld;
  let best = j;
  let bmax = Math.abs(F[cj + j]);
  for (let i = j + 1; i < k; i++) {
    const a = Math.abs(F[cj + i]);
    if (a > bmax) {
      bmax = a;
      best = i;
    }
  }
  const choose = Math.abs(F[cj + j]) >= LU_THRESHOLD * bmax ? j : best;
  piv[j] = choose;
  if (choose !== j) {
    for (let c = 0; c < m; c++) {
      const o = c * ld;
      const t = F[o + j];
      F[o + j] = F[o + choose];
      F[o + choose] = t;
    }
  }
  let pv = F[cj + j];
  if (!(Math.abs(pv) > floor[j])) {
    let colmax = 0;
    for (let i = j; i < m; i++) colmax = Math.max(colmax, Math.abs(F[cj + i]));
    if (!(colmax > floor[j])) {
      result.singular = j;
      return false;
    }
    pv = pv < 0 ? -perturbation[j] : perturbation[j];
    F[cj + j] = pv;
    result.perturbed++;
  }
  const inv = 1 / pv;
  for (let i = j + 1; i < m; i++) F[cj + i] *= inv;
  for (let c = j + 1; c < p1; c++) {
    const cc = c * ld;
    const t = F[cc + j];
    if (t === 0) continue;
    for (let i = j + 1; i < m; i++) F[cc + i] -= F[cj + i] * t;
  }
  return true;
}
