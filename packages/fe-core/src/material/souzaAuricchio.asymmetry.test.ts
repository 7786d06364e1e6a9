/**
 * Tension–compression asymmetry of the transformation-strain model (Lode-angle gauge of
 * Bigoni & Piccolroaz 2004 on the transformation strain; see souzaAuricchio.ts for the closed
 * forms derived from it).
 */
import { describe, expect, it } from 'vitest';
import { materialParamsSchema, type ModelInput } from '@phaseloop/shared';
import { rectangle } from '../mesh/structured';
import { runMaterialPoint } from './materialPoint';
import { assertCheck, extrapolateTo, legRows } from './materialPointTesting';
import { ReducedMaterial } from './reduce';
import { driveReduced, tangentErrorReduced, tangentErrorSolid } from './reduceTesting';
import { createSouzaAuricchio, SOUZA_STATE_SIZE, type SouzaAuricchioInput } from './souzaAuricchio';
import { LodeGauge, lodeShape } from './souzaAuricchioLode';
import { createMaterialPointOutput } from './types';
import { solveRecording } from './structureTesting';

const SUITE = 'SMA: Souza–Auricchio, tension–compression asymmetry';
const SOURCE = 'closed form: Souza 1998 / Auricchio–Petrini 2004 uniaxial reduction with the Bigoni–Piccolroaz 2004 Lode-angle gauge on eᵗʳ';
const SQ = Math.sqrt(1.5);
const r = 1.35;
const P: SouzaAuricchioInput = { E: 52000, nu: 0.33, alpha: 0, T_ref: 20, h: 1000, beta: 6.2, T0: -10, R: 60, eps_L: 0.05, tc_ratio: r, lode_shape: 0.8 };
const inside = (v: number) => v > 0.02 && v < 0.98;

describe('Lode-angle gauge', () => {
  it('equals ‖e‖ in uniaxial tension and r‖e‖ in uniaxial compression; gradient and Hessian match differences', () => {
    const shape = lodeShape(r, 0.8)!;
    const g = new LodeGauge(shape);
    const u = [2 / Math.sqrt(6), -1 / Math.sqrt(6), -1 / Math.sqrt(6), 0, 0, 0];
    expect(g.value(u.map((x) => 0.03 * x))).toBeCloseTo(0.03, 15);
    expect(g.value(u.map((x) => -0.03 * x))).toBeCloseTo(0.03 * r, 15);
    const e = Float64Array.from([0.012, -0.004, -0.008, 0.003, -0.002, 0.005]);
    const grad = new Float64Array(6);
    const hess = new Float64Array(36);
    g.derivatives(e, grad, hess);
    const h = 1e-7;
    const gp = new Float64Array(6);
    const gm = new Float64Array(6);
    let worstG = 0;
    let worstH = 0;
    for (let j = 0; j < 6; j++) {
      // deviatoric perturbation direction
      const d = new Float64Array(6);
      d[j] = 1;
      if (j < 3) for (let k = 0; k < 3; k++) d[k] -= 1 / 3;
      const ep = e.map((x, i) => x + h * d[i]);
      const em = e.map((x, i) => x - h * d[i]);
      let dg = 0;
      for (let i = 0; i < 6; i++) dg += grad[i] * d[i];
      worstG = Math.max(worstG, Math.abs((g.value(ep) - g.value(em)) / (2 * h) - dg));
      g.derivatives(ep, gp);
      g.derivatives(em, gm);
      for (let i = 0; i < 6; i++) {
        let hd = 0;
        for (let k = 0; k < 6; k++) hd += hess[i * 6 + k] * d[k];
        worstH = Math.max(worstH, Math.abs((gp[i] - gm[i]) / (2 * h) - hd));
      }
    }
    expect(worstG).toBeLessThan(1e-8);
    expect(worstH).toBeLessThan(1e-6); // Hessian entries are O(100)
  });
});

describe('Souza–Auricchio with asymmetry: uniaxial pseudoelastic loops in tension and compression', () => {
  const T = 45;
  const t = P.beta * (T - P.T0);
  const { R, h, eps_L } = P;
  const loop = (sign: number) =>
    runMaterialPoint(createSouzaAuricchio(P), {
      control: 'strain',
      path: [{ value: 0, temperature: T }, { value: sign * 0.07, temperature: T, increments: 700 }, { value: 0, temperature: T, increments: 700 }],
    });

  for (const [name, sign, k] of [['tension', 1, 1], ['compression', -1, r]] as const) {
    it(`${name}: start √(3/2)(R + ${name === 'tension' ? '' : 'r'}τ), saturation, reverse start/end, maximum transformation strain √(2/3)ε_L${name === 'tension' ? '' : '/r'}`, () => {
      const res = loop(sign);
      expect(res.ok, res.message).toBe(true);
      const load = legRows(res.rows, 1).map((row) => ({ ...row, stress: sign * row.stress, strain: sign * row.strain, transformationStrain: sign * row.transformationStrain }));
      const unload = legRows(res.rows, 2).map((row) => ({ ...row, stress: sign * row.stress, strain: sign * row.strain, transformationStrain: sign * row.transformationStrain }));
      const cases: [string, number, number][] = [
        ['forward start', extrapolateTo(load, 'stress', 'xi', 0, inside), SQ * (R + k * t)],
        ['saturation', extrapolateTo(load, 'stress', 'xi', 1, inside), SQ * (R + k * t + k * h * eps_L)],
        ['reverse start', extrapolateTo(unload, 'stress', 'xi', 1, inside), SQ * (k * (t + h * eps_L) - R)],
        ['reverse end', extrapolateTo(unload, 'stress', 'xi', 0, inside), SQ * (k * t - R)],
      ];
      for (const [what, computed, target] of cases) {
        assertCheck({ suite: SUITE, name: `uniaxial ${name} at ${T} °C, r = ${r}, γ = 0.8: ${what} stress`, computed, target, unit: 'MPa', tolerance: 1e-7, source: SOURCE });
      }
      assertCheck({ suite: SUITE, name: `uniaxial ${name}, r = ${r}: saturated transformation strain`, computed: load.at(-1)!.transformationStrain, target: (Math.sqrt(2 / 3) * eps_L) / k, unit: '-', tolerance: 1e-9, source: SOURCE });
      expect(unload.at(-1)!.xi).toBe(0);
    });
  }
});

describe('Souza–Auricchio with asymmetry: shape-memory sequence in compression below T0', () => {
  it('residual strain √(2/3)ε_L/r, free recovery between T0 + (R/r − hε_L)/β and T0 + R/(rβ)', () => {
    const p: SouzaAuricchioInput = { ...P, h: 600 }; // hε_L < R/r: no reverse on unloading
    const res = runMaterialPoint(createSouzaAuricchio(p), {
      control: 'stress',
      path: [
        { value: 0, temperature: -30 },
        { value: -250, temperature: -30, increments: 500 },
        { value: 0, temperature: -30, increments: 500 },
        { value: 0, temperature: 20, increments: 1000 },
      ],
    });
    expect(res.ok, res.message).toBe(true);
    const load = legRows(res.rows, 1).map((row) => ({ ...row, stress: -row.stress }));
    const unloaded = legRows(res.rows, 2).at(-1)!;
    const heat = legRows(res.rows, 3);
    const { R, h, eps_L, beta, T0 } = p;
    assertCheck({ suite: SUITE, name: `compression below T0, r = ${r}: detwinning start stress √(3/2)R`, computed: extrapolateTo(load, 'stress', 'xi', 0, inside), target: SQ * R, unit: 'MPa', tolerance: 1e-8, source: SOURCE });
    assertCheck({ suite: SUITE, name: `compression below T0, r = ${r}: saturation stress √(3/2)(R + rhε_L)`, computed: extrapolateTo(load, 'stress', 'xi', 1, inside), target: SQ * (R + r * h * eps_L), unit: 'MPa', tolerance: 1e-8, source: SOURCE });
    assertCheck({ suite: SUITE, name: `compression, r = ${r}: residual strain after unloading −√(2/3)ε_L/r`, computed: unloaded.strain, target: (-Math.sqrt(2 / 3) * eps_L) / r, unit: '-', tolerance: 1e-9, source: SOURCE });
    assertCheck({ suite: SUITE, name: `compression, r = ${r}: free recovery start T0 + (R/r − hε_L)/β`, computed: extrapolateTo(heat, 'temperature', 'xi', 1, inside), target: T0 + (R / r - h * eps_L) / beta, unit: '°C', tolerance: 1e-8, absolute: true, source: SOURCE });
    assertCheck({ suite: SUITE, name: `compression, r = ${r}: free recovery end T0 + R/(rβ)`, computed: extrapolateTo(heat, 'temperature', 'xi', 0, inside), target: T0 + R / (r * beta), unit: '°C', tolerance: 1e-8, absolute: true, source: SOURCE });
    expect(Math.abs(heat.at(-1)!.strain)).toBeLessThan(1e-12);
  });
});

describe('Souza–Auricchio with asymmetry: consistent tangent against finite differences', () => {
  const m = createSouzaAuricchio(P);
  const T = 45;
  const load = { strainOld: new Float64Array(6), temperature: T, temperatureOld: T };
  const step = (strain: Float64Array, old: Float64Array) => {
    const state = new Float64Array(SOUZA_STATE_SIZE);
    const out = createMaterialPointOutput();
    m.update({ strain, ...load }, old, 0, state, 0, out);
    expect(out.ok, out.message).toBe(true);
    const rep = { xi: 0, eqPlastic: 0, transformationStrain: new Float64Array(6) };
    m.report(state, 0, rep);
    return { state, xi: rep.xi };
  };
  const virgin = new Float64Array(SOUZA_STATE_SIZE);

  for (const [label, dir] of [
    ['tension-dominated', [1, -0.3, -0.45, 0.2, 0.1, 0.3]],
    ['compression-dominated', [-1, 0.35, 0.5, 0.1, -0.2, 0.25]],
  ] as const) {
    it(`in every branch (${label}): elastic, nucleation, forward, saturating, saturated, reverse, complete reverse, reorientation`, () => {
      const scaled = (s: number) => Float64Array.from(dir, (x) => x * s);
      // scale of the first increment that just saturates, found on the way
      const mid = step(scaled(0.025), virgin);
      const sat = step(scaled(0.07), virgin);
      expect(mid.xi).toBeGreaterThan(0.15);
      expect(mid.xi).toBeLessThan(0.85);
      expect(sat.xi).toBeCloseTo(1, 12);
      const other = [0.2, 0.5, -0.7, 0.4, -0.3, 0.1];
      const cases: [string, Float64Array, Float64Array, (xi: number) => boolean][] = [
        ['elastic', scaled(0.004), virgin, (x) => x === 0],
        ['nucleation', scaled(0.025), virgin, (x) => x > 0 && x < 1],
        ['forward', scaled(0.03), mid.state, (x) => x > mid.xi && x < 1],
        ['saturating', scaled(0.07), mid.state, (x) => Math.abs(x - 1) < 1e-12],
        ['saturated', scaled(0.075), sat.state, (x) => Math.abs(x - 1) < 1e-12],
        ['reverse', scaled(0.021), mid.state, (x) => x < mid.xi && x > 0],
        ['complete reverse', scaled(0.004), mid.state, (x) => x === 0],
        ['reorientation, free', Float64Array.from(dir, (x, i) => 0.025 * x + 0.012 * other[i]), mid.state, (x) => x > 0 && x < 1],
        ['reorientation, saturated', Float64Array.from(dir, (x, i) => 0.07 * x + 0.03 * other[i]), sat.state, (x) => Math.abs(x - 1) < 1e-12],
      ];
      for (const [name, strain, old, branch] of cases) {
        const { xi } = step(strain, old);
        expect(branch(xi), `${name}: xi = ${xi}`).toBe(true);
        const err = tangentErrorSolid(m, { strain, ...load }, old, 1e-8);
        expect(err, name).toBeLessThan(2e-6);
      }
    });
  }

  it('is symmetric (the driver solves Souza–Auricchio models with the symmetric factorisation)', () => {
    const dir = [-1, 0.35, 0.5, 0.1, -0.2, 0.25];
    const other = [0.2, 0.5, -0.7, 0.4, -0.3, 0.1];
    const sat = step(Float64Array.from(dir, (x) => 0.07 * x), virgin);
    for (const [strain, old] of [
      [Float64Array.from(dir, (x) => 0.025 * x), virgin],
      [Float64Array.from(dir, (x, i) => 0.07 * x + 0.03 * other[i]), sat.state],
    ] as const) {
      const out = createMaterialPointOutput();
      m.update({ strain, ...load }, old, 0, new Float64Array(6), 0, out);
      const t = out.tangent;
      let asym = 0;
      for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) asym = Math.max(asym, Math.abs(t[i * 6 + j] - t[j * 6 + i]));
      expect(asym / Math.abs(t[0])).toBeLessThan(1e-9);
    }
  });

  it('through the plane-stress and uniaxial reductions', () => {
    for (const stressState of ['uniaxial', 'planeStress'] as const) {
      const red = new ReducedMaterial(m, stressState);
      for (const sign of [1, -1]) {
        const path = stressState === 'uniaxial' ? [[0.008], [0.016], [0.022]] : [[0.008, -0.002, 0.004], [0.016, -0.004, 0.008], [0.022, -0.006, 0.01]];
        const { stateOld, strainOld } = driveReduced(red, path.map((p) => p.map((x) => sign * x)), [T, T, T], T);
        for (const f of [1.1, 0.93, 2.5]) {
          const strain = Float64Array.from(strainOld, (x) => x * f);
          const err = tangentErrorReduced(red, { strain, strainOld, temperature: T, temperatureOld: T }, stateOld, 1e-8);
          expect(err, `${stressState} ${sign > 0 ? 'tension' : 'compression'} ×${f}`).toBeLessThan(2e-6);
        }
      }
    }
  });

  it('symmetric parameters give exactly the symmetric model; out-of-range ratios are refused with the range', () => {
    const a = createSouzaAuricchio({ ...P, tc_ratio: 1, lode_shape: 0 });
    const b = createSouzaAuricchio({ ...P, tc_ratio: undefined, lode_shape: undefined });
    const strain = Float64Array.from([0.03, -0.01, -0.012, 0.004, 0.002, 0.006]);
    const oa = createMaterialPointOutput();
    const ob = createMaterialPointOutput();
    a.update({ strain, ...load }, virgin, 0, new Float64Array(6), 0, oa);
    b.update({ strain, ...load }, virgin, 0, new Float64Array(6), 0, ob);
    expect(Array.from(oa.stress)).toEqual(Array.from(ob.stress));
    expect(() => createSouzaAuricchio({ ...P, tc_ratio: 1.3, lode_shape: 0 })).toThrow(/^tc_ratio: .*\[1\.000, 1\.000\]/);
    expect(() => createSouzaAuricchio({ ...P, lode_shape: 1 })).toThrow(/^lode_shape:/);
    expect(() => createSouzaAuricchio({ ...P, asymmetry: 0.2 })).toThrow(/^asymmetry: replaced by tc_ratio/);
  });
});

describe('souza-auricchio parameter schema', () => {
  const base = { model: 'souza-auricchio', E: 52000, nu: 0.33, h: 1000, beta: 6.2, T0: -10, R: 60, eps_L: 0.05 };
  const issues = (x: object) => {
    const r = materialParamsSchema.safeParse(x);
    return r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
  };
  it('accepts old input (no asymmetry fields, or asymmetry 0) as the symmetric model', () => {
    expect(issues(base)).toEqual([]);
    expect(issues({ ...base, asymmetry: 0 })).toEqual([]);
    expect(issues({ ...base, tc_ratio: 1.35, lode_shape: 0.8 })).toEqual([]);
  });
  it('explains a non-zero asymmetry, a bad lode_shape and an unreachable tc_ratio', () => {
    expect(issues({ ...base, asymmetry: 0.2 })).toEqual(['asymmetry: asymmetry is replaced by tc_ratio and lode_shape: remove it (or set 0) and give those instead']);
    expect(issues({ ...base, lode_shape: 1 })).toEqual(['lode_shape: lode_shape must be < 1']);
    expect(issues({ ...base, tc_ratio: 1.3 })).toEqual(['tc_ratio: tc_ratio must lie in [1.000, 1.000] with lode_shape 0; a larger lode_shape widens the range']);
    // the schema's range is the one the model uses
    expect(issues({ ...base, tc_ratio: 1.45, lode_shape: 0.8 })).toEqual([]);
    expect(() => createSouzaAuricchio({ ...P, tc_ratio: 1.45, lode_shape: 0.8 })).not.toThrow();
    expect(issues({ ...base, tc_ratio: 1.46, lode_shape: 0.8 })[0]).toMatch(/^tc_ratio: tc_ratio must lie in \[0\.6887, 1\.452\]/);
    expect(() => createSouzaAuricchio({ ...P, tc_ratio: 1.46, lode_shape: 0.8 })).toThrow(/^tc_ratio: .*\[0\.6887, 1\.452\]/);
  });
});

describe('Souza–Auricchio with asymmetry in a structure', () => {
  it('plane-stress q4 strip compressed past saturation and released = material point, quadratic Newton without the predictor', () => {
    const L = 20;
    const H = 4;
    const mesh = rectangle({ width: L, height: H, nx: 2, ny: 1 }, { type: 'q4', section: 's', material: 'niti' });
    const input: ModelInput = {
      format: 'phaseloop-model/1',
      ...mesh,
      nodeSets: { ...mesh.nodeSets, origin: [1] },
      sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
      materials: { niti: { model: 'souza-auricchio', ...P } },
      initialTemperature: 37,
      supports: [
        { type: 'fixed', set: 'left', dofs: ['ux'] },
        { type: 'fixed', set: 'origin', dofs: ['uy'] },
      ],
      loads: [{ type: 'displacement', name: 'push', set: 'right', dof: 'ux' }],
      segments: [
        { name: 'load', targets: { push: -0.05 * L }, increments: { initial: 0.05, min: 0.001, max: 0.05 } },
        { name: 'unload', targets: { push: 0 }, increments: { initial: 0.05, min: 0.001, max: 0.05 } },
      ],
      output: { fields: ['displacement', 'reaction'], points: [{ name: 'tip', x: L, y: 0 }], reactionSums: [{ name: 'left', set: 'left' }] },
      solver: { forceTolerance: 1e-10, displacementTolerance: 1e-10, lineSearch: true },
    };
    // without the predictor the first iterate strains only the driven column: real Newton work
    const { result, sequences } = solveRecording(input, { predictor: false });
    expect(result.status, result.failure?.message).toBe('succeeded');
    const mp = runMaterialPoint(createSouzaAuricchio(P), {
      control: 'strain',
      path: result.frames.map((f) => ({ value: f.history['tip.ux'] / L, temperature: 37, increments: 1 })),
    });
    expect(mp.ok, mp.message).toBe(true);
    let worst = 0;
    result.frames.forEach((f, k) => (worst = Math.max(worst, Math.abs(-f.history['left.Fx'] / H - mp.rows[k].stress))));
    const peak = Math.max(...mp.rows.map((row) => -row.stress));
    expect(peak).toBeGreaterThan(SQ * (P.R + r * P.beta * 47 + r * P.h * P.eps_L)); // past compressive saturation
    assertCheck({ suite: SUITE, name: 'q4 strip in compression: max |σ_structure − σ_material point|', computed: worst, target: 0, unit: 'MPa', tolerance: 1e-6, absolute: true, source: 'closed form: uniform uniaxial stress in a strip on rollers equals the material-point response' });
    const orders: number[] = [];
    for (const seq of sequences) {
      for (let k = 1; k + 1 < seq.length; k++) {
        if (seq[k - 1] < 1e-2 && seq[k + 1] > 1e-12) orders.push(Math.log(seq[k + 1] / seq[k]) / Math.log(seq[k] / seq[k - 1]));
      }
    }
    orders.sort((a, b) => a - b);
    expect(orders.length).toBeGreaterThanOrEqual(4);
    assertCheck({ suite: SUITE, name: 'q4 strip in compression with asymmetry: Newton order (median)', computed: orders[Math.floor(orders.length / 2)], target: 2, unit: '–', tolerance: 0.5, absolute: true, source: 'quadratic convergence of Newton with the consistent tangent (Simo & Hughes 1998, Computational Inelasticity)' });
  });
});
