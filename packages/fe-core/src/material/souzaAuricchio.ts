/**
 * Transformation-strain SMA model of Souza, Mamiya & Zouain (1998) in the form of Auricchio &
 * Petrini (2002, 2004): 3D, small strain, isotropic elasticity (E, ν), thermal expansion α.
 *
 * State per point (6 doubles): the deviatoric transformation strain eᵗʳ (Kelvin–Mandel).
 * Driving force X = s − [τ(T) + h‖eᵗʳ‖ + γ] eᵗʳ/‖eᵗʳ‖, limit function F = ‖X‖ − R, flow
 * ėᵗʳ = ζ̇ X/‖X‖, constraint ‖eᵗʳ‖ ≤ ε_L (multiplier γ ≥ 0), τ(T) = β⟨T − T0⟩.
 * Uniaxially the largest transformation strain is √(2/3)·ε_L (ε_L bounds the tensor norm).
 *
 * Return map (backward Euler, exact cases, no regularisation of the norm):
 *  - elastic when the trial driving force lies inside the elastic domain (at saturation the
 *    best γ ≥ 0 is used);
 *  - otherwise the discrete equations reduce to one scalar equation in the increment Δζ:
 *    with λ = Δζ/(2GΔζ + R) the new eᵗʳ is parallel to v = eᵗʳ_n + λ s_trial and its norm is
 *    q = (‖v‖ − λτ)/(1 + λh), cut to [0, ε_L] — the cut at 0 is the complete reverse (the
 *    subgradient of the norm at the origin), the cut at ε_L the saturated case with
 *    γ = (‖v‖ − ε_L)/λ − τ − hε_L ≥ 0. Δζ then solves ‖eᵗʳ(Δζ) − eᵗʳ_n‖ = Δζ, found by a
 *    bracketed secant (Illinois) iteration; nucleation from eᵗʳ_n = 0 and reorientation under
 *    non-proportional loading are the same equation.
 *  - the consistent tangent comes from the linearisation of the full residual in (eᵗʳ, Δζ[, γ]).
 *
 * Tension–compression asymmetry (optional, parameters tc_ratio = r and lode_shape = γ): the norm
 * ‖eᵗʳ‖ in the free energy and in the constraint is replaced by the Lode-angle (J₃) gauge
 * g(eᵗʳ) = ‖eᵗʳ‖ K(cos 3θ) of Bigoni & Piccolroaz (2004) (souzaAuricchioLode.ts), normalised so
 * that g = ‖eᵗʳ‖ in uniaxial tension and g = r‖eᵗʳ‖ in uniaxial compression. Then
 *   X = s − [τ + h g + γ] ∂g(eᵗʳ),  F = ‖X‖ − R,  g(eᵗʳ) ≤ ε_L,
 * so the limit function depends on the third invariant through ∂g, and at eᵗʳ = 0 the elastic
 * domain is {dist(s, τ·B°) ≤ R} with B° the polar set of g. Uniaxial closed forms (magnitudes):
 *   tension:      start √(3/2)(R + τ),  saturation √(3/2)(R + τ + hε_L),  ε_max = √(2/3) ε_L;
 *   compression:  start √(3/2)(R + rτ), saturation √(3/2)(R + rτ + rhε_L), ε_max = √(2/3) ε_L / r;
 * reverse start/end √(3/2)(r(τ + hε_L) − R) / √(3/2)(rτ − R) (r = 1 in tension). So r is the ratio
 * of the maximum transformation strains tension/compression and of the Clausius–Clapeyron slopes
 * compression/tension; γ (0 ≤ γ < 1) sets how sharply the shape changes with the Lode angle and
 * how large r may be. r = 1, γ = 0 is the symmetric model (the exact scalar reduction above).
 * With asymmetry the same Δζ equation is solved; eᵗʳ(Δζ) is the proximal map of
 * λ[τ g + ½h g² + I(g ≤ ε_L)] at v (computed in the principal deviatoric plane of v), which
 * also covers nucleation and complete reverse (eᵗʳ = 0 when g°(v) ≤ λτ).
 */
import { LodeGauge, lodeRatioRange, lodeShape } from './souzaAuricchioLode';
import type { Material, MaterialPointInput, MaterialPointOutput, MaterialReport } from './types';

export interface SouzaAuricchioInput {
  E: number;
  nu: number;
  alpha: number;
  T_ref: number;
  h: number;
  beta: number;
  T0: number;
  R: number;
  eps_L: number;
  /** Ratio of the maximum uniaxial transformation strains tension/compression (1: symmetric). */
  tc_ratio?: number;
  /** Lode-angle shape γ of Bigoni–Piccolroaz, 0 ≤ γ < 1 (0: no Lode dependence). */
  lode_shape?: number;
  /** Former single asymmetry number: only 0 is accepted (use tc_ratio and lode_shape). */
  asymmetry?: number;
}

export interface SouzaAuricchioConstants extends SouzaAuricchioInput {
  G: number;
  K: number;
}

export type SouzaCheck = { ok: true; constants: SouzaAuricchioConstants } | { ok: false; field: string; message: string };

export function checkSouzaAuricchio(p: SouzaAuricchioInput): SouzaCheck {
  const fields = ['E', 'nu', 'alpha', 'T_ref', 'h', 'beta', 'T0', 'R', 'eps_L'] as const;
  for (const f of fields) {
    if (!Number.isFinite(p[f])) return { ok: false, field: f, message: `${f}: must be a finite number` };
  }
  for (const f of ['E', 'h', 'beta', 'R', 'eps_L'] as const) {
    if (!(p[f] > 0)) return { ok: false, field: f, message: `${f}: must be > 0` };
  }
  if (!(p.nu > -1 && p.nu < 0.5)) return { ok: false, field: 'nu', message: 'nu: must lie in (−1, 0.5)' };
  if ((p.asymmetry ?? 0) !== 0) {
    return { ok: false, field: 'asymmetry', message: 'asymmetry: replaced by tc_ratio (tension/compression ratio of the maximum transformation strain) and lode_shape (0 ≤ γ < 1); remove asymmetry or set it to 0' };
  }
  const ratio = p.tc_ratio ?? 1;
  const gamma = p.lode_shape ?? 0;
  if (!(Number.isFinite(gamma) && gamma >= 0 && gamma < 1)) return { ok: false, field: 'lode_shape', message: 'lode_shape: must lie in [0, 1)' };
  if (!(Number.isFinite(ratio) && ratio > 0)) return { ok: false, field: 'tc_ratio', message: 'tc_ratio: must be > 0' };
  if (!lodeShape(ratio, gamma)) {
    const [lo, hi] = lodeRatioRange(gamma);
    return { ok: false, field: 'tc_ratio', message: `tc_ratio: with lode_shape ${gamma} it must lie in [${lo.toPrecision(4)}, ${hi.toPrecision(4)}]; a larger lode_shape widens the range` };
  }
  const G = p.E / (2 * (1 + p.nu));
  const K = p.E / (3 * (1 - 2 * p.nu));
  return { ok: true, constants: { ...p, G, K } };
}

export const SOUZA_STATE_SIZE = 6;
const MAX_ITER = 200;
/** Deviatoric identity in Kelvin–Mandel form. */
function idev(i: number, j: number): number {
  return (i === j ? 1 : 0) - (i < 3 && j < 3 ? 1 / 3 : 0);
}

type Regime = 'elastic' | 'free' | 'saturated';

export class SouzaAuricchioMaterial implements Material<SouzaAuricchioConstants> {
  readonly model = 'souza-auricchio';
  readonly stateSize = SOUZA_STATE_SIZE;

  private readonly e = new Float64Array(6);
  private readonly etrN = new Float64Array(6);
  private readonly sTr = new Float64Array(6);
  private readonly etr = new Float64Array(6);
  private readonly v = new Float64Array(6);
  private readonly nDir = new Float64Array(6);
  private readonly nHat = new Float64Array(6);
  private readonly dX = new Float64Array(36);
  // Linear system for the tangent: up to 8 unknowns, 6 right-hand sides.
  private readonly jac = new Float64Array(64);
  private readonly rhs = new Float64Array(48);
  private tau = 0;
  private qReg: Regime = 'elastic';
  private qNorm = 0;
  private lambda = 0;
  private failure = '';

  /** Elastic stiffness K 1⊗1 + 2G I_dev, formed once. */
  private readonly elastic = new Float64Array(36);
  /** Lode-angle gauge when asymmetry is on; null for the symmetric model. */
  private readonly gauge: LodeGauge | null;
  private readonly grad = new Float64Array(6);
  private readonly hess = new Float64Array(36);
  /**
   * Where the gauge's angle searches ended in the previous trial of this update (free branch,
   * surface), relative to v's angle; the Δζ iteration moves v a little from trial to trial, so
   * the next search starts there. Cleared per update: no point's result depends on another's.
   */
  private readonly lodeWarm = new Float64Array(2);

  constructor(readonly params: SouzaAuricchioConstants) {
    const ratio = params.tc_ratio ?? 1;
    const gamma = params.lode_shape ?? 0;
    const shape = ratio === 1 && gamma === 0 ? null : lodeShape(ratio, gamma);
    this.gauge = shape ? new LodeGauge(shape) : null;
    for (let i = 0; i < 6; i++) {
      for (let j = 0; j < 6; j++) this.elastic[i * 6 + j] = (i < 3 && j < 3 ? params.K : 0) + 2 * params.G * idev(i, j);
    }
  }

  initState(state: Float64Array, offset: number): void {
    for (let i = 0; i < SOUZA_STATE_SIZE; i++) state[offset + i] = 0;
  }

  report(state: Float64Array, offset: number, out: MaterialReport): void {
    let q = 0;
    for (let i = 0; i < 6; i++) {
      const x = state[offset + i];
      out.transformationStrain[i] = x;
      q += x * x;
    }
    out.xi = (this.gauge ? this.gauge.value(out.transformationStrain) : Math.sqrt(q)) / this.params.eps_L;
    out.eqPlastic = 0;
  }

  /** eᵗʳ(Δζ) by the scalar reduction; returns ‖eᵗʳ − eᵗʳ_n‖/Δζ − 1. */
  private trial(dz: number): number {
    if (this.gauge) return this.trialLode(dz, this.gauge);
    const p = this.params;
    const lam = dz / (2 * p.G * dz + p.R);
    let vv = 0;
    for (let i = 0; i < 6; i++) {
      const x = this.etrN[i] + lam * this.sTr[i];
      this.v[i] = x;
      vv += x * x;
    }
    const vn = Math.sqrt(vv);
    let q = (vn - lam * this.tau) / (1 + lam * p.h);
    let reg: Regime = 'free';
    if (q <= 0 || vn === 0) {
      q = 0;
      reg = 'elastic';
    } else if (q >= p.eps_L) {
      q = p.eps_L;
      reg = 'saturated';
    }
    const scale = vn > 0 ? q / vn : 0;
    let dd = 0;
    for (let i = 0; i < 6; i++) {
      const x = scale * this.v[i];
      this.etr[i] = x;
      const d = x - this.etrN[i];
      dd += d * d;
    }
    this.qReg = reg;
    this.qNorm = q;
    this.lambda = lam;
    return Math.sqrt(dd) / dz - 1;
  }

  /** trial() with the Lode-angle gauge: eᵗʳ is the proximal map at v = eᵗʳ_n + λ s_trial. */
  private trialLode(dz: number, gauge: LodeGauge): number {
    const p = this.params;
    const lam = dz / (2 * p.G * dz + p.R);
    for (let i = 0; i < 6; i++) this.v[i] = this.etrN[i] + lam * this.sTr[i];
    const regime = gauge.prox(this.v, lam, this.tau, p.h, p.eps_L, this.etr, this.lodeWarm);
    let dd = 0;
    let qq = 0;
    for (let i = 0; i < 6; i++) {
      const d = this.etr[i] - this.etrN[i];
      dd += d * d;
      qq += this.etr[i] * this.etr[i];
    }
    this.qReg = regime === 0 ? 'elastic' : regime === 1 ? 'free' : 'saturated';
    this.qNorm = Math.sqrt(qq);
    this.lambda = lam;
    return Math.sqrt(dd) / dz - 1;
  }

  /**
   * Bracketed secant (Illinois) for the nontrivial root of trial(Δζ) = 0. With the gauge, where
   * every trial costs an angle search, the secant steps use ψ = f/(1 + f) = 1 − Δζ/‖Δeᵗʳ‖ in
   * place of f = trial(Δζ): same sign and root, and close to linear in Δζ (‖Δeᵗʳ‖ grows like
   * λ = Δζ/(2GΔζ + R), so f is close to hyperbolic), which saves about half the trials. The
   * stopping test stays on f; the symmetric model keeps its iteration on f.
   */
  private solveIncrement(): void {
    const p = this.params;
    let qn = 0;
    for (let i = 0; i < 6; i++) qn += this.etrN[i] * this.etrN[i];
    const upper = Math.sqrt(qn) + p.eps_L / (this.gauge ? this.gauge.shape.kMin * 0.999 : 1);
    const steer = this.gauge !== null;
    if (steer) this.lodeWarm.fill(NaN); // a fresh start per update (see lodeWarm)
    let a = 1e-12 * upper;
    let fa = this.trial(a);
    let b = upper;
    let fb = this.trial(b);
    if (steer) {
      fa = steered(fa);
      fb = steered(fb);
    }
    if (!(fa > 0) || fb > 0) {
      // The elastic test said "transform", so fa > 0 holds up to round-off; accept the end.
      if (fb > 0) this.trial(b);
      else this.trial(a);
      return;
    }
    let side = 0;
    const tolZ = 1e-15 * upper;
    for (let it = 0; it < MAX_ITER; it++) {
      let c = (a * fb - b * fa) / (fb - fa);
      if (!(c > a && c < b)) c = 0.5 * (a + b);
      const raw = this.trial(c);
      if (Math.abs(raw) <= 1e-14 || b - a <= tolZ) return;
      const fc = steer ? steered(raw) : raw;
      if (fc < 0) {
        b = c;
        fb = fc;
        if (side === -1) fa *= 0.5;
        side = -1;
      } else {
        a = c;
        fa = fc;
        if (side === 1) fb *= 0.5;
        side = 1;
      }
    }
    this.failure = 'transformation-strain return map did not converge';
  }

  update(
    input: MaterialPointInput,
    stateOld: Float64Array,
    oldOffset: number,
    state: Float64Array,
    newOffset: number,
    out: MaterialPointOutput,
  ): void {
    const p = this.params;
    this.failure = '';
    const eps = input.strain;
    const T = input.temperature;
    const G2 = 2 * p.G;
    const e = this.e;
    const etrN = this.etrN;
    const sTr = this.sTr;
    this.tau = p.beta * Math.max(T - p.T0, 0);
    const tr = eps[0] + eps[1] + eps[2];
    const m = tr / 3;
    let qn2 = 0;
    let ss = 0;
    let sn = 0;
    for (let i = 0; i < 6; i++) {
      const ei = eps[i] - (i < 3 ? m : 0);
      const x = stateOld[oldOffset + i];
      const si = G2 * (ei - x);
      e[i] = ei;
      etrN[i] = x;
      sTr[i] = si;
      qn2 += x * x;
      ss += si * si;
      sn += si * x;
    }
    const transforms = this.isTransforming(Math.sqrt(qn2), ss, sn);
    let etr = this.etr;
    if (transforms) {
      this.solveIncrement();
      if (this.qReg === 'elastic') for (let i = 0; i < 6; i++) etr[i] = 0; // complete reverse
    } else {
      etr = etrN; // unchanged
      this.qReg = 'elastic';
    }
    const pr = p.K * (tr - 3 * p.alpha * (T - p.T_ref));
    const stress = out.stress;
    let check = 0;
    for (let i = 0; i < 6; i++) {
      const si = G2 * (e[i] - etr[i]) + (i < 3 ? pr : 0);
      stress[i] = si;
      check += si;
      state[newOffset + i] = etr[i];
    }
    this.writeTangent(out.tangent);
    out.ok = check - check === 0 && this.failure === ''; // check − check is NaN for ±∞ or NaN
    out.message = out.ok ? '' : this.failure || 'non-finite stress in the Souza–Auricchio update';
  }

  /**
   * Elastic test with the trial driving force (exact cases, γ ≥ 0 chosen at saturation), from
   * ‖eᵗʳ_n‖, ‖s_trial‖² and s_trial·eᵗʳ_n.
   */
  private isTransforming(qn: number, ss: number, sDotE: number): boolean {
    const p = this.params;
    const tolR = 1e-12 * p.R;
    if (this.gauge) return this.isTransformingLode(qn, this.gauge, tolR);
    if (qn <= 1e-14 * p.eps_L) return Math.sqrt(ss) > p.R + this.tau + tolR;
    // Y = s_trial − k0 n_n: ‖Y‖² = ‖s‖² − 2 k0 (s·n_n) + k0², c = Y·n_n = s·n_n − k0
    const k0 = this.tau + p.h * qn;
    const sN = sDotE / qn;
    const yy = Math.max(ss - 2 * k0 * sN + k0 * k0, 0);
    const c = sN - k0;
    // At saturation γ = max(c, 0) removes the component along eᵗʳ.
    const saturated = qn >= p.eps_L * (1 - 1e-12);
    const xx = saturated && c > 0 ? Math.max(yy - c * c, 0) : yy;
    return Math.sqrt(xx) > p.R + tolR;
  }

  /**
   * Elastic test with the gauge: at eᵗʳ_n = 0 the distance from s_trial to τB° (Moreau: the norm
   * of the proximal map of τg); otherwise ‖X‖ with X = s_trial − (τ + h g_n + γ)∂g(eᵗʳ_n), the best
   * γ ≥ 0 at saturation.
   */
  private isTransformingLode(qn: number, gauge: LodeGauge, tolR: number): boolean {
    const p = this.params;
    if (qn <= 1e-14 * p.eps_L) {
      gauge.prox(this.sTr, 1, this.tau, 0, Infinity, this.etr);
      let d = 0;
      for (let i = 0; i < 6; i++) d += this.etr[i] * this.etr[i];
      return Math.sqrt(d) > p.R + tolR;
    }
    const m = this.grad;
    const g = gauge.derivatives(this.etrN, m);
    const k0 = this.tau + p.h * g;
    let mm = 0;
    let ym = 0;
    for (let i = 0; i < 6; i++) {
      mm += m[i] * m[i];
      ym += (this.sTr[i] - k0 * m[i]) * m[i];
    }
    const gam = g >= p.eps_L * (1 - 1e-12) ? Math.max(ym / mm, 0) : 0;
    let xx = 0;
    for (let i = 0; i < 6; i++) xx += (this.sTr[i] - (k0 + gam) * m[i]) ** 2;
    return Math.sqrt(xx) > p.R + tolR;
  }

  private writeTangent(t: Float64Array): void {
    t.set(this.elastic);
    if (this.qReg === 'elastic') return;
    this.transformationTangent(t);
  }

  /**
   * Linearises R1 = eᵗʳ − eᵗʳ_n − Δζ X/‖X‖, R2 = ‖X‖ − R (and R3 = ‖eᵗʳ‖ − ε_L at saturation)
   * in (eᵗʳ, Δζ[, γ]) and ε, solves for deᵗʳ/dε and subtracts 2G deᵗʳ/dε.
   */
  private transformationTangent(t: Float64Array): void {
    const p = this.params;
    const sat = this.qReg === 'saturated';
    const nu = sat ? 8 : 7;
    const q = this.qNorm;
    const lam = this.lambda;
    // Δζ from λ, and N̂ = Δ/‖Δ‖ (= X/‖X‖ at the solution)
    const dz = (p.R * lam) / (1 - 2 * p.G * lam);
    let dd = 0;
    for (let i = 0; i < 6; i++) {
      const d = this.etr[i] - this.etrN[i];
      this.nHat[i] = d;
      dd += d * d;
      if (!this.gauge) this.nDir[i] = this.etr[i] / q;
    }
    const dn = Math.sqrt(dd);
    for (let i = 0; i < 6; i++) this.nHat[i] = dn > 0 ? this.nHat[i] / dn : 0;
    const gauge = this.gauge;
    // κ = τ + hq + γ; at saturation γ from the reduction (with the gauge: from ‖v − e‖ = λκ‖∂g‖)
    let kappa = this.tau + p.h * q;
    if (gauge) {
      const g = gauge.derivatives(this.etr, this.nDir, this.hess);
      let mm = 0;
      for (let i = 0; i < 6; i++) mm += this.nDir[i] * this.nDir[i];
      kappa = sat ? gauge.lastGap / (lam * Math.sqrt(mm)) : this.tau + p.h * g;
    } else if (sat) {
      let vv = 0;
      for (let i = 0; i < 6; i++) vv += this.v[i] * this.v[i];
      kappa += Math.max((Math.sqrt(vv) - p.eps_L) / lam - this.tau - p.h * p.eps_L, 0);
    }
    const n = this.nDir;
    const N = this.nHat;
    // dX/deᵗʳ = −2G I_d − h n⊗n − (κ/q)(I_d − n⊗n); with the gauge n = ∂g and κ ∂²g instead
    for (let i = 0; i < 6; i++) {
      for (let j = 0; j < 6; j++) {
        const id = idev(i, j);
        const curv = gauge ? kappa * this.hess[i * 6 + j] : (kappa / q) * (id - n[i] * n[j]);
        this.dX[i * 6 + j] = -2 * p.G * id - p.h * n[i] * n[j] - curv;
      }
    }
    const J = this.jac;
    const B = this.rhs;
    J.fill(0);
    B.fill(0);
    const c = dz / p.R;
    // Rows 0..5: R1
    for (let i = 0; i < 6; i++) {
      for (let j = 0; j < 6; j++) {
        let pd = 0; // [(I_d − N̂N̂) dX/deᵗʳ]_ij
        for (let k = 0; k < 6; k++) pd += (idev(i, k) - N[i] * N[k]) * this.dX[k * 6 + j];
        J[i * nu + j] = (i === j ? 1 : 0) - c * pd;
        B[i * 6 + j] = c * 2 * p.G * (idev(i, j) - N[i] * N[j]);
      }
      J[i * nu + 6] = -N[i];
      if (sat) {
        let pn = 0;
        for (let k = 0; k < 6; k++) pn += (idev(i, k) - N[i] * N[k]) * n[k];
        J[i * nu + 7] = c * pn;
      }
    }
    // Row 6: R2 = ‖X‖ − R
    for (let j = 0; j < 6; j++) {
      let s = 0;
      for (let k = 0; k < 6; k++) s += N[k] * this.dX[k * 6 + j];
      J[6 * nu + j] = s;
      B[6 * 6 + j] = -2 * p.G * N[j];
    }
    if (sat) {
      let nn = 0;
      for (let k = 0; k < 6; k++) nn += N[k] * n[k];
      J[6 * nu + 7] = -nn;
      for (let j = 0; j < 6; j++) J[7 * nu + j] = n[j];
    }
    if (!solveDense(J, B, nu, 6)) {
      this.failure = 'singular transformation-strain tangent';
      return;
    }
    for (let i = 0; i < 6; i++) {
      for (let j = 0; j < 6; j++) t[i * 6 + j] -= 2 * p.G * B[i * 6 + j];
    }
  }
}

/** f/(1 + f) for f = trial(Δζ) ≥ −1 (f itself at −1, where the ratio has no finite value). */
function steered(f: number): number {
  return f > -1 ? f / (1 + f) : f;
}

/** Gaussian elimination with partial pivoting: A (n×n) X = B (n×m), X overwrites B. */
function solveDense(A: Float64Array, B: Float64Array, n: number, m: number): boolean {
  for (let k = 0; k < n; k++) {
    let piv = k;
    let best = Math.abs(A[k * n + k]);
    for (let r = k + 1; r < n; r++) {
      const v = Math.abs(A[r * n + k]);
      if (v > best) {
        best = v;
        piv = r;
      }
    }
    if (!(best > 0)) return false;
    if (piv !== k) {
      for (let j = 0; j < n; j++) {
        const tmp = A[k * n + j];
        A[k * n + j] = A[piv * n + j];
        A[piv * n + j] = tmp;
      }
      for (let j = 0; j < m; j++) {
        const tmp = B[k * m + j];
        B[k * m + j] = B[piv * m + j];
        B[piv * m + j] = tmp;
      }
    }
    const d = A[k * n + k];
    for (let r = k + 1; r < n; r++) {
      const f = A[r * n + k] / d;
      if (f === 0) continue;
      for (let j = k; j < n; j++) A[r * n + j] -= f * A[k * n + j];
      for (let j = 0; j < m; j++) B[r * m + j] -= f * B[k * m + j];
    }
  }
  for (let k = n - 1; k >= 0; k--) {
    const d = A[k * n + k];
    for (let j = 0; j < m; j++) {
      let s = B[k * m + j];
      for (let c = k + 1; c < n; c++) s -= A[k * n + c] * B[c * m + j];
      B[k * m + j] = s / d;
    }
  }
  return true;
}

/** Validates and builds the model; throws with a message naming the parameter to fix. */
export function createSouzaAuricchio(input: SouzaAuricchioInput): SouzaAuricchioMaterial {
  const c = checkSouzaAuricchio(input);
  if (!c.ok) throw new Error(c.message);
  return new SouzaAuricchioMaterial(c.constants);
}
