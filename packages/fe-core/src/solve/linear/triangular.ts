/**
 * Dense triangular solves and matrix–vector products on the column-major supernode blocks of the
 * multifrontal factors, shared by the forward and backward sweeps of LDLᵀ and LU.
 */

/** Solves L11 z = y[f..f+k) in place, L11 unit lower (column-major, leading dimension m). */
export function unitLowerSolve(L: Float64Array, o: number, m: number, k: number, y: Float64Array, f: number): void {
  for (let j = 0; j < k; j++) {
    const yj = y[f + j];
    if (yj === 0) continue;
    const c = o + j * m;
    for (let i = j + 1; i < k; i++) y[f + i] -= L[c + i] * yj;
  }
}

/** Solves L11ᵀ z = y[f..f+k) in place. */
export function unitLowerTransposedSolve(
  L: Float64Array,
  o: number,
  m: number,
  k: number,
  y: Float64Array,
  f: number,
): void {
  for (let j = k - 1; j >= 0; j--) {
    const c = o + j * m;
    let s = y[f + j];
    for (let i = j + 1; i < k; i++) s -= L[c + i] * y[f + i];
    y[f + j] = s;
  }
}

/** out[0..r) += B·y[f..f+k), B the r×k block at L[o] (leading dimension m); eight columns per pass. */
// The 8-, 2- and 1-column passes here and in gemvTransposed repeat on purpose: unrolled, they keep the sums in registers.
export function gemvColumns(
  L: Float64Array,
  o: number,
  m: number,
  r: number,
  k: number,
  y: Float64Array,
  f: number,
  out: Float64Array,
): void {
  let j = 0;
  for (; j + 7 < k; j += 8) {
    const y0 = y[f + j], y1 = y[f + j + 1], y2 = y[f + j + 2], y3 = y[f + j + 3];
    const y4 = y[f + j + 4], y5 = y[f + j + 5], y6 = y[f + j + 6], y7 = y[f + j + 7];
    const c0 = o + j * m, c1 = c0 + m, c2 = c1 + m, c3 = c2 + m;
    const c4 = c3 + m, c5 = c4 + m, c6 = c5 + m, c7 = c6 + m;
    for (let i = 0; i < r; i++) {
      out[i] +=
        L[c0 + i] * y0 + L[c1 + i] * y1 + L[c2 + i] * y2 + L[c3 + i] * y3 +
        L[c4 + i] * y4 + L[c5 + i] * y5 + L[c6 + i] * y6 + L[c7 + i] * y7;
    }
  }
  for (; j + 1 < k; j += 2) {
    const y0 = y[f + j], y1 = y[f + j + 1];
    const c0 = o + j * m, c1 = c0 + m;
    for (let i = 0; i < r; i++) out[i] += L[c0 + i] * y0 + L[c1 + i] * y1;
  }
  for (; j < k; j++) {
    const yj = y[f + j];
    const c = o + j * m;
    for (let i = 0; i < r; i++) out[i] += L[c + i] * yj;
  }
}

/** y[f+j] −= Σ_i B[i, j]·t[i] for the r×k block B at L[o]; eight columns per pass. */
export function gemvTransposed(
  L: Float64Array,
  o: number,
  m: number,
  r: number,
  k: number,
  t: Float64Array,
  y: Float64Array,
  f: number,
): void {
  let j = 0;
  for (; j + 7 < k; j += 8) {
    const c0 = o + j * m, c1 = c0 + m, c2 = c1 + m, c3 = c2 + m;
    const c4 = c3 + m, c5 = c4 + m, c6 = c5 + m, c7 = c6 + m;
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, s5 = 0, s6 = 0, s7 = 0;
    for (let i = 0; i < r; i++) {
      const ti = t[i];
      s0 += L[c0 + i] * ti;
      s1 += L[c1 + i] * ti;
      s2 += L[c2 + i] * ti;
      s3 += L[c3 + i] * ti;
      s4 += L[c4 + i] * ti;
      s5 += L[c5 + i] * ti;
      s6 += L[c6 + i] * ti;
      s7 += L[c7 + i] * ti;
    }
    y[f + j] -= s0;
    y[f + j + 1] -= s1;
    y[f + j + 2] -= s2;
    y[f + j + 3] -= s3;
    y[f + j + 4] -= s4;
    y[f + j + 5] -= s5;
    y[f + j + 6] -= s6;
    y[f + j + 7] -= s7;
  }
  for (; j + 1 < k; j += 2) {
    const c0 = o + j * m, c1 = c0 + m;
    let s0 = 0, s1 = 0;
    for (let i = 0; i < r; i++) {
      const ti = t[i];
      s0 += L[c0 + i] * ti;
      s1 += L[c1 + i] * ti;
    }
    y[f + j] -= s0;
    y[f + j + 1] -= s1;
  }
  for (; j < k; j++) {
    const c = o + j * m;
    let s = 0;
    for (let i = 0; i < r; i++) s += L[c + i] * t[i];
    y[f + j] -= s;
  }
}
