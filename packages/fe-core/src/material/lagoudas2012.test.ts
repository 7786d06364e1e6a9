import { describe, expect, it } from 'vitest';
import { calibrateLagoudas2012, hCur, hCurSlope, type Lagoudas2012Measured } from './lagoudas2012Calibration';
import { createLagoudas2012, LAGOUDAS2012_STATE_SIZE } from './lagoudas2012';
import { runMaterialPoint, type MaterialPointRow } from './materialPoint';
import { assertCheck, extrapolateTo, interpolateAt, legRows } from './materialPointTesting';
import { ReducedMaterial } from './reduce';
import { driveReduced, tangentErrorReduced, tangentErrorSolid } from './reduceTesting';
import { createMaterialPointOutput } from './types';

const SUITE = 'SMA: Lagoudas 2012';
const UNIAXIAL = 'closed form, Lagoudas et al. 2012 uniaxial reduction';
const CALIB = 'closed form, Lagoudas et al. 2012 calibration relations';

/** Constant H, equal moduli, no thermal expansion, n = 1, C_M ≠ C_A (D ≠ 0). */
const L1: Lagoudas2012Measured = {
  E_A: 55000, E_M: 55000, nu: 0.3, alpha_A: 0, alpha_M: 0, T_ref: 20,
  Ms0: 18, Mf0: 2, As0: 22, Af0: 38, C_M: 6.5, C_A: 8, sigma_star: 200,
  H_min: 0.045, H_sat: 0.045, k_t: 0, n1: 1, n2: 1, n3: 1, n4: 1,
};

/** Stress-dependent H, E_A ≠ E_M, C_M ≠ C_A, n = 1. */
const L2: Lagoudas2012Measured = {
  E_A: 62000, E_M: 38000, nu: 0.33, alpha_A: 0, alpha_M: 0, T_ref: 20,
  Ms0: 12, Mf0: -6, As0: 16, Af0: 34, C_M: 7, C_A: 8.5, sigma_star: 250,
  H_min: 0.015, H_sat: 0.05, k_t: 0.012, n1: 1, n2: 1, n3: 1, n4: 1,
};

const inside = (v: number) => v > 0.02 && v < 0.98;

/** Model constants recomputed here from the published calibration relations (the test's oracle). */
function oracleConstants(m: Lagoudas2012Measured) {
  const dS = 1 / m.E_M - 1 / m.E_A;
  const Q = hCur(m, m.sigma_star) + m.sigma_star * hCurSlope(m, m.sigma_star);
  const rhoDs0 = (-2 * m.C_M * m.C_A * (Q + m.sigma_star * dS)) / (m.C_M + m.C_A);
  const D = ((m.C_M - m.C_A) * (Q + m.sigma_star * dS)) / ((m.C_M + m.C_A) * Q);
  return { dS, rhoDs0, D };
}

/** Temperature on a transformation line at uniaxial stress σ (α = 0): forward (1−D), reverse (1+D). */
function lineTemperature(m: Lagoudas2012Measured, sigma: number, T0: number, dir: 'forward' | 'reverse'): number {
  const { dS, rhoDs0, D } = oracleConstants(m);
  const f = dir === 'forward' ? 1 - D : 1 + D;
  return T0 - (f * sigma * hCur(m, sigma) + 0.5 * dS * sigma * sigma) / rhoDs0;
}

function pseudoelastic(m: Lagoudas2012Measured, T: number, strain: number, n: number) {
  const r = runMaterialPoint(createLagoudas2012(m), {
    control: 'strain',
    path: [{ value: 0, temperature: T }, { value: strain, temperature: T, increments: n }, { value: 0, temperature: T, increments: n }],
  });
  expect(r.ok, r.message).toBe(true);
  return r;
}

function isobaric(m: Lagoudas2012Measured, sigma: number, Thigh: number, Tlow: number, perKelvin = 10) {
  const n = Math.round((Thigh - Tlow) * perKelvin);
  const r = runMaterialPoint(createLagoudas2012(m), {
    control: 'stress',
    path: [
      { value: 0, temperature: Thigh },
      { value: sigma, temperature: Thigh, increments: 40 },
      { value: sigma, temperature: Tlow, increments: n },
      { value: sigma, temperature: Thigh, increments: n },
    ],
  });
  expect(r.ok, r.message).toBe(true);
  return r;
}

describe('Lagoudas 2012: calibration', () => {
  it('rejects impossible measurements naming the quantity to fix', () => {
    const cases: [Partial<Lagoudas2012Measured>, string][] = [
      [{ Mf0: 20 }, 'Mf0'],
      [{ As0: 40 }, 'Af0'],
      [{ As0: -10, Af0: 5 }, 'As0'], // As0 + Af0 < Ms0 + Mf0: no hysteresis, Y0 ≤ 0
      [{ C_M: 60, C_A: 1 }, 'C_A'], // |D| ≥ 1
      [{ n2: 1.5 }, 'n2'],
      [{ H_min: 0.06 }, 'H_min'],
      [{ E_M: 1e9, E_A: 1000, sigma_star: 900 }, 'E_M'],
    ];
    for (const [patch, field] of cases) {
      const r = calibrateLagoudas2012({ ...L2, ...patch });
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.field).toBe(field);
        expect(r.message.startsWith(field)).toBe(true);
      }
    }
    expect(() => createLagoudas2012({ ...L1, Ms0: 1 })).toThrow(/Mf0/);
  });

  it('reproduces Ms0, Mf0, As0, Af0 in a stress-free thermal cycle', () => {
    const r = isobaric(L2, 0, 60, -30, 10);
    const cool = legRows(r.rows, 2);
    const heat = legRows(r.rows, 3);
    const found = {
      Ms0: extrapolateTo(cool, 'temperature', 'xi', 0, inside),
      Mf0: extrapolateTo(cool, 'temperature', 'xi', 1, inside),
      As0: extrapolateTo(heat, 'temperature', 'xi', 1, inside),
      Af0: extrapolateTo(heat, 'temperature', 'xi', 0, inside),
    };
    for (const k of ['Ms0', 'Mf0', 'As0', 'Af0'] as const) {
      assertCheck({ suite: SUITE, name: `calibrated model, stress-free ${k}`, computed: found[k], target: L2[k], unit: '°C', tolerance: 1e-6, absolute: true, source: CALIB });
    }
  });

  it('has the measured slopes C_M and C_A at sigma_star', () => {
    const d = 2;
    const lo = isobaric(L2, L2.sigma_star - d, 90, 0, 4);
    const hi = isobaric(L2, L2.sigma_star + d, 90, 0, 4);
    const ms = (r: typeof lo) => extrapolateTo(legRows(r.rows, 2), 'temperature', 'xi', 0, inside);
    const as = (r: typeof lo) => extrapolateTo(legRows(r.rows, 3), 'temperature', 'xi', 1, inside);
    const cm = (2 * d) / (ms(hi) - ms(lo));
    const ca = (2 * d) / (as(hi) - as(lo));
    assertCheck({ suite: SUITE, name: 'calibrated model, forward slope dσ/dT at σ*', computed: cm, target: L2.C_M, unit: 'MPa/°C', tolerance: 1e-4, source: CALIB });
    assertCheck({ suite: SUITE, name: 'calibrated model, reverse slope dσ/dT at σ*', computed: ca, target: L2.C_A, unit: 'MPa/°C', tolerance: 1e-4, source: CALIB });
  });
});

describe('Lagoudas 2012: pseudoelastic loop above Af (constant H, n = 1)', () => {
  const T = 55;
  const r = pseudoelastic(L1, T, 0.06, 600);
  const load = legRows(r.rows, 1);
  const unload = legRows(r.rows, 2);
  const E = L1.E_A;
  const H = L1.H_sat;
  const sFs = L1.C_M * (T - L1.Ms0);
  const sFf = L1.C_M * (T - L1.Mf0);
  const sRs = L1.C_A * (T - L1.As0);
  const sRf = L1.C_A * (T - L1.Af0);
  const kF = 1 / (1 / E + H / (L1.C_M * (L1.Ms0 - L1.Mf0)));
  const kR = 1 / (1 / E + H / (L1.C_A * (L1.Af0 - L1.As0)));

  it('transforms between C_M(T − Ms0) and C_M(T − Mf0), reverts between C_A(T − As0) and C_A(T − Af0)', () => {
    const cases: [string, number, number][] = [
      ['forward start stress', extrapolateTo(load, 'stress', 'xi', 0, inside), sFs],
      ['forward finish stress', extrapolateTo(load, 'stress', 'xi', 1, inside), sFf],
      ['reverse start stress', extrapolateTo(unload, 'stress', 'xi', 1, inside), sRs],
      ['reverse finish stress', extrapolateTo(unload, 'stress', 'xi', 0, inside), sRf],
    ];
    for (const [name, computed, target] of cases) {
      assertCheck({ suite: SUITE, name: `pseudoelastic ${T} °C: ${name}`, computed, target, unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
    }
    expect(load[load.length - 1].xi).toBe(1);
    expect(unload[unload.length - 1].xi).toBe(0);
    expect(unload[unload.length - 1].transformationStrain).toBe(0);
  });

  it('has the plateau tangent [1/E + H/(C_M(Ms0 − Mf0))]⁻¹ and the closed-form stress at 3 % strain', () => {
    const s2 = interpolateAt(load, 'strain', 'stress', 0.02);
    const s3 = interpolateAt(load, 'strain', 'stress', 0.03);
    assertCheck({ suite: SUITE, name: 'plateau tangent on loading (n = 1)', computed: (s3 - s2) / 0.01, target: kF, unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
    assertCheck({ suite: SUITE, name: 'stress at 3 % strain, loading', computed: s3, target: sFs + kF * (0.03 - sFs / E), unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
    const u3 = interpolateAt(unload, 'strain', 'stress', 0.03);
    assertCheck({ suite: SUITE, name: 'stress at 3 % strain, unloading', computed: u3, target: sRf + kR * (0.03 - sRf / E), unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
    // beyond the plateau: elastic martensite
    const last = load[load.length - 1];
    assertCheck({ suite: SUITE, name: 'stress at 6 % strain (fully martensitic)', computed: last.stress, target: sFf + E * (0.06 - sFf / E - H), unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
  });

  it('gives the same end states with 3 increments per leg, and through a tension-to-compression increment', () => {
    const coarse = pseudoelastic(L1, T, 0.06, 3);
    const end = legRows(coarse.rows, 1).at(-1) as MaterialPointRow;
    expect(Math.abs(end.stress - (sFf + E * (0.06 - sFf / E - H)))).toBeLessThan(1e-6 * sFf);
    expect(coarse.rows.at(-1)?.xi).toBe(0);
    // one increment from full tension martensite to −6 %: reverse then forward in compression
    const flip = runMaterialPoint(createLagoudas2012(L1), {
      control: 'strain',
      path: [{ value: 0, temperature: T }, { value: 0.06, temperature: T, increments: 60 }, { value: -0.06, temperature: T, increments: 1 }],
    });
    expect(flip.ok, flip.message).toBe(true);
    const f = flip.rows.at(-1) as MaterialPointRow;
    expect(f.xi).toBe(1);
    assertCheck({ suite: SUITE, name: 'single increment tension → compression, stress at −6 %', computed: f.stress, target: -(sFf + E * (0.06 - sFf / E - H)), unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
  });

  it('partial transformation and reversal restart on the closed-form lines', () => {
    const run = runMaterialPoint(createLagoudas2012(L1), {
      control: 'strain',
      path: [
        { value: 0, temperature: T },
        { value: 0.025, temperature: T, increments: 250 },
        { value: 0.004, temperature: T, increments: 210 },
        { value: 0.05, temperature: T, increments: 460 },
      ],
    });
    expect(run.ok, run.message).toBe(true);
    const leg1 = legRows(run.rows, 1);
    const leg2 = legRows(run.rows, 2);
    const leg3 = legRows(run.rows, 3);
    const xiR = leg1.at(-1)!.xi;
    const xiM = leg2.at(-1)!.xi;
    expect(xiR).toBeGreaterThan(0.3);
    expect(xiM).toBeGreaterThan(0.01);
    expect(xiM).toBeLessThan(0.1);
    const between = (a: number, b: number) => (v: number) => v > a + 1e-3 && v < b - 1e-3;
    const rs = extrapolateTo(leg2, 'stress', 'xi', xiR, between(xiM, xiR));
    assertCheck({ suite: SUITE, name: `reverse start after partial forward (ξ = ${xiR.toFixed(3)})`, computed: rs, target: L1.C_A * (T - L1.As0 - (1 - xiR) * (L1.Af0 - L1.As0)), unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
    const fs = extrapolateTo(leg3, 'stress', 'xi', xiM, between(xiM, 1));
    assertCheck({ suite: SUITE, name: `forward restart after partial reverse (ξ = ${xiM.toFixed(3)})`, computed: fs, target: L1.C_M * (T - L1.Ms0 + xiM * (L1.Ms0 - L1.Mf0)), unit: 'MPa', tolerance: 1e-6, source: UNIAXIAL });
    // Reversal memory keeps εᵗ = H ξ along the whole history (uniaxial, constant H).
    let worst = 0;
    for (const row of run.rows) if (row.xi > 0.01) worst = Math.max(worst, Math.abs(row.transformationStrain / row.xi - L1.H_sat) / L1.H_sat);
    expect(worst).toBeLessThan(1e-6);
  });
});

describe('Lagoudas 2012: isobaric cooling and heating under load', () => {
  it('constant H: transforms between Ms0 + σ/C_M … Mf0 + σ/C_M and As0 + σ/C_A … Af0 + σ/C_A, jump H', () => {
    const sigma = 150;
    const r = isobaric(L1, sigma, 75, -10, 10);
    const cool = legRows(r.rows, 2);
    const heat = legRows(r.rows, 3);
    const cases: [string, number, number][] = [
      ['Ms(σ)', extrapolateTo(cool, 'temperature', 'xi', 0, inside), L1.Ms0 + sigma / L1.C_M],
      ['Mf(σ)', extrapolateTo(cool, 'temperature', 'xi', 1, inside), L1.Mf0 + sigma / L1.C_M],
      ['As(σ)', extrapolateTo(heat, 'temperature', 'xi', 1, inside), L1.As0 + sigma / L1.C_A],
      ['Af(σ)', extrapolateTo(heat, 'temperature', 'xi', 0, inside), L1.Af0 + sigma / L1.C_A],
    ];
    for (const [name, computed, target] of cases) {
      // 2e-5 K: the direction regularisation σ_r = 0.1 MPa shifts the lines by ≈ (σ_r/σ)²σ/(2C) ≈ 5e-6 K here
      assertCheck({ suite: SUITE, name: `isobaric ${sigma} MPa, constant H: ${name}`, computed, target, unit: '°C', tolerance: 2e-5, absolute: true, source: UNIAXIAL });
    }
    const jump = cool.at(-1)!.strain - cool[0].strain;
    assertCheck({ suite: SUITE, name: `isobaric ${sigma} MPa, constant H: strain jump`, computed: jump, target: L1.H_sat, unit: '-', tolerance: 1e-6, source: UNIAXIAL });
    expect(Math.abs(heat.at(-1)!.strain - cool[0].strain)).toBeLessThan(1e-12);
  });

  it('large temperature steps (5 K): ξ(T) exact at every increment, completion detected at the bound (no clamping)', () => {
    const sigma = 150;
    const Ms = L1.Ms0 + sigma / L1.C_M;
    const Mf = L1.Mf0 + sigma / L1.C_M;
    const As = L1.As0 + sigma / L1.C_A;
    const Af = L1.Af0 + sigma / L1.C_A;
    const r = runMaterialPoint(createLagoudas2012(L1), {
      control: 'stress',
      path: [
        { value: 0, temperature: 77 },
        { value: sigma, temperature: 77, increments: 5 },
        { value: sigma, temperature: -3, increments: 16 },
        { value: sigma, temperature: 77, increments: 16 },
      ],
    });
    expect(r.ok, r.message).toBe(true);
    const clamp = (x: number) => Math.min(1, Math.max(0, x));
    let worst = 0;
    for (const row of legRows(r.rows, 2)) worst = Math.max(worst, Math.abs(row.xi - clamp((Ms - row.temperature) / (Ms - Mf))));
    for (const row of legRows(r.rows, 3)) worst = Math.max(worst, Math.abs(row.xi - clamp((Af - row.temperature) / (Af - As))));
    assertCheck({ suite: SUITE, name: 'isobaric 150 MPa in 5 K steps: max |ξ − ξ_closed(T)| over all increments', computed: worst, target: 0, unit: '-', tolerance: 1e-6, absolute: true, source: UNIAXIAL });
  });

  it('E_A ≠ E_M and stress-dependent H: lines solve (1∓D)σH_cur(σ) + ½ΔSσ² = −ρΔs0(T − T0), jump H_cur(σ) + σΔS', () => {
    const sigma = 180;
    const r = isobaric(L2, sigma, 90, -20, 10);
    const cool = legRows(r.rows, 2);
    const heat = legRows(r.rows, 3);
    const cases: [string, number, number][] = [
      ['Ms(σ)', extrapolateTo(cool, 'temperature', 'xi', 0, inside), lineTemperature(L2, sigma, L2.Ms0, 'forward')],
      ['Mf(σ)', extrapolateTo(cool, 'temperature', 'xi', 1, inside), lineTemperature(L2, sigma, L2.Mf0, 'forward')],
      ['As(σ)', extrapolateTo(heat, 'temperature', 'xi', 1, inside), lineTemperature(L2, sigma, L2.As0, 'reverse')],
      ['Af(σ)', extrapolateTo(heat, 'temperature', 'xi', 0, inside), lineTemperature(L2, sigma, L2.Af0, 'reverse')],
    ];
    for (const [name, computed, target] of cases) {
      assertCheck({ suite: SUITE, name: `isobaric ${sigma} MPa, H(σ), E_A ≠ E_M: ${name}`, computed, target, unit: '°C', tolerance: 1e-5, absolute: true, source: UNIAXIAL });
    }
    const jump = cool.at(-1)!.strain - cool[0].strain;
    const target = hCur(L2, sigma) + sigma * (1 / L2.E_M - 1 / L2.E_A);
    assertCheck({ suite: SUITE, name: `isobaric ${sigma} MPa, H(σ), E_A ≠ E_M: strain jump`, computed: jump, target, unit: '-', tolerance: 1e-5, source: UNIAXIAL });
  });

  it('mixes thermal expansion by ξ: free strain α_A ΔT in austenite, α_M ΔT in martensite', () => {
    const m = { ...L1, alpha_A: 11e-6, alpha_M: 6.6e-6 };
    const r = runMaterialPoint(createLagoudas2012(m), {
      control: 'stress',
      path: [{ value: 0, temperature: 100 }, { value: 0, temperature: 60, increments: 40 }, { value: 0, temperature: -40, increments: 200 }, { value: 0, temperature: -80, increments: 40 }],
    });
    expect(r.ok, r.message).toBe(true);
    const a = legRows(r.rows, 1);
    const c = legRows(r.rows, 3);
    assertCheck({ suite: SUITE, name: 'stress-free austenite, thermal strain over −40 °C', computed: a.at(-1)!.strain - a[0].strain, target: -40 * 11e-6, unit: '-', tolerance: 1e-9, source: 'closed form, linear thermal expansion α_A ΔT' });
    assertCheck({ suite: SUITE, name: 'stress-free martensite, thermal strain over −40 °C', computed: c.at(-1)!.strain - c[0].strain, target: -40 * 6.6e-6, unit: '-', tolerance: 1e-9, source: 'closed form, linear thermal expansion α_M ΔT' });
    expect(c.at(-1)!.xi).toBe(1);
    expect(Math.abs(c.at(-1)!.stress)).toBeLessThan(1e-6);
  });

  it('with n < 1 smoothing, stress-free transformation still starts at Ms0 and As0 and completes', () => {
    const m = { ...L2, n1: 0.5, n2: 0.6, n3: 0.55, n4: 0.7 };
    const r = isobaric(m, 0, 60, -30, 20);
    expect(r.cutBacks).toBe(0);
    const cool = legRows(r.rows, 2);
    const heat = legRows(r.rows, 3);
    const firstAbove = (rows: MaterialPointRow[], pred: (x: MaterialPointRow) => boolean) => rows.find(pred)!.temperature;
    // first cooling row with ξ > 0 lies within one increment (0.05 K) below Ms0
    expect(L2.Ms0 - firstAbove(cool, (x) => x.xi > 0)).toBeLessThanOrEqual(0.05 + 1e-9);
    expect(L2.Ms0 - firstAbove(cool, (x) => x.xi > 0)).toBeGreaterThanOrEqual(0);
    expect(cool.at(-1)!.xi).toBe(1);
    expect(firstAbove(heat, (x) => x.xi < 1) - L2.As0).toBeLessThanOrEqual(0.05 + 1e-9);
    expect(heat.at(-1)!.xi).toBe(0);
  });
});

describe('Lagoudas 2012: consistent tangent against finite differences', () => {
  const m = createLagoudas2012({ ...L2, alpha_A: 11e-6, alpha_M: 6.6e-6 });
  const T = 40;
  const dir = [1, -0.35, -0.4, 0.3, 0.1, 0.25];
  const scaled = (s: number) => Float64Array.from(dir, (d) => d * s);
  const step = (strain: Float64Array, old: Float64Array) => {
    const state = new Float64Array(LAGOUDAS2012_STATE_SIZE);
    const out = createMaterialPointOutput();
    m.update({ strain, strainOld: new Float64Array(6), temperature: T, temperatureOld: T }, old, 0, state, 0, out);
    expect(out.ok, out.message).toBe(true);
    return { state, out };
  };
  const virgin = new Float64Array(LAGOUDAS2012_STATE_SIZE);
  m.initState(virgin, 0, T);
  const mid = step(scaled(0.02), virgin).state;
  const xiMid = mid[6];

  it('in every branch: elastic, forward, forward to ξ = 1, reverse, reverse to ξ = 0', () => {
    const cases: [string, Float64Array, Float64Array, (xi: number) => boolean][] = [
      ['elastic', scaled(0.002), virgin, (xi) => xi === 0],
      ['forward from austenite', scaled(0.02), virgin, (xi) => xi > 0 && xi < 1],
      ['forward from ξ > 0', scaled(0.03), mid, (xi) => xi > xiMid && xi < 1],
      ['forward completing', scaled(0.09), mid, (xi) => xi === 1],
      ['reverse', scaled(0.016), mid, (xi) => xi < xiMid && xi > 0],
      ['reverse completing', scaled(0.0002), mid, (xi) => xi === 0],
    ];
    for (const [name, strain, old, branch] of cases) {
      const { state } = step(strain, old);
      expect(branch(state[6]), `${name}: ξ = ${state[6]}`).toBe(true);
      const err = tangentErrorSolid(m, { strain, strainOld: new Float64Array(6), temperature: T, temperatureOld: T }, old, 1e-8);
      expect(err, name).toBeLessThan(2e-6);
    }
  });

  it('at vanishing deviatoric stress (stress-free cooling through Ms0): finite, consistent tangent', () => {
    // σ_r regularises Λ = (3/2)H σ'/σ̄_r, so the deviatoric stiffness stays positive while martensite forms at σ' ≈ 0.
    const hot = new Float64Array(LAGOUDAS2012_STATE_SIZE);
    m.initState(hot, 0, 30);
    const Tc = 2; // between Ms0 = 12 and Mf0 = −6
    const tiny = Float64Array.from(dir, (d) => d * 1e-7);
    const state = new Float64Array(LAGOUDAS2012_STATE_SIZE);
    const out = createMaterialPointOutput();
    m.update({ strain: tiny, strainOld: new Float64Array(6), temperature: Tc, temperatureOld: 30 }, hot, 0, state, 0, out);
    expect(out.ok, out.message).toBe(true);
    expect(state[6]).toBeGreaterThan(0.3);
    expect(out.tangent[35]).toBeGreaterThan(0); // shear stiffness
    const err = tangentErrorSolid(m, { strain: tiny, strainOld: new Float64Array(6), temperature: Tc, temperatureOld: 30 }, hot, 1e-10);
    expect(err).toBeLessThan(1e-5);
  });

  it('is non-symmetric when D ≠ 0 and H depends on stress (and in reverse)', () => {
    for (const [strain, old] of [[scaled(0.03), mid], [scaled(0.016), mid]] as const) {
      const t = step(strain, old).out.tangent;
      let asym = 0;
      let size = 0;
      for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) {
        asym = Math.max(asym, Math.abs(t[i * 6 + j] - t[j * 6 + i]));
        size = Math.max(size, Math.abs(t[i * 6 + j]));
      }
      expect(asym / size).toBeGreaterThan(1e-4);
    }
  });

  it('through the uniaxial, plane-stress, plane-strain and axisymmetric reductions', () => {
    for (const stressState of ['uniaxial', 'planeStress', 'planeStrain', 'axisymmetric'] as const) {
      const red = new ReducedMaterial(m, stressState);
      const path = stressState === 'uniaxial' ? [[0.004], [0.012], [0.02]] : stressState === 'axisymmetric' ? [[0.004, -0.001, -0.0015, 0.002], [0.012, -0.003, -0.0045, 0.006], [0.02, -0.005, -0.0075, 0.01]] : [[0.004, -0.001, 0.002], [0.012, -0.003, 0.006], [0.02, -0.005, 0.01]];
      const { stateOld, strainOld } = driveReduced(red, path, [T, T, T], T);
      const fwd = Float64Array.from(strainOld, (x) => x * 1.1);
      const rev = Float64Array.from(strainOld, (x) => x * 0.85);
      for (const strain of [fwd, rev]) {
        const err = tangentErrorReduced(red, { strain, strainOld, temperature: T, temperatureOld: T }, stateOld, 1e-8);
        expect(err, stressState).toBeLessThan(2e-6);
      }
    }
  });
});

describe('Lagoudas 2012 with J2 plastic strain (yield stress mixed by ξ)', () => {
  const H_iso = 5000;
  const LP = { ...L1, plasticity: { sigma_y_A: 300, sigma_y_M: 500, H_iso } };
  const J2 = 'closed form, uniaxial J2 plasticity with linear isotropic hardening';

  it('austenite (no transformation at 130 °C): yields at σ_y,A, hardens with E·H/(E + H), keeps ε_p = (σ_max − σ_y)/H', () => {
    const T = 130;
    const r = runMaterialPoint(createLagoudas2012(LP), {
      control: 'stress',
      path: [{ value: 0, temperature: T }, { value: 330, temperature: T, increments: 330 }, { value: 0, temperature: T, increments: 100 }],
    });
    expect(r.ok, r.message).toBe(true);
    const load = legRows(r.rows, 1);
    const E = L1.E_A;
    const Et = (E * H_iso) / (E + H_iso);
    expect(load.every((x) => x.xi === 0)).toBe(true);
    const e320 = interpolateAt(load, 'stress', 'strain', 320);
    assertCheck({ suite: SUITE, name: 'J2 in austenite: strain at 320 MPa', computed: e320, target: 300 / E + (320 - 300) / Et, unit: '-', tolerance: 1e-9, source: J2 });
    assertCheck({ suite: SUITE, name: 'J2 in austenite: residual strain after unloading from 330 MPa', computed: r.rows.at(-1)!.strain, target: 30 / H_iso, unit: '-', tolerance: 1e-9, source: J2 });
  });

  it('martensite (−20 °C, ξ = 1): yields at σ_y,M', () => {
    const T = -20;
    const r = runMaterialPoint(createLagoudas2012(LP), {
      control: 'stress',
      path: [{ value: 0, temperature: T }, { value: 520, temperature: T, increments: 260 }, { value: 0, temperature: T, increments: 100 }],
    });
    expect(r.ok, r.message).toBe(true);
    expect(r.rows.every((x) => x.xi === 1)).toBe(true);
    assertCheck({ suite: SUITE, name: 'J2 in martensite: residual strain after unloading from 520 MPa', computed: r.rows.at(-1)!.strain, target: 20 / H_iso, unit: '-', tolerance: 1e-9, source: J2 });
  });

  it('consistent tangent in plastic, plastic + forward, perfectly plastic + forward, and reverse branches', () => {
    const T = 40;
    const dir = [1, -0.35, -0.4, 0.3, 0.1, 0.25];
    const scaled = (s: number) => Float64Array.from(dir, (d) => d * s);
    for (const plasticity of [{ sigma_y_A: 150, sigma_y_M: 250, H_iso: 3000 }, { sigma_y_A: 230, sigma_y_M: 260, H_iso: 0 }]) {
      const m = createLagoudas2012({ ...L2, alpha_A: 11e-6, alpha_M: 6.6e-6, plasticity });
      const size = m.stateSize;
      expect(size).toBe(21);
      const run = (strain: Float64Array, old: Float64Array, temp = T) => {
        const state = new Float64Array(size);
        const out = createMaterialPointOutput();
        m.update({ strain, strainOld: new Float64Array(6), temperature: temp, temperatureOld: temp }, old, 0, state, 0, out);
        expect(out.ok, out.message).toBe(true);
        return state;
      };
      const virgin = new Float64Array(size);
      m.initState(virgin, 0, T);
      const hot = new Float64Array(size);
      m.initState(hot, 0, 150);
      const cases: [string, Float64Array, Float64Array, number, (s: Float64Array) => boolean][] = [
        ['plastic, no transformation', scaled(0.006), hot, 150, (s) => s[20] > 0 && s[6] === 0],
        ['plastic + forward', scaled(0.04), virgin, T, (s) => s[20] > 0 && s[6] > 0 && s[6] < 1],
      ];
      const mid = run(scaled(0.04), virgin);
      cases.push(['reverse after plastic + forward', scaled(0.03), mid, T, (s) => s[6] < mid[6] && s[6] > 0]);
      cases.push(['forward from a plastic, transformed state', scaled(0.05), mid, T, (s) => s[20] >= mid[20] && s[6] > mid[6]]);
      for (const [name, strain, old, temp, branch] of cases) {
        const s = run(strain, old, temp);
        expect(branch(s), `${name} (H_iso = ${plasticity.H_iso}): ξ = ${s[6]}, p = ${s[20]}`).toBe(true);
        const err = tangentErrorSolid(m, { strain, strainOld: new Float64Array(6), temperature: temp, temperatureOld: temp }, old, 1e-8);
        expect(err, `${name} (H_iso = ${plasticity.H_iso})`).toBeLessThan(2e-6);
      }
    }
  });
});

describe('Lagoudas 2012: forward and reverse both triggered by one non-proportional increment', () => {
  it('reverts part of the tension variants and forms shear ones in one increment', () => {
    const m = createLagoudas2012(L2);
    const T = 45;
    const tension = Float64Array.from([1, -0.5, -0.5, 0, 0, 0], (x) => x * 0.03);
    const shear = Float64Array.from([0, 0, 0, 0, 0, Math.SQRT2 * 0.026]);
    const old = new Float64Array(LAGOUDAS2012_STATE_SIZE);
    m.initState(old, 0, T);
    const mid = new Float64Array(LAGOUDAS2012_STATE_SIZE);
    const out = createMaterialPointOutput();
    m.update({ strain: tension, strainOld: new Float64Array(6), temperature: T, temperatureOld: T }, old, 0, mid, 0, out);
    expect(mid[6]).toBeGreaterThan(0.2);
    const end = new Float64Array(LAGOUDAS2012_STATE_SIZE);
    m.update({ strain: shear, strainOld: tension, temperature: T, temperatureOld: T }, mid, 0, end, 0, out);
    expect(out.ok, out.message).toBe(true);
    expect(end[0]).toBeLessThan(0.5 * mid[0]);
    expect(Math.abs(end[5])).toBeGreaterThan(2 * Math.abs(end[0]));
    // the reversal memory was refreshed by the forward (shear) phase
    expect(Math.abs(end[7 + 5])).toBeGreaterThan(0);
  });
});
