/**
 * Small dense LU with partial pivoting for element-level work (EAS condensation, test helpers).
 * In place, no allocation: `a` is n×n row-major, `piv` receives the row permutation.
 */

/** Factorises a in place; returns false when a pivot is (numerically) zero. */
export function luFactor(n: number, a: Float64Array, piv: Int32Array): boolean {
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(a[i]));
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(a[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(a[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    piv[k] = p;
    if (!(best > 1e-300 && best > 1e-14 * scale)) return false;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = a[k * n + j];
        a[k * n + j] = a[p * n + j];
        a[p * n + j] = t;
      }
    }
    const inv = 1 / a[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = (a[i * n + k] *= inv);
      if (f !== 0) for (let j = k + 1; j < n; j++) a[i * n + j] -= f * a[k * n + j];
    }
  }
  return true;
}

/** Solves with the factors of luFactor; b is overwritten by the solution. */
export function luSolve(n: number, lu: Float64Array, piv: Int32Array, b: Float64Array, offset = 0, stride = 1): void {
  for (let k = 0; k < n; k++) {
    const p = piv[k];
    if (p !== k) {
      const t = b[offset + k * stride];
      b[offset + k * stride] = b[offset + p * stride];
      b[offset + p * stride] = t;
    }
  }
  for (let i = 1; i < n; i++) {
    let s = b[offset + i * stride];
    for (let j = 0; j < i; j++) s -= lu[i * n + j] * b[offset + j * stride];
    b[offset + i * stride] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[offset + i * stride];
    for (let j = i + 1; j < n; j++) s -= lu[i * n + j] * b[offset + j * stride];
    b[offset + i * stride] = s / lu[i * n + i];
  }
}
