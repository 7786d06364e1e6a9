import { describe, expect, it } from 'vitest';
import { runMaterialPoint, type MaterialPointRow } from './materialPoint';
import { assertCheck, extrapolateTo, interpolateAt, legRows } from './materialPointTesting';
import { ReducedMaterial } from './reduce';
import { driveReduced, tangentErrorReduced, tangentErrorSolid } from './reduceTesting';
import { createSouzaAuricchio, SOUZA_STATE_SIZE, type SouzaAuricchioInput } from './souzaAuricchio';
import { createMaterialPointOutput } from './types';

const SUITE = 'SMA: Souza–Auricchio';
const UNIAXIAL = 'closed form, Souza 1998 / Auricchio–Petrini 2004 uniaxial reduction';
const SQ = Math.sqrt(1.5);

/** hε_L < R: no reverse on unloading below T0. */
const S1: SouzaAuricchioInput = { E: 52000, nu: 0.33, alpha: 0, T_ref: 20, h: 1000, beta: 6.2, T0: -10, R: 60, eps_L: 0.05 };
/** hε_L > R: partial reverse on unloading below T0. */
const S2: SouzaAuricchioInput = { ...S1, h: 2000 };

const inside = (v: number) => v > 0.02 && v < 0.98;
const tau = (p: SouzaAuricchioInput, T: number) => p.beta * Math.max(T - p.T0, 0);

describe('Souza–Auricchio: pseudoelastic loop above T0', () => {
  const T = 45;
  const t = tau(S1, T);
  const r = runMaterialPoint(createSouzaAuricchio(S1), {
    control: 'strain',
    path: [{ value: 0, temperature: T }, { value: 0.065, temperature: T, increments: 650 }, { value: 0, temperature: T, increments: 650 }],
  });
  const load = legRows(r.rows, 1);
  const unload = legRows(r.rows, 2);

  it('starts, saturates and reverts at √(3/2)(R + τ), √(3/2)(R + τ + hε_L), √(3/2)(τ + hε_L − R), √(3/2)(τ − R)', () => {
    expect(r.ok, r.message).toBe(true);
    const { R, h, eps_L } = S1;
    const cases: [string, number, number][] = [
      ['forward start', extrapolateTo(load, 'stress', 'xi', 0, inside), SQ * (R + t)],
      ['saturation', extrapolateTo(load, 'stress', 'xi', 1, inside), SQ * (R + t + h * eps_L)],
      ['reverse start', extrapolateTo(unload, 'stress', 'xi', 1, inside), SQ * (t + h * eps_L - R)],
      ['reverse end', extrapolateTo(unload, 'stress', 'xi', 0, inside), SQ * (t - R)],
    ];
    for (const [name, computed, target] of cases) {
      assertCheck({ suite: SUITE, name: `pseudoelastic ${T} °C: ${name} stress`, computed, target, unit: 'MPa', tolerance: 1e-8, source: UNIAXIAL });
    }
    const width = interpolateAt(load, 'xi', 'stress', 0.5) - interpolateAt(unload.slice().reverse(), 'xi', 'stress', 0.5);
    assertCheck({ suite: SUITE, name: 'hysteresis width at ‖eᵗʳ‖ = ε_L/2', computed: width, target: 2 * SQ * R, unit: 'MPa', tolerance: 1e-8, source: UNIAXIAL });
    expect(unload.at(-1)!.xi).toBe(0);
  });

  it('has the plateau slope [1/E + 2/(3h)]⁻¹ and the closed-form stress at 3 % strain', () => {
    const k = 1 / (1 / S1.E + 2 / (3 * S1.h));
    const target = (0.03 + Math.sqrt(2 / 3) * (S1.R + t) / S1.h) * k;
    assertCheck({ suite: SUITE, name: 'stress at 3 % strain, loading', computed: interpolateAt(load, 'strain', 'stress', 0.03), target, unit: 'MPa', tolerance: 1e-8, source: UNIAXIAL });
    const s = (e: number) => interpolateAt(load, 'strain', 'stress', e);
    assertCheck({ suite: SUITE, name: 'plateau tangent on loading', computed: (s(0.03) - s(0.02)) / 0.01, target: k, unit: 'MPa', tolerance: 1e-8, source: UNIAXIAL });
    // saturated: uniaxial transformation strain √(2/3)ε_L
    const last = load.at(-1)!;
    assertCheck({ suite: SUITE, name: 'saturated uniaxial transformation strain', computed: last.transformationStrain, target: Math.sqrt(2 / 3) * S1.eps_L, unit: '-', tolerance: 1e-10, source: UNIAXIAL });
  });

  it('gives the same saturated state in 2 increments', () => {
    const coarse = runMaterialPoint(createSouzaAuricchio(S1), {
      control: 'strain',
      path: [{ value: 0, temperature: T }, { value: 0.065, temperature: T, increments: 2 }],
    });
    expect(coarse.ok).toBe(true);
    expect(Math.abs(coarse.rows.at(-1)!.stress - load.at(-1)!.stress)).toBeLessThan(1e-7);
  });
});

function shapeMemory(p: SouzaAuricchioInput, Tlow: number, Thigh: number) {
  const r = runMaterialPoint(createSouzaAuricchio(p), {
    control: 'stress',
    path: [
      { value: 0, temperature: Tlow },
      { value: 250, temperature: Tlow, increments: 500 },
      { value: 0, temperature: Tlow, increments: 500 },
      { value: 0, temperature: Thigh, increments: Math.round((Thigh - Tlow) * 20) },
    ],
  });
  expect(r.ok, r.message).toBe(true);
  return r;
}

describe('Souza–Auricchio: shape-memory sequence below T0 (load, unload, free recovery)', () => {
  it('hε_L < R: residual strain √(2/3)ε_L, recovery between T0 + (R − hε_L)/β and T0 + R/β', () => {
    const r = shapeMemory(S1, -30, 20);
    const load = legRows(r.rows, 1);
    const unload = legRows(r.rows, 2);
    const heat = legRows(r.rows, 3);
    const { R, h, eps_L, beta, T0 } = S1;
    assertCheck({ suite: SUITE, name: 'below T0: reorientation/detwinning start stress √(3/2)R', computed: extrapolateTo(load, 'stress', 'xi', 0, inside), target: SQ * R, unit: 'MPa', tolerance: 1e-8, source: UNIAXIAL });
    const residual = unload.at(-1)!;
    assertCheck({ suite: SUITE, name: 'residual strain after unloading (hε_L < R)', computed: residual.strain, target: Math.sqrt(2 / 3) * eps_L, unit: '-', tolerance: 1e-9, source: UNIAXIAL });
    assertCheck({ suite: SUITE, name: 'free recovery start T0 + (R − hε_L)/β', computed: extrapolateTo(heat, 'temperature', 'xi', 1, inside), target: T0 + (R - h * eps_L) / beta, unit: '°C', tolerance: 1e-8, absolute: true, source: UNIAXIAL });
    assertCheck({ suite: SUITE, name: 'free recovery end T0 + R/β', computed: extrapolateTo(heat, 'temperature', 'xi', 0, inside), target: T0 + R / beta, unit: '°C', tolerance: 1e-8, absolute: true, source: UNIAXIAL });
    expect(Math.abs(heat.at(-1)!.strain)).toBeLessThan(1e-12);
  });

  it('hε_L > R: reverse on unloading from √(3/2)(hε_L − R), residual √(2/3)R/h, recovery ends at T0 + R/β', () => {
    const r = shapeMemory(S2, -30, 20);
    const unload = legRows(r.rows, 2);
    const heat = legRows(r.rows, 3);
    const { R, h, eps_L, beta, T0 } = S2;
    const revStart = extrapolateTo(unload, 'stress', 'xi', 1, (v) => v > 0.62 && v < 0.98);
    assertCheck({ suite: SUITE, name: 'below T0: reverse start on unloading √(3/2)(hε_L − R)', computed: revStart, target: SQ * (h * eps_L - R), unit: 'MPa', tolerance: 1e-8, source: UNIAXIAL });
    assertCheck({ suite: SUITE, name: 'residual strain after unloading (hε_L > R): √(2/3)R/h', computed: unload.at(-1)!.strain, target: Math.sqrt(2 / 3) * (R / h), unit: '-', tolerance: 1e-9, source: UNIAXIAL });
    assertCheck({ suite: SUITE, name: 'free recovery end T0 + R/β (hε_L > R)', computed: extrapolateTo(heat, 'temperature', 'xi', 0, (v) => v > 0.02 && v < 0.58), target: T0 + R / beta, unit: '°C', tolerance: 1e-8, absolute: true, source: UNIAXIAL });
  });
});

describe('Souza–Auricchio: non-proportional loading reorients the transformation strain', () => {
  it('keeps ‖eᵗʳ‖ = ε_L and the tangential stress at R while the strain direction turns by 90°', () => {
    const m = createSouzaAuricchio(S1);
    const T = -30;
    const u1 = [2 / Math.sqrt(6), -1 / Math.sqrt(6), -1 / Math.sqrt(6), 0, 0, 0];
    const u2 = [0, 0, 0, 0, 0, 1];
    const A = 0.075;
    let old = new Float64Array(SOUZA_STATE_SIZE);
    let state = new Float64Array(SOUZA_STATE_SIZE);
    const out = createMaterialPointOutput();
    let strainOld: Float64Array = new Float64Array(6);
    const go = (strain: Float64Array) => {
      m.update({ strain, strainOld, temperature: T, temperatureOld: T }, old, 0, state, 0, out);
      expect(out.ok, out.message).toBe(true);
      [old, state] = [state, old];
      strainOld = strain;
    };
    for (let k = 1; k <= 40; k++) go(Float64Array.from(u1, (x) => (x * A * k) / 40));
    let worstNorm = 0;
    let worstTangential = 0;
    let reorienting = 0;
    const steps = 180;
    for (let k = 1; k <= steps; k++) {
      const phi = (k / steps) * (Math.PI / 2);
      const before = Float64Array.from(old);
      go(Float64Array.from(u1, (x, i) => A * (Math.cos(phi) * x + Math.sin(phi) * u2[i])));
      let moved = 0;
      for (let i = 0; i < 6; i++) moved += (old[i] - before[i]) ** 2;
      let q = 0;
      for (let i = 0; i < 6; i++) q += old[i] * old[i];
      q = Math.sqrt(q);
      worstNorm = Math.max(worstNorm, Math.abs(q - S1.eps_L));
      // tangential part of the deviatoric stress with respect to n = eᵗʳ/‖eᵗʳ‖
      const s = Array.from(out.stress);
      const m3 = (s[0] + s[1] + s[2]) / 3;
      for (let i = 0; i < 3; i++) s[i] -= m3;
      let sn = 0;
      for (let i = 0; i < 6; i++) sn += (s[i] * old[i]) / q;
      let perp = 0;
      for (let i = 0; i < 6; i++) perp += (s[i] - (sn * old[i]) / q) ** 2;
      const dev = Math.abs(Math.sqrt(perp) - S1.R) / S1.R;
      if (Math.sqrt(moved) > 1e-12) {
        reorienting++;
        worstTangential = Math.max(worstTangential, dev);
      } else expect(Math.sqrt(perp)).toBeLessThanOrEqual(S1.R * (1 + 1e-9)); // inside the elastic domain

    }
    expect(worstNorm).toBeLessThan(1e-12);
    expect(reorienting).toBeGreaterThan(steps / 2);
    assertCheck({ suite: SUITE, name: 'reorientation at saturation: max |‖s_⊥‖ − R|/R (0.5° steps)', computed: worstTangential, target: 0, unit: '-', tolerance: 1e-3, absolute: true, source: 'closed form, consistency ‖X‖ = R with ‖eᵗʳ‖ = ε_L (Auricchio–Petrini 2004)' });
    // the transformation strain now points mostly along the shear direction
    const cosTo2 = old[5] / S1.eps_L;
    expect(cosTo2).toBeGreaterThan(0.95);
  });
});

describe('Souza–Auricchio: consistent tangent against finite differences', () => {
  const m = createSouzaAuricchio(S1);
  const T = 45;
  const dir = [1, -0.3, -0.45, 0.2, 0.1, 0.3];
  const scaled = (s: number, d = dir) => Float64Array.from(d, (x) => x * s);
  const load = { strainOld: new Float64Array(6), temperature: T, temperatureOld: T };
  const step = (strain: Float64Array, old: Float64Array) => {
    const state = new Float64Array(SOUZA_STATE_SIZE);
    const out = createMaterialPointOutput();
    m.update({ strain, ...load }, old, 0, state, 0, out);
    expect(out.ok, out.message).toBe(true);
    let q = 0;
    for (let i = 0; i < 6; i++) q += state[i] * state[i];
    return { state, q: Math.sqrt(q), out };
  };
  const virgin = new Float64Array(SOUZA_STATE_SIZE);
  const mid = step(scaled(0.025), virgin);
  const sat = step(scaled(0.06), virgin);

  it('in every branch: elastic, nucleation, forward, saturated, reverse, complete reverse, reorientation', () => {
    expect(mid.q).toBeGreaterThan(0.2 * S1.eps_L);
    expect(mid.q).toBeLessThan(0.8 * S1.eps_L);
    expect(sat.q).toBeCloseTo(S1.eps_L, 14);
    const other = [0.2, 0.5, -0.7, 0.4, -0.3, 0.1];
    const cases: [string, Float64Array, Float64Array, (q: number) => boolean][] = [
      ['elastic', scaled(0.004), virgin, (q) => q === 0],
      ['nucleation', scaled(0.025), virgin, (q) => q > 0 && q < S1.eps_L],
      ['forward', scaled(0.03), mid.state, (q) => q > mid.q && q < S1.eps_L],
      ['saturating', scaled(0.06), mid.state, (q) => Math.abs(q - S1.eps_L) < 1e-14],
      ['saturated', scaled(0.065), sat.state, (q) => Math.abs(q - S1.eps_L) < 1e-14],
      ['reverse', scaled(0.021), mid.state, (q) => q < mid.q && q > 0],
      ['complete reverse', scaled(0.004), mid.state, (q) => q === 0],
      ['reorientation, free', Float64Array.from(dir, (x, i) => 0.025 * x + 0.012 * other[i]), mid.state, (q) => q > 0 && q < S1.eps_L],
      ['reorientation, saturated', Float64Array.from(dir, (x, i) => 0.06 * x + 0.03 * other[i]), sat.state, (q) => Math.abs(q - S1.eps_L) < 1e-14],
    ];
    for (const [name, strain, old, branch] of cases) {
      const { q } = step(strain, old);
      expect(branch(q), `${name}: ‖eᵗʳ‖ = ${q}`).toBe(true);
      const err = tangentErrorSolid(m, { strain, ...load }, old, 1e-8);
      expect(err, name).toBeLessThan(2e-6);
    }
  });

  it('is symmetric', () => {
    const t = step(scaled(0.03), mid.state).out.tangent;
    let asym = 0;
    for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) asym = Math.max(asym, Math.abs(t[i * 6 + j] - t[j * 6 + i]));
    expect(asym / Math.abs(t[0])).toBeLessThan(1e-9);
  });

  it('through the uniaxial, plane-stress, plane-strain and axisymmetric reductions', () => {
    for (const stressState of ['uniaxial', 'planeStress', 'planeStrain', 'axisymmetric'] as const) {
      const red = new ReducedMaterial(m, stressState);
      const path = stressState === 'uniaxial' ? [[0.008], [0.016], [0.022]] : stressState === 'axisymmetric' ? [[0.008, -0.002, -0.003, 0.004], [0.016, -0.004, -0.006, 0.008], [0.022, -0.006, -0.008, 0.01]] : [[0.008, -0.002, 0.004], [0.016, -0.004, 0.008], [0.022, -0.006, 0.01]];
      const { stateOld, strainOld } = driveReduced(red, path, [T, T, T], T);
      for (const f of [1.1, 0.93, 2.5]) {
        const strain = Float64Array.from(strainOld, (x) => x * f);
        const err = tangentErrorReduced(red, { strain, strainOld, temperature: T, temperatureOld: T }, stateOld, 1e-8);
        expect(err, `${stressState} ×${f}`).toBeLessThan(2e-6);
      }
    }
  });
});

describe('Souza–Auricchio: parameter checks', () => {
  it('rejects bad parameters naming the field', () => {
    expect(() => createSouzaAuricchio({ ...S1, R: 0 })).toThrow(/^R:/);
    expect(() => createSouzaAuricchio({ ...S1, nu: 0.5 })).toThrow(/^nu:/);
    expect(() => createSouzaAuricchio({ ...S1, asymmetry: 0.2 })).toThrow(/^asymmetry:/);
  });
  it('reports xi = ‖eᵗʳ‖/ε_L', () => {
    const rows: MaterialPointRow[] = runMaterialPoint(createSouzaAuricchio(S1), {
      control: 'strain', path: [{ value: 0, temperature: 45 }, { value: 0.07, temperature: 45, increments: 10 }],
    }).rows;
    expect(rows.at(-1)!.xi).toBeCloseTo(1, 12);
  });
});
