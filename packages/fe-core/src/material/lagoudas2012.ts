/**
 * Phase-fraction SMA model of Lagoudas et al. (2012, Int. J. Plasticity 32–33:155–183), 3D,
 * small strain, isotropic elasticity with one Poisson ratio and Reuss-mixed compliance.
 *
 * State per point (14 doubles): εᵗ (6, Kelvin–Mandel), ξ, εᵗʳ (6), ξʳ — the transformation strain,
 * the martensite fraction and the reversal memory (values at the end of the last forward step);
 * with the optional J2 part 21: plus the plastic strain εᵖ (6) and the equivalent plastic strain p.
 *
 * Optional J2 plastic strain: von Mises yield σ̄ ≤ σ_y,A + ξ(σ_y,M − σ_y,A) + H_iso p with radial
 * (associated) flow. Both deviatoric flows are along σ', so at fixed ξ the plastic return is one
 * more monotone scalar equation inside the same σ(ξ) evaluation, and the yield stress's
 * dependence on ξ enters the consistent tangent through Ξ N.
 *
 * Return map: backward Euler (closest point). For a fixed ξ the strain equation
 *   S(ξ):σ + εᵗ_n + (ξ − ξ_n)Λ(σ) + α(ξ)(T − T_ref)1 = ε
 * is solved exactly: in the forward direction Λ ∥ σ' and σ' ∥ the deviator of the known part of the
 * strain, so it reduces to one monotone scalar equation for σ̄; in the reverse direction Λ is the
 * frozen εᵗʳ/ξʳ and σ is explicit. The transformation condition Φ(σ(ξ), ξ) = 0 is then a scalar
 * equation in ξ, solved by Newton inside a bracket with bisection fallback, so ξ never leaves
 * [0, 1] by clamping and a transformation that completes inside the increment is detected by
 * evaluating Φ at the bound. The consistent tangent follows from the same linearisation.
 *
 * Deviation from the paper, on purpose: the forward direction uses σ̄_r = √(σ̄² + σ_r²) in place of
 * σ̄ in the denominator, Λ = (3/2)H_cur σ'/σ̄_r, with σ_r = 0.1 MPa. It keeps Λ and the tangent
 * finite when martensite forms at vanishing stress (stress-free cooling); the change is
 * O((σ_r/σ̄)²), below 1e-5 relative for σ̄ > 25 MPa.
 */
import type { Material, MaterialPointInput, MaterialPointOutput, MaterialReport } from './types';
import { calibrateLagoudas2012, type Lagoudas2012Constants, type Lagoudas2012Measured } from './lagoudas2012Calibration';

export { calibrateLagoudas2012 } from './lagoudas2012Calibration';
export type { Lagoudas2012Constants, Lagoudas2012Measured } from './lagoudas2012Calibration';

const ET = 0;
const XI = 6;
const ETR = 7;
const XIR = 13;
/** Optional J2 part: plastic strain (6) and equivalent plastic strain. */
const EP = 14;
const PEQ = 20;
export const LAGOUDAS2012_STATE_SIZE = 14;
export const LAGOUDAS2012_PLASTIC_STATE_SIZE = 21;

/** Smoothing of ξ^n for n < 1 (infinite slope at 0): ξ^n → ξ(ξ + δ)^(n−1). */
const SMOOTH = 1e-5;
const SQ32 = Math.sqrt(1.5);
const MAX_OUTER = 200;
const MAX_INNER = 100;
const MAX_PHASES = 1;

function pw(x: number, n: number): number {
  if (x <= 0) return 0;
  return n === 1 ? x : x * Math.pow(x + SMOOTH, n - 1);
}

function pwSlope(x: number, n: number): number {
  if (n === 1) return 1;
  const y = Math.max(x, 0);
  return Math.pow(y + SMOOTH, n - 1) + (n - 1) * y * Math.pow(y + SMOOTH, n - 2);
}

type Direction = 'forward' | 'reverse';

// Plain loops: typed-array set()/fill() calls cost more than six element moves.
function copy6(from: Float64Array, to: Float64Array): void {
  for (let i = 0; i < 6; i++) to[i] = from[i];
}
function zero6(a: Float64Array): void {
  for (let i = 0; i < 6; i++) a[i] = 0;
}

/** Internal variables of one material point: εᵗ, ξ, the reversal memory εᵗʳ, ξʳ and (plastic) εᵖ, p. */
class InternalState {
  readonly et = new Float64Array(6);
  readonly etr = new Float64Array(6);
  xi = 0;
  xir = 0;
  readonly ep = new Float64Array(6);
  p = 0;

  copyFrom(o: InternalState): void {
    copy6(o.et, this.et);
    copy6(o.etr, this.etr);
    copy6(o.ep, this.ep);
    this.p = o.p;
    this.xi = o.xi;
    this.xir = o.xir;
  }

  /** Reads the stored layout (ET, XI, ETR, XIR, then EP, PEQ when plastic). */
  load(state: Float64Array, offset: number, plastic: boolean): void {
    for (let i = 0; i < 6; i++) {
      this.et[i] = state[offset + ET + i];
      this.etr[i] = state[offset + ETR + i];
    }
    this.xi = state[offset + XI];
    this.xir = state[offset + XIR];
    if (plastic) {
      for (let i = 0; i < 6; i++) this.ep[i] = state[offset + EP + i];
      this.p = state[offset + PEQ];
    }
  }

  store(state: Float64Array, offset: number, plastic: boolean): void {
    for (let i = 0; i < 6; i++) {
      state[offset + ET + i] = this.et[i];
      state[offset + ETR + i] = this.etr[i];
    }
    state[offset + XI] = this.xi;
    state[offset + XIR] = this.xir;
    if (plastic) {
      for (let i = 0; i < 6; i++) state[offset + EP + i] = this.ep[i];
      state[offset + PEQ] = this.p;
    }
  }
}

export class Lagoudas2012Material implements Material<Lagoudas2012Constants> {
  readonly model = 'lagoudas2012';
  readonly stateSize: number;

  // Base state of the current phase (start of increment, or the intermediate state after a
  // reverse phase that is followed by a forward one).
  private readonly base = new InternalState();
  /** The base at the start of the last phase, so its end state can be re-evaluated with the right Δξ. */
  private readonly phaseStart = new InternalState();
  private readonly lamR = new Float64Array(6);

  // Loading of the current evaluation.
  private readonly eps = new Float64Array(6);
  private temp = 0;

  // Results of the last evaluation at some ξ.
  private readonly sig = new Float64Array(6);
  private readonly lam = new Float64Array(6);
  private readonly nhat = new Float64Array(6);
  private readonly estar = new Float64Array(6);
  private readonly nVec = new Float64Array(6);
  private readonly phiS = new Float64Array(6);
  private readonly xiN = new Float64Array(6);
  private readonly xiPhi = new Float64Array(6);
  private sC = 0;
  private aC = 0;
  /** Inverse radial compliance of Ξ (0 for perfect plasticity), and the radial b without plasticity. */
  private ibC = 0;
  private bRaw = 0;
  /** Plastic multiplier Δp of the last evaluation. */
  private dpC = 0;
  private denC = 0;
  private failure = '';

  /** Φ tolerance: scaled by the size of the critical driving force and hardening. */
  private readonly tolPhi: number;

  constructor(readonly params: Lagoudas2012Constants) {
    this.stateSize = params.plastic ? LAGOUDAS2012_PLASTIC_STATE_SIZE : LAGOUDAS2012_STATE_SIZE;
    this.tolPhi = 1e-11 * (params.Y0 + Math.abs(params.a1) + Math.abs(params.a2));
  }

  initState(state: Float64Array, offset: number, temperature: number): void {
    for (let i = 0; i < this.stateSize; i++) state[offset + i] = 0;
    const xi = this.stressFreeFraction(temperature);
    state[offset + XI] = xi;
    state[offset + XIR] = xi;
  }

  report(state: Float64Array, offset: number, out: MaterialReport): void {
    out.xi = state[offset + XI];
    out.eqPlastic = this.params.plastic ? state[offset + PEQ] : 0;
    for (let i = 0; i < 6; i++) out.transformationStrain[i] = state[offset + ET + i];
  }

  // ---------------------------------------------------------------- hardening functions
  fFwd(xi: number): number {
    const p = this.params;
    return 0.5 * p.a1 * (1 + pw(xi, p.n1) - pw(1 - xi, p.n2)) + p.a3;
  }
  private fFwdSlope(xi: number): number {
    const p = this.params;
    return 0.5 * p.a1 * (pwSlope(xi, p.n1) + pwSlope(1 - xi, p.n2));
  }
  fRev(xi: number): number {
    const p = this.params;
    return 0.5 * p.a2 * (1 + pw(xi, p.n3) - pw(1 - xi, p.n4)) - p.a3;
  }
  private fRevSlope(xi: number): number {
    const p = this.params;
    return 0.5 * p.a2 * (pwSlope(xi, p.n3) + pwSlope(1 - xi, p.n4));
  }

  /** Martensite fraction reached by stress-free cooling from austenite to `temperature`. */
  stressFreeFraction(temperature: number): number {
    const p = this.params;
    const drive = p.rhoDs0 * temperature - p.rhoDu0 - p.Y0;
    if (drive - this.fFwd(0) <= 0) return 0;
    if (drive - this.fFwd(1) >= 0) return 1;
    let lo = 0;
    let hi = 1;
    for (let it = 0; it < 60; it++) {
      const mid = 0.5 * (lo + hi);
      if (drive - this.fFwd(mid) > 0) lo = mid;
      else hi = mid;
    }
    return 0.5 * (lo + hi);
  }

  // ---------------------------------------------------------------- evaluations at fixed ξ
  private compliance(xi: number): number {
    return 1 / this.params.E_A + xi * this.params.dS;
  }

  /** ε − εᵗ_base − α(ξ)ΔT 1, before the Δξ·Λ term. */
  private knownStrain(xi: number): void {
    const p = this.params;
    const th = (p.alpha_A + xi * p.dAlpha) * (this.temp - p.T_ref);
    for (let i = 0; i < 6; i++) this.estar[i] = this.eps[i] - this.base.et[i] - this.base.ep[i];
    this.estar[0] -= th;
    this.estar[1] -= th;
    this.estar[2] -= th;
  }

  /** σ:P:σ with P = (1+ν)I − ν 1⊗1 (so σ:S:σ = s σ:P:σ). */
  private sPs(): number {
    const nu = this.params.nu;
    const s = this.sig;
    const tr = s[0] + s[1] + s[2];
    let ss = 0;
    for (let i = 0; i < 6; i++) ss += s[i] * s[i];
    return (1 + nu) * ss - nu * tr * tr;
  }

  /** N = ∂(strain residual)/∂ξ = Λ + ΔS:σ + Δα ΔT 1. */
  private buildN(lam: Float64Array): void {
    const p = this.params;
    const s = this.sig;
    const tr = s[0] + s[1] + s[2];
    const dT = this.temp - p.T_ref;
    for (let i = 0; i < 6; i++) this.nVec[i] = lam[i] + p.dS * (1 + p.nu) * s[i];
    for (let i = 0; i < 3; i++) this.nVec[i] += -p.dS * p.nu * tr + p.dAlpha * dT;
  }

  /** out = Ξ v, Ξ = [s(ξ)P + Δξ ∂Λ/∂σ]⁻¹ in its spectral form (volumetric, n̂, rest of deviator). */
  private applyXi(v: Float64Array, out: Float64Array): void {
    const p = this.params;
    const trv = (v[0] + v[1] + v[2]) / 3;
    const kv = trv / (this.sC * (1 - 2 * p.nu));
    const n = this.nhat;
    let nv = 0;
    for (let i = 0; i < 6; i++) nv += n[i] * v[i];
    const c = nv * (this.ibC - 1 / this.aC);
    for (let i = 0; i < 6; i++) out[i] = (i < 3 ? v[i] - trv : v[i]) / this.aC + c * n[i];
    out[0] += kv;
    out[1] += kv;
    out[2] += kv;
  }

  // Transformation hardening at σ̄ (written by transformationTerms, no allocation per call):
  // H(σ̄), dH/dσ̄, the smoothed sign g = σ̄/√(σ̄² + σ̄_r²) and dg/dσ̄.
  private hH = 0;
  private hHp = 0;
  private hG = 0;
  private hGp = 0;

  private transformationTerms(sbar: number): void {
    const p = this.params;
    const r2 = p.sigmaReg * p.sigmaReg;
    const ex = p.k_t === 0 ? 1 : Math.exp(-p.k_t * sbar);
    this.hH = p.H_min + (p.H_sat - p.H_min) * (1 - ex);
    this.hHp = (p.H_sat - p.H_min) * p.k_t * ex;
    const sr = Math.sqrt(sbar * sbar + r2);
    this.hG = sbar / sr;
    this.hGp = r2 / (sr * sr * sr);
  }

  /** n̂ = unit deviator of e (zero when e is volumetric); returns ‖dev e‖. */
  private deviatorDirection(e: Float64Array): number {
    const m = (e[0] + e[1] + e[2]) / 3;
    let nn = 0;
    for (let i = 0; i < 6; i++) {
      const d = i < 3 ? e[i] - m : e[i];
      this.nhat[i] = d;
      nn += d * d;
    }
    const enorm = Math.sqrt(nn);
    if (enorm > 0) for (let i = 0; i < 6; i++) this.nhat[i] /= enorm;
    else zero6(this.nhat);
    return enorm;
  }

  /** σ = √(2/3) σ̄ n̂ + p·1 with p = tr(e*) / (3 S (1 − 2ν)); returns p. */
  private radialStress(sbar: number, tr: number, s: number): number {
    const dev = Math.sqrt(2 / 3) * sbar;
    const pm = tr / (3 * s * (1 - 2 * this.params.nu));
    for (let i = 0; i < 6; i++) this.sig[i] = dev * this.nhat[i] + (i < 3 ? pm : 0);
    return pm;
  }

  /** ∂Φ/∂σ : Ξ N for the transformation direction lam (leaves Ξ N in xiN for the tangent). */
  private phiSXiN(lam: Float64Array): number {
    this.buildN(lam);
    this.applyXiN();
    let q = 0;
    for (let i = 0; i < 6; i++) q += this.phiS[i] * this.xiN[i];
    return q;
  }

  /** Φ of one direction at ξ from the base state; the reverse one first freezes its direction. */
  private evalFromBase(dir: Direction, xi: number, derivatives: boolean): number {
    if (dir === 'forward') return this.evalForward(xi, derivatives);
    this.setReverseDirection();
    return this.evalReverse(xi, derivatives);
  }

  /**
   * Forward: stress for a given ξ ≥ ξ_base, Φ_fwd there and dΦ/dξ along the solution.
   * Returns Φ; leaves σ, Λ, n̂, s, a, b, N, ∂Φ/∂σ and the denominator in the work buffers.
   */
  private evalForward(xi: number, derivatives = true): number {
    const p = this.params;
    const dxi = xi - this.base.xi;
    const s = this.compliance(xi);
    this.sC = s;
    this.knownStrain(xi);
    const e = this.estar;
    const tr = e[0] + e[1] + e[2];
    const enorm = this.deviatorDirection(e);
    const c = s * (1 + p.nu);
    const target = SQ32 * enorm;
    const r2 = p.sigmaReg * p.sigmaReg;
    // Scalar equation c σ̄ + 1.5 Δξ H(σ̄) σ̄/σ̄_r = √(3/2)‖e*'‖, increasing in σ̄.
    let x = target / c;
    let lo = 0;
    let hi = x;
    let H = 0;
    let Hp = 0;
    let g = 0;
    let gp = 0;
    let converged = dxi === 0;
    for (let it = 0; it < MAX_INNER; it++) {
      this.transformationTerms(x);
      ({ hH: H, hHp: Hp, hG: g, hGp: gp } = this);
      if (converged) break;
      const psi = c * x + 1.5 * dxi * H * g - target;
      const dpsi = c + 1.5 * dxi * (Hp * g + H * gp);
      if (psi > 0) hi = x;
      else lo = x;
      if (Math.abs(psi) <= 1e-15 * target) {
        converged = true;
        continue; // one more pass refreshes H, g at x
      }
      let xn = x - psi / dpsi;
      if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi);
      if (Math.abs(xn - x) <= 1e-15 * Math.max(x, 1e-300)) converged = true;
      x = xn;
    }
    if (!converged) this.failure = 'forward transformation: stress equation did not converge';
    let dp = 0;
    if (p.plastic && x > p.yA + xi * p.dY + p.Hiso * this.base.p) {
      dp = this.plasticForward(xi, dxi, c, target);
      x = p.yA + xi * p.dY + p.Hiso * (this.base.p + dp);
      this.transformationTerms(x);
      ({ hH: H, hHp: Hp, hG: g, hGp: gp } = this);
    }
    const sbar = x;
    const a = c + 1.5 * dxi * H / Math.sqrt(sbar * sbar + r2) + (dp > 0 ? (1.5 * dp) / sbar : 0);
    const b = c + 1.5 * dxi * (Hp * g + H * gp);
    this.setRadial(a, b, dp);
    const pm = this.radialStress(sbar, tr, s);
    const lamMag = SQ32 * H * g;
    for (let i = 0; i < 6; i++) this.lam[i] = lamMag * this.nhat[i];
    const dT = this.temp - p.T_ref;
    const trs = 3 * pm;
    const phi =
      (1 - p.D) * H * sbar * g + 0.5 * p.dS * this.sPs() + p.dAlpha * dT * trs +
      p.rhoDs0 * this.temp - p.rhoDu0 - this.fFwd(xi) - p.Y0;
    // ∂Φ/∂σ
    if (!derivatives) return phi;
    const dPhiBar = (1 - p.D) * (Hp * sbar * g + H * g + H * sbar * gp) * SQ32;
    for (let i = 0; i < 6; i++) this.phiS[i] = dPhiBar * this.nhat[i] + p.dS * (1 + p.nu) * this.sig[i];
    for (let i = 0; i < 3; i++) this.phiS[i] += -p.dS * p.nu * trs + p.dAlpha * dT;
    this.denC = this.phiSXiN(this.lam) + this.fFwdSlope(xi);
    return phi;
  }

  /**
   * Plastic multiplier in the forward branch at fixed ξ: σ̄ = σ_y(ξ) + H_iso(p_n + Δp) and
   * c σ̄ + 1.5 Δξ H(σ̄) g(σ̄) + 1.5 Δp = √(3/2)‖e*'‖ — monotone in Δp, bracketed Newton.
   */
  private plasticForward(xi: number, dxi: number, c: number, target: number): number {
    const p = this.params;
    let lo = 0;
    let hi = target / 1.5;
    let dp = 0;
    for (let it = 0; it < MAX_INNER; it++) {
      const y = p.yA + xi * p.dY + p.Hiso * (this.base.p + dp);
      this.transformationTerms(y);
      const { hH: H, hHp: Hp, hG: g, hGp: gp } = this;
      const phi = c * y + 1.5 * dxi * H * g + 1.5 * dp - target;
      if (Math.abs(phi) <= 1e-15 * target) return dp;
      if (phi > 0) hi = dp;
      else lo = dp;
      const dphi = (c + 1.5 * dxi * (Hp * g + H * gp)) * p.Hiso + 1.5;
      let next = dp - phi / dphi;
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      if (Math.abs(next - dp) <= 1e-16 * Math.max(hi, 1e-300)) return next;
      dp = next;
    }
    this.failure = 'plastic return did not converge';
    return dp;
  }

  /** Stores the spectral parts of Ξ: transverse a, radial b (inverse 0 for perfect plasticity). */
  private setRadial(a: number, b: number, dp: number): void {
    const p = this.params;
    this.aC = a;
    this.bRaw = b;
    this.dpC = dp;
    this.ibC = dp > 0 ? p.Hiso / (b * p.Hiso + 1.5) : 1 / b;
  }

  /**
   * xiN = Ξ N; when plastic, the yield stress moves with ξ (σ_y(ξ)), which adds
   * −√(3/2)·dY/(1.5 + b·H_iso) along n̂ (finite also for H_iso = 0).
   */
  private applyXiN(): void {
    this.applyXi(this.nVec, this.xiN);
    if (this.dpC > 0) {
      const c = (-SQ32 * this.params.dY) / (1.5 + this.bRaw * this.params.Hiso);
      for (let i = 0; i < 6; i++) this.xiN[i] += c * this.nhat[i];
    }
  }

  /** Reverse: σ explicit for a given ξ ≤ ξ_base (direction Λ_r = εᵗʳ/ξʳ frozen). */
  private evalReverse(xi: number, derivatives = true): number {
    const p = this.params;
    const dxi = xi - this.base.xi;
    const s = this.compliance(xi);
    this.sC = s;
    const c = s * (1 + p.nu);
    this.knownStrain(xi);
    const e = this.estar;
    for (let i = 0; i < 6; i++) e[i] -= dxi * this.lamR[i];
    // σ' ∥ deviator of the known strain; radial return when the yield stress is exceeded
    const tr = e[0] + e[1] + e[2];
    const enorm = this.deviatorDirection(e);
    let sbar = (SQ32 * enorm) / c;
    let dp = 0;
    if (p.plastic) {
      const y0 = p.yA + xi * p.dY + p.Hiso * this.base.p;
      if (sbar > y0) {
        dp = (SQ32 * enorm - c * y0) / (c * p.Hiso + 1.5);
        sbar = y0 + p.Hiso * dp;
      }
    }
    this.setRadial(dp > 0 ? c + (1.5 * dp) / sbar : c, c, dp);
    this.radialStress(sbar, tr, s);
    const dT = this.temp - p.T_ref;
    const trs = this.sig[0] + this.sig[1] + this.sig[2];
    let sl = 0;
    for (let i = 0; i < 6; i++) sl += this.sig[i] * this.lamR[i];
    const phi =
      -(1 + p.D) * sl - 0.5 * p.dS * this.sPs() - p.dAlpha * dT * trs -
      p.rhoDs0 * this.temp + p.rhoDu0 + this.fRev(xi) - p.Y0;
    if (!derivatives) return phi;
    for (let i = 0; i < 6; i++) this.phiS[i] = -(1 + p.D) * this.lamR[i] - p.dS * (1 + p.nu) * this.sig[i];
    for (let i = 0; i < 3; i++) this.phiS[i] += p.dS * p.nu * trs - p.dAlpha * dT;
    this.denC = this.phiSXiN(this.lamR) - this.fRevSlope(xi);
    return phi;
  }

  private evalDir(dir: Direction, xi: number): number {
    return dir === 'forward' ? this.evalForward(xi) : this.evalReverse(xi);
  }

  /** Sets the frozen reverse direction from the base memory (guarding ξʳ → 0). */
  private setReverseDirection(): void {
    const inv = this.base.xir > 1e-12 ? 1 / this.base.xir : 0;
    for (let i = 0; i < 6; i++) this.lamR[i] = this.base.etr[i] * inv;
  }

  /**
   * Solves Φ(σ(ξ), ξ) = 0 for ξ between the base and the bound (1 forward, 0 reverse), given that
   * Φ > 0 at the base. Newton inside the bracket, bisection when a step leaves it; the bound is
   * taken only when Φ there is still ≥ 0. Leaves the work buffers evaluated at the returned ξ.
   */
  private solveFraction(dir: Direction): number {
    const bound = dir === 'forward' ? 1 : 0;
    const phiBound = this.evalDir(dir, bound);
    if (phiBound >= 0) return bound;
    // pos: Φ > 0 side (base), neg: Φ < 0 side (bound)
    let pos = this.base.xi;
    let neg = bound;
    let x = this.base.xi;
    let phi = this.evalDir(dir, x);
    for (let it = 0; it < MAX_OUTER; it++) {
      if (phi > 0) pos = x;
      else neg = x;
      if (Math.abs(phi) <= this.tolPhi) return x;
      if (Math.abs(pos - neg) <= 1e-15) break;
      // dΦ/dξ along the solution = −den
      let xn = x + phi / this.denC;
      const lo = Math.min(pos, neg);
      const hi = Math.max(pos, neg);
      if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi);
      x = xn;
      phi = this.evalDir(dir, x);
    }
    if (Math.abs(phi) > 1e3 * this.tolPhi && Math.abs(pos - neg) > 1e-12) {
      this.failure = `${dir} transformation: fraction equation did not converge (Φ = ${phi.toExponential(3)})`;
    }
    return x;
  }

  /**
   * Trial values of Φ_fwd and Φ_rev with the base internal state frozen (−∞ where not allowed).
   * Both evaluations are at Δξ = 0, so either leaves the elastic trial stress in the buffers.
   */
  private trialPhis(out: { fwd: number; rev: number }): void {
    out.fwd = this.base.xi < 1 ? this.evalFromBase('forward', this.base.xi, false) : -Infinity;
    out.rev = this.base.xi > 0 ? this.evalFromBase('reverse', this.base.xi, false) : -Infinity;
  }

  private readonly trial = { fwd: 0, rev: 0 };
  private readonly trialOld = { fwd: 0, rev: 0 };

  /** Runs one phase from the base state and moves the base to its end. */
  private runPhase(dir: Direction): boolean {
    if (dir === 'reverse') this.setReverseDirection();
    this.phaseStart.copyFrom(this.base);
    const xi = this.solveFraction(dir);
    this.commitPhaseEnd(xi, dir);
    return dir === 'forward' ? xi < 1 : xi > 0;
  }

  update(
    input: MaterialPointInput,
    stateOld: Float64Array,
    oldOffset: number,
    state: Float64Array,
    newOffset: number,
    out: MaterialPointOutput,
  ): void {
    this.failure = '';
    this.base.load(stateOld, oldOffset, this.params.plastic);
    for (let i = 0; i < 6; i++) this.eps[i] = input.strain[i];
    this.temp = input.temperature;
    const tol = this.tolPhi;
    this.trialPhis(this.trial);
    let mode: 'elastic' | Direction = 'elastic';
    let transforming = false;
    if (this.trial.fwd > tol || this.trial.rev > tol) {
      let first: Direction;
      if (this.trial.fwd > tol && this.trial.rev > tol) {
        // Both positive after a large or reversing increment: follow the one that grew more
        // since the converged state (pitfall 2), then let the other one correct if needed.
        copy6(input.strainOld, this.eps);
        this.temp = input.temperatureOld;
        this.trialPhis(this.trialOld);
        copy6(input.strain, this.eps);
        this.temp = input.temperature;
        first = this.trial.fwd - this.trialOld.fwd >= this.trial.rev - this.trialOld.rev ? 'forward' : 'reverse';
      } else first = this.trial.fwd > tol ? 'forward' : 'reverse';
      transforming = this.runPhase(first);
      mode = first;
      // The other direction may be driven at the end of this phase (a reverse that completes
      // before forward starts, or a non-proportional increment that reverts some variants and
      // forms others): run it from the end of this phase (a forward phase refreshes the reversal
      // memory). MAX_PHASES bounds further alternation: under strongly non-proportional loading
      // the model chatters between the two directions (it has no simultaneous forward/reverse
      // mode; more alternations do not converge quickly), so the remaining violation is left to
      // the next increment instead of failing this one, and the tangent is the last phase's.
      let next: Direction = first === 'forward' ? 'reverse' : 'forward';
      for (let k = 0; k < MAX_PHASES; k++) {
        const allowed = next === 'forward' ? this.base.xi < 1 : this.base.xi > 0;
        if (!allowed) break;
        if (!(this.evalFromBase(next, this.base.xi, false) > tol)) break;
        transforming = this.runPhase(next);
        mode = next;
        next = next === 'forward' ? 'reverse' : 'forward';
      }
      // re-evaluate at the end state of the last phase for stress and tangent
      this.reevaluateEnd(mode);
    } else this.commitPlastic(); // no transformation: the trial evaluation (Δξ = 0) holds σ, Ξ and Δp
    this.base.store(state, newOffset, this.params.plastic);
    for (let i = 0; i < 6; i++) out.stress[i] = this.sig[i];
    this.writeTangent(out.tangent, mode !== 'elastic' && transforming);
    let finite = true;
    for (let i = 0; i < 6; i++) finite = finite && Number.isFinite(this.sig[i]);
    out.ok = finite && this.failure === '';
    out.message = out.ok ? '' : this.failure || 'non-finite stress in the Lagoudas 2012 update';
  }

  /**
   * The probe of the other direction overwrote the work buffers: evaluate the end state again
   * from the start of the last phase, so stress and tangent carry that phase's Δξ.
   */
  private reevaluateEnd(mode: Direction): void {
    const xi = this.base.xi;
    this.base.copyFrom(this.phaseStart);
    this.evalFromBase(mode, xi, true);
    this.commitPhaseEnd(xi, mode);
  }

  /** Adds the plastic increment of the last evaluation to the base. */
  private commitPlastic(): void {
    if (!(this.dpC > 0)) return;
    const d = SQ32 * this.dpC;
    for (let i = 0; i < 6; i++) this.base.ep[i] += d * this.nhat[i];
    this.base.p += this.dpC;
  }

  private commitPhaseEnd(xi: number, dir: Direction): void {
    this.commitPlastic();
    const dxi = xi - this.base.xi;
    const lam = dir === 'forward' ? this.lam : this.lamR;
    for (let i = 0; i < 6; i++) this.base.et[i] += dxi * lam[i];
    this.base.xi = xi;
    if (dir === 'forward') {
      copy6(this.base.et, this.base.etr);
      this.base.xir = xi;
    } else if (xi <= 0) {
      this.base.xi = 0;
      zero6(this.base.et);
      zero6(this.base.etr);
      this.base.xir = 0;
    }
  }

  /** Ξ − (ΞN)⊗(Ξ ∂Φ/∂σ)/den while transforming, Ξ otherwise. */
  private writeTangent(t: Float64Array, transforming: boolean): void {
    const p = this.params;
    const kv = 1 / (3 * this.sC * (1 - 2 * p.nu));
    const ia = 1 / this.aC;
    const dn = this.ibC - ia;
    const n = this.nhat;
    for (let i = 0; i < 6; i++) {
      for (let j = 0; j < 6; j++) {
        let v = dn * n[i] * n[j];
        if (i === j) v += ia;
        if (i < 3 && j < 3) v += kv - ia / 3;
        t[i * 6 + j] = v;
      }
    }
    if (!transforming) return;
    this.applyXi(this.phiS, this.xiPhi);
    const inv = 1 / this.denC;
    for (let i = 0; i < 6; i++) {
      const ci = this.xiN[i] * inv;
      for (let j = 0; j < 6; j++) t[i * 6 + j] -= ci * this.xiPhi[j];
    }
  }
}

/** Calibrates and builds the model; throws with a message naming the measured quantity to fix. */
export function createLagoudas2012(measured: Lagoudas2012Measured): Lagoudas2012Material {
  const cal = calibrateLagoudas2012(measured);
  if (!cal.ok) throw new Error(cal.message);
  return new Lagoudas2012Material(cal.constants);
}
