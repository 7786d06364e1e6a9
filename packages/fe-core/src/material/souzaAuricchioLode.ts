/**
 * Lode-angle (J₃) equivalent transformation strain for the Souza–Auricchio model with
 * tension–compression asymmetry.
 *
 * Form: the deviatoric shape function of Bigoni & Piccolroaz (2004, Int. J. Solids Struct.
 * 41:2855–2878), applied to the deviatoric transformation strain e:
 *   g(e) = ‖e‖ · K(ξ),  K(ξ) = cos[βπ/6 − ⅓ arccos(γ ξ)] / k_t,  ξ = cos 3θ = 3√6 J₃(e)/‖e‖³,
 * with ξ = +1 for uniaxial tension and −1 for uniaxial compression. For 0 ≤ β ≤ 2 and
 * 0 ≤ γ < 1 the level sets are convex and smooth (Bigoni & Piccolroaz 2004), so g is a convex,
 * positively homogeneous gauge. k_t = cos[βπ/6 − ⅓ arccos γ] normalises g to ‖e‖ in uniaxial
 * tension, and r = K(−1) is the compression factor. The user gives r (tc_ratio) and γ
 * (lode_shape); β follows from r.
 *
 * Also here: the proximal map of λ[τ g + ½h g² + I(g ≤ ε_L)], computed in the deviatoric plane
 * of the argument's principal axes (the map of an isotropic convex function keeps the
 * eigenvectors), and the first and second derivatives of g in Kelvin–Mandel form.
 */

const SQ2 = Math.SQRT2;
/** First step of the local angle search: from a warm angle (small moves) or from v's angle. */
const WARM_STEP = 1e-3;
const COLD_STEP = Math.PI / 48;
const SQ6 = Math.sqrt(6);

export interface LodeShape {
  /** β π/6 of Bigoni–Piccolroaz. */
  A: number;
  gamma: number;
  /** Normalisation cos[A − ⅓ arccos γ] (value in uniaxial tension before scaling). */
  kt: number;
  /** Smallest K over all Lode angles (bounds ‖e‖ ≤ ε_L / kMin). */
  kMin: number;
}

/** Compression/tension factor K(−1)/K(1) for a given A and γ. */
function ratioFor(A: number, gamma: number): number {
  const a = Math.acos(gamma);
  return Math.cos(A - (Math.PI - a) / 3) / Math.cos(A - a / 3);
}

/** Ratios reachable with shape γ (β from 0 to 2). */
export function lodeRatioRange(gamma: number): [number, number] {
  return [ratioFor(0, gamma), ratioFor(Math.PI / 3, gamma)];
}

/** Builds the shape from the compression factor r and γ; null when r is out of reach. */
export function lodeShape(ratio: number, gamma: number): LodeShape | null {
  const [lo, hi] = lodeRatioRange(gamma);
  if (!(ratio >= lo * (1 - 1e-12) && ratio <= hi * (1 + 1e-12))) return null;
  // ratioFor grows with A on [0, π/3]: bisection
  let a = 0;
  let b = Math.PI / 3;
  for (let k = 0; k < 200 && b - a > 1e-16; k++) {
    const m = 0.5 * (a + b);
    if (ratioFor(m, gamma) < ratio) a = m;
    else b = m;
  }
  const A = 0.5 * (a + b);
  const kt = Math.cos(A - Math.acos(gamma) / 3);
  const shape: LodeShape = { A, gamma, kt, kMin: 1 };
  let kMin = Infinity;
  for (let i = 0; i <= 720; i++) kMin = Math.min(kMin, lodeK(shape, Math.cos((3 * Math.PI * i) / 720)).K);
  shape.kMin = kMin;
  return shape;
}

/** K(ξ) and its first two derivatives. */
export function lodeK(s: LodeShape, xi: number): { K: number; K1: number; K2: number } {
  const gx = Math.max(-1, Math.min(1, s.gamma * xi));
  const root = Math.sqrt(Math.max(1 - gx * gx, 1e-300));
  const psi = s.A - Math.acos(gx) / 3;
  const d1 = s.gamma / (3 * root); // dψ/dξ
  const d2 = (s.gamma * s.gamma * s.gamma * xi) / (3 * root * root * root); // d²ψ/dξ²
  const c = Math.cos(psi);
  const sn = Math.sin(psi);
  return { K: c / s.kt, K1: (-sn * d1) / s.kt, K2: (-c * d1 * d1 - sn * d2) / s.kt };
}

// ---- Kelvin–Mandel ↔ 3×3 (row-major 9) ----
export function kmToMat(v: ArrayLike<number>, m: Float64Array): void {
  m[0] = v[0];
  m[4] = v[1];
  m[8] = v[2];
  m[5] = m[7] = v[3] / SQ2;
  m[2] = m[6] = v[4] / SQ2;
  m[1] = m[3] = v[5] / SQ2;
}

export function matToKm(m: ArrayLike<number>, v: Float64Array): void {
  v[0] = m[0];
  v[1] = m[4];
  v[2] = m[8];
  v[3] = SQ2 * 0.5 * (m[5] + m[7]);
  v[4] = SQ2 * 0.5 * (m[2] + m[6]);
  v[5] = SQ2 * 0.5 * (m[1] + m[3]);
}

/** Symmetric 3×3 eigen-decomposition by cyclic Jacobi rotations: a is destroyed, columns of V. */
export function eigenSym3(a: Float64Array, d: Float64Array, V: Float64Array): void {
  V.fill(0);
  V[0] = V[4] = V[8] = 1;
  for (let sweep = 0; sweep < 60; sweep++) {
    const off = a[1] * a[1] + a[2] * a[2] + a[5] * a[5];
    const diag = a[0] * a[0] + a[4] * a[4] + a[8] * a[8];
    if (off <= 1e-34 * diag || off === 0) break;
    // The pairs are spelled out (not a list of pairs) so a sweep allocates nothing.
    jacobiRotate(a, V, 0, 1);
    jacobiRotate(a, V, 0, 2);
    jacobiRotate(a, V, 1, 2);
  }
  d[0] = a[0];
  d[1] = a[4];
  d[2] = a[8];
}

/** One Jacobi rotation that zeroes a[p][q] (p < q), accumulated into V. */
function jacobiRotate(a: Float64Array, V: Float64Array, p: number, q: number): void {
  const apq = a[p * 3 + q];
  if (apq === 0) return;
  const theta = (a[q * 3 + q] - a[p * 3 + p]) / (2 * apq);
  const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
  const c = 1 / Math.sqrt(t * t + 1);
  const s = t * c;
  for (let k = 0; k < 3; k++) {
    const akp = a[k * 3 + p];
    const akq = a[k * 3 + q];
    a[k * 3 + p] = c * akp - s * akq;
    a[k * 3 + q] = s * akp + c * akq;
  }
  for (let k = 0; k < 3; k++) {
    const apk = a[p * 3 + k];
    const aqk = a[q * 3 + k];
    a[p * 3 + k] = c * apk - s * aqk;
    a[q * 3 + k] = s * apk + c * aqk;
  }
  for (let k = 0; k < 3; k++) {
    const vkp = V[k * 3 + p];
    const vkq = V[k * 3 + q];
    V[k * 3 + p] = c * vkp - s * vkq;
    V[k * 3 + q] = s * vkp + c * vkq;
  }
}

/**
 * Solver and derivatives for one shape; scratch buffers are owned so the update path does not
 * allocate.
 */
export class LodeGauge {
  private readonly m3 = new Float64Array(9);
  private readonly V = new Float64Array(9);
  private readonly d = new Float64Array(3);
  private readonly t6 = new Float64Array(6);
  private readonly b3 = new Float64Array(9);
  private readonly c3 = new Float64Array(9);
  private readonly c6 = new Float64Array(6);
  private readonly dxi = new Float64Array(6);
  private readonly T = new Float64Array(36);
  /** ‖v − e‖ from the last prox (the multiplier sum κ follows from it). */
  lastGap = 0;

  /** dk/dφ of the last kAt() call. */
  private kPhi = 0;
  // The angle search of prox() reads its data from these fields rather than from closures made
  // per call: it runs tens of times per update and closures cost an allocation each.
  /** Which objective the angle search maximises: 0 the free branch M, 1 the surface g = ε_L. */
  private branch: 0 | 1 = 0;
  private rv = 0;
  private pv = 0;
  private lt = 0;
  private lh = 0;
  private epsL = 0;

  constructor(readonly shape: LodeShape) {}

  /**
   * k(φ) = K(cos 3φ); also leaves dk/dφ in kPhi. The arithmetic is lodeK's (K and K1 only),
   * written out so the hot angle search builds no result object.
   */
  private kAt(phi: number): number {
    const s = this.shape;
    const gx = Math.max(-1, Math.min(1, s.gamma * Math.cos(3 * phi)));
    const root = Math.sqrt(Math.max(1 - gx * gx, 1e-300));
    const psi = s.A - Math.acos(gx) / 3;
    const d1 = s.gamma / (3 * root);
    const K1 = (-Math.sin(psi) * d1) / s.kt;
    this.kPhi = K1 * -3 * Math.sin(3 * phi);
    return Math.cos(psi) / s.kt;
  }

  /** k(φ) alone, as kAt() computes it: the objective needs no derivative, so skip its sines. */
  private kValue(phi: number): number {
    const s = this.shape;
    const gx = Math.max(-1, Math.min(1, s.gamma * Math.cos(3 * phi)));
    return Math.cos(s.A - Math.acos(gx) / 3) / s.kt;
  }

  /** Value of g for a deviatoric KM vector. */
  value(e: ArrayLike<number>): number {
    let rr = 0;
    for (let i = 0; i < 6; i++) rr += e[i] * e[i];
    const rho = Math.sqrt(rr);
    if (rho === 0) return 0;
    return rho * lodeK(this.shape, this.xi(e, rho)).K;
  }

  private xi(e: ArrayLike<number>, rho: number): number {
    kmToMat(e, this.m3);
    const m = this.m3;
    const det = m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
    return Math.max(-1, Math.min(1, (3 * SQ6 * det) / (rho * rho * rho)));
  }

  /**
   * Gradient (into grad) and, when hess is given, Hessian of g restricted to deviatoric
   * directions, at a deviatoric e ≠ 0.
   */
  derivatives(e: ArrayLike<number>, grad: Float64Array, hess?: Float64Array): number {
    let rr = 0;
    for (let i = 0; i < 6; i++) rr += e[i] * e[i];
    const rho = Math.sqrt(rr);
    const xi = this.xi(e, rho);
    const { K, K1, K2 } = lodeK(this.shape, xi);
    // t = dev(e·e) = ∂J₃/∂e; J₃ = ξρ³/(3√6)
    const m = this.m3;
    const b = this.b3;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        let s = 0;
        for (let k = 0; k < 3; k++) s += m[i * 3 + k] * m[k * 3 + j];
        b[i * 3 + j] = s;
      }
    }
    const tr = (b[0] + b[4] + b[8]) / 3;
    b[0] -= tr;
    b[4] -= tr;
    b[8] -= tr;
    const t = this.t6;
    matToKm(b, t);
    const J3 = (xi * rho * rho * rho) / (3 * SQ6);
    const c = 3 * SQ6;
    const r3 = rho * rho * rho;
    const r5 = r3 * rho * rho;
    const dxi = this.dxi;
    for (let i = 0; i < 6; i++) dxi[i] = c * (t[i] / r3 - (3 * J3 * e[i]) / r5);
    for (let i = 0; i < 6; i++) grad[i] = (K * e[i]) / rho + rho * K1 * dxi[i];
    const g = rho * K;
    if (!hess) return g;
    // ∂t/∂e: de ↦ dev(e·de + de·e), built column by column on the KM basis
    const T = this.T;
    const unit = this.c6;
    const D = this.c3;
    for (let j = 0; j < 6; j++) {
      unit.fill(0);
      unit[j] = 1;
      kmToMat(unit, D);
      for (let p = 0; p < 3; p++) {
        for (let q = 0; q < 3; q++) {
          let s = 0;
          for (let k = 0; k < 3; k++) s += m[p * 3 + k] * D[k * 3 + q] + D[p * 3 + k] * m[k * 3 + q];
          b[p * 3 + q] = s;
        }
      }
      const tb = (b[0] + b[4] + b[8]) / 3;
      b[0] -= tb;
      b[4] -= tb;
      b[8] -= tb;
      matToKm(b, unit);
      for (let i = 0; i < 6; i++) T[i * 6 + j] = unit[i];
    }
    const r7 = r5 * rho * rho;
    for (let i = 0; i < 6; i++) {
      for (let j = 0; j < 6; j++) {
        const id = (i === j ? 1 : 0) - (i < 3 && j < 3 ? 1 / 3 : 0);
        const d2xi =
          c * (T[i * 6 + j] / r3 - (3 * (t[i] * e[j] + e[i] * t[j])) / r5 - (3 * J3 * id) / r5 + (15 * J3 * e[i] * e[j]) / r7);
        hess[i * 6 + j] =
          (K * (id - (e[i] * e[j]) / rr)) / rho +
          (K1 * (e[i] * dxi[j] + dxi[i] * e[j])) / rho +
          rho * K2 * dxi[i] * dxi[j] +
          rho * K1 * d2xi;
      }
    }
    // restrict to deviatoric directions: P H P
    for (let i = 0; i < 6; i++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += hess[k * 6 + i];
      for (let k = 0; k < 3; k++) hess[k * 6 + i] -= s / 3;
    }
    for (let i = 0; i < 6; i++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += hess[i * 6 + k];
      for (let k = 0; k < 3; k++) hess[i * 6 + k] -= s / 3;
    }
    return g;
  }

  /**
   * e = argmin ½‖e − v‖² + λτ g(e) + ½λh g(e)² subject to g(e) ≤ epsL (epsL = ∞ for none),
   * for a deviatoric KM vector v. Returns the regime: 0 (e = 0), 1 (free), 2 (on g = epsL).
   *
   * `warm` (optional, two angles, NaN for none) holds where the free and the surface optimum lay
   * relative to v's own angle in the caller's previous call; the search starts there and writes
   * this call's offsets back. A caller that solves for one update passes the same array to every
   * call of that update and clears it before the next update, so results never depend on other
   * integration points.
   */
  prox(v: ArrayLike<number>, lam: number, tau: number, h: number, epsL: number, e: Float64Array, warm?: Float64Array): 0 | 1 | 2 {
    const lt = lam * tau;
    let vv = 0;
    for (let i = 0; i < 6; i++) vv += v[i] * v[i];
    if (Math.sqrt(vv) < lt * this.shape.kMin * (1 - 1e-9)) {
      // v lies inside λτB° with room to spare (c ≤ ρ_v = ‖v‖ < λτ k for every φ): e = 0
      // without any search, the answer the search gives too; the margin covers the round-off
      // between ‖v‖ and the principal-plane radius ρ_v.
      e.fill(0);
      this.lastGap = Math.sqrt(vv);
      return 0;
    }
    kmToMat(v, this.m3);
    eigenSym3(this.m3, this.d, this.V);
    const d = this.d;
    const x = (2 * d[0] - d[1] - d[2]) / SQ6;
    const y = (d[1] - d[2]) / SQ2;
    const rv = Math.hypot(x, y);
    const pv = Math.atan2(y, x);
    const lh = lam * h;
    this.rv = rv;
    this.pv = pv;
    this.lt = lt;
    this.lh = lh;
    this.epsL = epsL;
    // free branch: maximise M(φ) = (c − λτk)/√(1 + λh k²), c = ρ_v cos(φ − φ_v)
    this.branch = 0;
    let phi = this.search(pv, warm);
    let k = this.kAt(phi);
    const top = rv * Math.cos(phi - pv) - lt * k;
    let regime: 0 | 1 | 2 = 1;
    let rho: number;
    if (!(top > 0)) {
      rho = 0;
      regime = 0;
    } else {
      rho = top / (1 + lh * k * k);
      if (rho * k > epsL) {
        // on the surface g = ε_L: maximise Q(φ) = c/k − ε_L/(2k²)
        this.branch = 1;
        phi = this.search(pv, warm);
        k = this.kAt(phi);
        rho = epsL / k;
        regime = 2;
      }
    }
    const ex = rho * Math.cos(phi);
    const ey = rho * Math.sin(phi);
    const p0 = (2 * ex) / SQ6;
    const p1 = -ex / SQ6 + ey / SQ2;
    const p2 = -ex / SQ6 - ey / SQ2;
    const V = this.V;
    const b = this.b3;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) b[i * 3 + j] = p0 * V[i * 3] * V[j * 3] + p1 * V[i * 3 + 1] * V[j * 3 + 1] + p2 * V[i * 3 + 2] * V[j * 3 + 2];
    }
    matToKm(b, e);
    let gap = 0;
    for (let i = 0; i < 6; i++) gap += (v[i] - e[i]) ** 2;
    this.lastGap = Math.sqrt(gap);
    return regime;
  }

  /**
   * Optimum of the current branch near `start`: first a local search from the warm angle (or
   * from `start`), accepted only when the optimality certificate holds, else the full sampled
   * search. Both end on the same bracketed root, so they agree to its tolerance.
   */
  private search(start: number, warm: Float64Array | undefined): number {
    const slot = this.branch;
    const offset = warm && warm[slot] === warm[slot] ? warm[slot] : 0;
    let phi = this.climb(start, offset, warm ? WARM_STEP : COLD_STEP);
    if (!(phi === phi && this.certified(phi))) phi = this.maximise(start);
    if (warm) warm[slot] = phi - start;
    return phi;
  }

  /**
   * Whether a stationary angle is the global optimum. The objective is convex in e, so a
   * stationary point of it is the minimiser; the angle search is stationary in φ, and these
   * tests add what makes it stationary in e: on the free branch a positive radius (top > 0;
   * the radius is optimal by construction), on the surface v − e pointing out of {g ≤ ε_L}
   * (then e is v's projection onto that convex set, the global maximum of Q).
   */
  private certified(phi: number): boolean {
    const rv = this.rv;
    const pv = this.pv;
    const k = this.kAt(phi);
    const c = rv * Math.cos(phi - pv);
    if (this.branch === 0) return c - this.lt * k > 0;
    // (v − e)·∇g with e = (ε_L/k) e_r and ∇g = k e_r + k′ e_φ in the principal plane
    return k * (c - this.epsL / k) + this.kPhi * rv * Math.sin(pv - phi) > 0;
  }

  /**
   * Local maximiser from start + offset: steps uphill with doubling steps until the slope changes
   * sign, then the same Illinois iteration and tolerance as maximise(). NaN when no bracket
   * turns up within the sampled window of maximise().
   */
  private climb(start: number, offset: number, first: number): number {
    const reach = Math.PI / 3 + Math.PI / 24;
    let near = start + Math.max(-reach, Math.min(reach, offset));
    let sNear = this.slope(near);
    if (sNear === 0) return near;
    const dir = sNear > 0 ? 1 : -1;
    let w = first;
    for (;;) {
      const far = near + dir * w;
      if (Math.abs(far - start) > reach) return NaN;
      const sFar = this.slope(far);
      if (sFar === 0) return far;
      if (sFar > 0 !== sNear > 0) return dir > 0 ? this.illinois(near, sNear, far, sFar) : this.illinois(far, sFar, near, sNear);
      near = far; // still uphill: the bracket's near end moves along
      sNear = sFar;
      w *= 2;
    }
  }

  /** The objective of the current branch at φ: M(φ) or Q(φ) (see prox). */
  private objective(phi: number): number {
    const rv = this.rv;
    const pv = this.pv;
    if (this.branch === 0) {
      const k = this.kValue(phi);
      return (rv * Math.cos(phi - pv) - this.lt * k) / Math.sqrt(1 + this.lh * k * k);
    }
    const kk = this.kValue(phi);
    return (rv * Math.cos(phi - pv)) / kk - this.epsL / (2 * kk * kk);
  }

  /** A positive multiple of the objective's derivative at φ (same sign, same root). */
  private slope(phi: number): number {
    const rv = this.rv;
    const pv = this.pv;
    if (this.branch === 0) {
      const lt = this.lt;
      const lh = this.lh;
      const k = this.kAt(phi);
      const k1 = this.kPhi;
      const cc = rv * Math.cos(phi - pv);
      const c1 = -rv * Math.sin(phi - pv);
      return (c1 - lt * k1) * (1 + lh * k * k) - (cc - lt * k) * lh * k * k1;
    }
    const kk = this.kAt(phi);
    const k1 = this.kPhi;
    return -rv * Math.sin(phi - pv) * kk - rv * Math.cos(phi - pv) * k1 + (this.epsL * k1) / kk;
  }

  /**
   * Maximiser of the current branch's objective over the Lode angle. The proximal map of an
   * isotropic convex function keeps the order of the eigenvalues, so the optimum lies within π/3
   * of the argument's angle `start`: best of 17 samples there, then the root of the slope next
   * to it.
   */
  private maximise(start: number): number {
    const n = 8;
    const step = Math.PI / 3 / n;
    let best = start;
    let fb = this.objective(start);
    for (let i = -n; i <= n; i++) {
      if (i === 0) continue;
      const p = start + i * step;
      const v = this.objective(p);
      if (v > fb) {
        fb = v;
        best = p;
      }
    }
    let a = best - step;
    let b = best + step;
    let fa = this.slope(a);
    let fbd = this.slope(b);
    if (!(fa > 0 && fbd < 0)) {
      // maximum sits on a sample (slope ≈ 0 there) or the bracket is unusual: keep the sample
      const d0 = this.slope(best);
      if (d0 === 0) return best;
      if (d0 > 0) {
        a = best;
        fa = d0;
      } else {
        b = best;
        fbd = d0;
      }
      if (!(fa > 0 && fbd < 0)) return best;
    }
    return this.illinois(a, fa, b, fbd);
  }

  /** Bracketed secant (Illinois) for the root of the slope in [a, b], slope(a) > 0 > slope(b). */
  private illinois(a: number, fa: number, b: number, fbd: number): number {
    let side = 0;
    for (let it = 0; it < 200; it++) {
      let c = (a * fbd - b * fa) / (fbd - fa);
      if (!(c > a && c < b)) c = 0.5 * (a + b);
      const fc = this.slope(c);
      if (fc === 0 || b - a <= 1e-15 * Math.max(1, Math.abs(c))) return c;
      if (fc > 0) {
        a = c;
        fa = fc;
        if (side === 1) fbd *= 0.5;
        side = 1;
      } else {
        b = c;
        fbd = fc;
        if (side === -1) fa *= 0.5;
        side = -1;
      }
    }
    return 0.5 * (a + b);
  }
}
