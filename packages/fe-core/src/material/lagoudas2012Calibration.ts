/**
 * Calibration of the phase-fraction SMA model (Lagoudas et al. 2012, Int. J. Plasticity
 * 32–33:155–183) from quantities a laboratory measures.
 *
 * Inputs: stress-free transformation temperatures Ms0, Mf0, As0, Af0; the slopes C_M, C_A of the
 * forward/reverse transformation lines in the stress–temperature plane, read at a calibration
 * stress σ*; moduli E_A, E_M; the current-maximum-transformation-strain law
 * H_cur(σ̄) = H_min + (H_sat − H_min)(1 − exp(−k_t σ̄)); smoothing exponents n1..n4.
 *
 * Outputs: the model constants ρΔs0, D, a1, a2, a3, ρΔu0, Y0 chosen so that at zero stress the
 * model transforms exactly between Ms0…Mf0 (cooling) and As0…Af0 (heating), and so that the
 * uniaxial start lines have the measured slopes C_M, C_A at σ*.
 *
 * Note: with k_t = 0 the law gives H_cur ≡ H_min; for a stress-independent strain set
 * H_min = H_sat.
 */

export interface Lagoudas2012Measured {
  E_A: number;
  E_M: number;
  nu: number;
  alpha_A: number;
  alpha_M: number;
  T_ref: number;
  Ms0: number;
  Mf0: number;
  As0: number;
  Af0: number;
  C_M: number;
  C_A: number;
  sigma_star: number;
  H_min: number;
  H_sat: number;
  k_t: number;
  n1: number;
  n2: number;
  n3: number;
  n4: number;
  /** Optional J2 plastic strain: yield stresses of austenite and martensite (mixed by ξ), linear isotropic hardening. */
  plasticity?: { sigma_y_A: number; sigma_y_M: number; H_iso?: number };
}

export interface Lagoudas2012Constants extends Lagoudas2012Measured {
  /** ρΔs0 (MPa/°C), negative. */
  rhoDs0: number;
  /** Stress-direction asymmetry of the forward/reverse slopes. */
  D: number;
  a1: number;
  a2: number;
  a3: number;
  rhoDu0: number;
  Y0: number;
  /** 1/E_M − 1/E_A (1/MPa). */
  dS: number;
  /** α_M − α_A (1/°C). */
  dAlpha: number;
  /** Regularising stress for the flow direction at vanishing von Mises stress (MPa). */
  sigmaReg: number;
  /** J2 plasticity on: yield σ_y(ξ, p) = yA + ξ·dY + Hiso·p. */
  plastic: boolean;
  yA: number;
  dY: number;
  Hiso: number;
}

export type CalibrationResult =
  | { ok: true; constants: Lagoudas2012Constants }
  | { ok: false; field: string; message: string };

/** H_cur(σ̄) of the model. */
export function hCur(p: Pick<Lagoudas2012Measured, 'H_min' | 'H_sat' | 'k_t'>, sigmaBar: number): number {
  return p.H_min + (p.H_sat - p.H_min) * (1 - Math.exp(-p.k_t * sigmaBar));
}

/** dH_cur/dσ̄. */
export function hCurSlope(p: Pick<Lagoudas2012Measured, 'H_min' | 'H_sat' | 'k_t'>, sigmaBar: number): number {
  return (p.H_sat - p.H_min) * p.k_t * Math.exp(-p.k_t * sigmaBar);
}

function reject(field: string, message: string): CalibrationResult {
  return { ok: false, field, message: `${field}: ${message}` };
}

function checkInputs(m: Lagoudas2012Measured): CalibrationResult | null {
  const finiteFields: (keyof Lagoudas2012Measured)[] = [
    'E_A', 'E_M', 'nu', 'alpha_A', 'alpha_M', 'T_ref', 'Ms0', 'Mf0', 'As0', 'Af0',
    'C_M', 'C_A', 'sigma_star', 'H_min', 'H_sat', 'k_t', 'n1', 'n2', 'n3', 'n4',
  ];
  for (const f of finiteFields) {
    if (!Number.isFinite(m[f])) return reject(f, 'must be a finite number');
  }
  for (const f of ['E_A', 'E_M', 'C_M', 'C_A', 'sigma_star', 'H_sat'] as const) {
    if (!(m[f] > 0)) return reject(f, 'must be > 0');
  }
  if (!(m.nu > -1 && m.nu < 0.5)) return reject('nu', 'must lie in (−1, 0.5)');
  if (m.H_min < 0) return reject('H_min', 'must be ≥ 0');
  if (m.H_min > m.H_sat) return reject('H_min', `must not exceed H_sat (${m.H_sat}); H_min is the strain at low stress, H_sat the saturated one`);
  if (m.k_t < 0) return reject('k_t', 'must be ≥ 0');
  for (const f of ['n1', 'n2', 'n3', 'n4'] as const) {
    if (!(m[f] > 0 && m[f] <= 1)) return reject(f, 'smoothing exponents must lie in (0, 1]');
  }
  if (m.plasticity) {
    const { sigma_y_A, sigma_y_M, H_iso = 0 } = m.plasticity;
    if (!(sigma_y_A > 0)) return reject('plasticity.sigma_y_A', 'must be > 0');
    if (!(sigma_y_M > 0)) return reject('plasticity.sigma_y_M', 'must be > 0');
    if (!(H_iso >= 0)) return reject('plasticity.H_iso', 'must be ≥ 0');
  }
  if (!(m.Ms0 > m.Mf0)) return reject('Mf0', `martensite finish Mf0 (${m.Mf0}) must be below martensite start Ms0 (${m.Ms0})`);
  if (!(m.Af0 > m.As0)) return reject('Af0', `austenite finish Af0 (${m.Af0}) must be above austenite start As0 (${m.As0})`);
  return null;
}

/** Turns measured properties into model constants, or names the measured quantity to fix. */
export function calibrateLagoudas2012(m: Lagoudas2012Measured): CalibrationResult {
  const bad = checkInputs(m);
  if (bad) return bad;
  const dS = 1 / m.E_M - 1 / m.E_A;
  const s = m.sigma_star;
  // Q = d(σ H_cur)/dσ at σ*: the transformation strain "seen" by the slope of the start line.
  const Q = hCur(m, s) + s * hCurSlope(m, s);
  if (!(Q > 0)) return reject('H_sat', 'the transformation strain at sigma_star is zero; give H_min/H_sat > 0');
  const Qs = Q + s * dS;
  if (!(Qs > 0)) {
    return reject('E_M', `H_cur + σ*·(1/E_M − 1/E_A) ≤ 0 at sigma_star = ${s} MPa: E_M is too large against E_A, or reduce sigma_star`);
  }
  const rhoDs0 = (-2 * m.C_M * m.C_A * Qs) / (m.C_M + m.C_A);
  const D = ((m.C_M - m.C_A) * Qs) / ((m.C_M + m.C_A) * Q);
  if (!(Math.abs(D) < 1)) {
    return reject('C_A', `the slopes C_M = ${m.C_M} and C_A = ${m.C_A} MPa/°C are too different (|D| = ${Math.abs(D).toFixed(3)} ≥ 1)`);
  }
  const a1 = rhoDs0 * (m.Mf0 - m.Ms0);
  const a2 = rhoDs0 * (m.As0 - m.Af0);
  const a3 =
    (-a1 / 4) * (1 + 1 / (m.n1 + 1) - 1 / (m.n2 + 1)) + (a2 / 4) * (1 + 1 / (m.n3 + 1) - 1 / (m.n4 + 1));
  const rhoDu0 = 0.5 * rhoDs0 * (m.Ms0 + m.Af0);
  const Y0 = 0.5 * rhoDs0 * (m.Ms0 - m.Af0) - a3;
  if (!(Y0 > 0)) {
    return reject(
      'As0',
      `the transformation temperatures leave no hysteresis (critical driving force Y0 = ${Y0.toPrecision(3)} ≤ 0): ` +
        `As0 + Af0 must exceed Ms0 + Mf0 (check Ms0, Mf0, As0, Af0)`,
    );
  }
  // Regularisation of the flow direction where σ̄ → 0: small against any stress of interest,
  // large enough to keep the deviatoric tangent finite in stress-free transformation.
  const sigmaReg = 0.1;
  return {
    ok: true,
    constants: {
      ...m, rhoDs0, D, a1, a2, a3, rhoDu0, Y0, dS, dAlpha: m.alpha_M - m.alpha_A, sigmaReg,
      plastic: m.plasticity !== undefined,
      yA: m.plasticity?.sigma_y_A ?? Infinity,
      dY: m.plasticity ? m.plasticity.sigma_y_M - m.plasticity.sigma_y_A : 0,
      Hiso: m.plasticity?.H_iso ?? 0,
    },
  };
}
