/**
 * Templates: every template builds a model that passes parseModel and solves; elastic responses
 * against closed forms; the SMA coupon and actuator wire against the Lagoudas 2012 closed forms
 * (sma-models.md §1); size estimates against the built models; refused parameters name their
 * field; curve keys exist in the results.
 */
import { describe, expect, it } from 'vitest';
import { parseModel, templateParamsSchema, type MaterialParams, type Model } from '@phaseloop/shared';
import { buildProblem, type Problem } from '../assembly/problem';
import { runAnalysis, type AnalysisResult } from '../solve/nonlinear/driver';
import type { Frame } from '../output/frame';
import { check } from '../verification/support';
import { templates, TemplateParamsError, presets } from './index';
import { circleArea } from './common';

const E = 60000;
const NU = 0.33;
const ELASTIC: MaterialParams = { model: 'linear-elastic', E, nu: NU, alpha: 0, T_ref: 20 };
const SUITE = 'Templates';

interface Solved {
  model: Model;
  problem: Problem;
  result: AnalysisResult;
  last: Frame;
}

function solve(model: Model): Solved {
  const parsed = parseModel(model);
  if (!parsed.ok) throw new Error(parsed.issues.map((i) => `${i.path}: ${i.message}`).join('\n'));
  const problem = buildProblem(parsed.model);
  const result = runAnalysis(problem);
  expect(result.status, result.failure?.message).toBe('succeeded');
  return { model: parsed.model, problem, result, last: result.frames[result.frames.length - 1] };
}

/** A short elastic history: one increment up, one down where the template has a load. */
const quick = (load: number) => [{ name: 'load', load, increments: 1 }];

describe('every template builds a valid model that the engine solves (linear elastic)', () => {
  it('tensile coupon, wire: end force = E·A·ε (Hooke)', () => {
    const params = { template: 'tensile-coupon', form: 'wire', diameter: 0.5, gaugeLength: 25, history: quick(1) };
    const { last, problem } = solve(templates['tensile-coupon'].build(params, ELASTIC));
    const target = E * circleArea(0.5) * 0.01;
    check({ suite: SUITE, name: 'coupon wire, elastic: force at 1 % strain', computed: last.history['pull.Fx'], target, unit: 'N', tolerance: 1e-9, source: "closed form: Hooke's law F = EAε", tag: 'closed' });
    expect(templates['tensile-coupon'].estimateSize(params)).toMatchObject({ nodes: problem.nodeCount, elements: problem.elements.length, dofs: problem.nDof });
  });

  it('tensile coupon, tube: area of the annulus', () => {
    const params = { template: 'tensile-coupon', form: 'tube', diameter: 1, wallThickness: 0.2, history: quick(1) };
    const { last } = solve(templates['tensile-coupon'].build(params, ELASTIC));
    // Annulus area π(D² − d²)/4 with d = D − 2t.
    const area = (Math.PI * (1 - 0.6 ** 2)) / 4;
    expect(last.history['pull.Fx']).toBeCloseTo(E * area * 0.01, 9);
  });

  it('tensile coupon, strip dogbone (quarter model): gauge stress = E × extensometer strain', () => {
    for (const elementType of ['q4-eas', 'q8'] as const) {
      const params = { template: 'tensile-coupon', form: 'strip', elementType, history: quick(1) };
      const def = templates['tensile-coupon'];
      const { last, problem } = solve(def.build(params, ELASTIC));
      const [stressStrain] = def.curves(params);
      const strain = (last.history[stressStrain.x.key] * stressStrain.x.scale) / 100;
      const stress = last.history[stressStrain.y.key] * stressStrain.y.scale;
      // Uniaxial stress in the prismatic gauge section (Saint-Venant): σ = Eε.
      check({ suite: SUITE, name: `coupon strip (${elementType}), elastic: gauge stress vs E·ε(extensometer)`, computed: stress, target: E * strain, unit: 'MPa', tolerance: 0.01, source: "closed form: Hooke's law in a uniform uniaxial section", tag: 'closed' });
      expect(def.estimateSize(params)).toMatchObject({ nodes: problem.nodeCount, elements: problem.elements.length, dofs: problem.nDof });
    }
  });

  it('actuator wire: stroke = W·L/(E·A), and with a bias spring (W + F₀)/(EA/L + k)', () => {
    const def = templates['actuator-wire'];
    const base = { template: 'actuator-wire', length: 100, diameter: 0.25, weight: 7, history: quick(7) };
    const A = circleArea(0.25);
    const plain = solve(def.build(base, ELASTIC));
    expect(plain.last.history['stroke.ux']).toBeCloseTo((7 * 100) / (E * A), 9);
    const sprung = { ...base, biasSpring: true, springStiffness: 5, springPreload: 2 };
    const s = solve(def.build(sprung, ELASTIC));
    const target = (7 + 2) / ((E * A) / 100 + 5);
    check({ suite: SUITE, name: 'actuator wire with bias spring, elastic: stroke', computed: s.last.history['stroke.ux'], target, unit: 'mm', tolerance: 1e-9, source: 'closed form: springs in parallel, u = F/(EA/L + k)', tag: 'closed' });
    expect(def.estimateSize(sprung)).toMatchObject({ nodes: s.problem.nodeCount, elements: s.problem.elements.length, dofs: s.problem.nDof });
  });

  it('wire bending: P = 48EIδ/L³ (three-point) and 3EIδ/L³ (cantilever)', () => {
    const def = templates['wire-bending'];
    const d = 0.5;
    const I = (Math.PI * d ** 4) / 64;
    for (const [layout, factor, elements] of [['three-point', 48, 21], ['cantilever', 3, 20]] as const) {
      const params = { template: 'wire-bending', layout, span: 20, diameter: d, beamElements: elements, history: quick(0.5) };
      const { last, problem } = solve(def.build(params, ELASTIC));
      const [curve] = def.curves(params);
      const force = last.history[curve.y.key] * curve.y.scale;
      const deflection = last.history[curve.x.key] * curve.x.scale;
      expect(deflection).toBeCloseTo(0.5, 12);
      check({ suite: SUITE, name: `wire bending, ${layout}, Euler–Bernoulli: force at 0.5 mm`, computed: force, target: (factor * E * I * 0.5) / 20 ** 3, unit: 'N', tolerance: 1e-3, source: `closed form: Euler–Bernoulli beam, P = ${factor}EIδ/L³`, tag: 'closed' });
      expect(def.estimateSize(params)).toMatchObject({ nodes: problem.nodeCount, elements: problem.elements.length, dofs: problem.nDof });
    }
  });

  it('stent strut cell: solves the deployment preset; forces balance; the strut end follows the ring diameter', () => {
    const def = templates['stent-strut'];
    const base = { template: 'stent-strut', pulsatileCycles: 1 };
    const history = def.presets.deployment.segments(base).map((s) => ({ ...s, increments: 2 }));
    expect(history.map((s) => s.name)).toEqual(['crimp', 'release', 'body temperature', 'systole 1', 'diastole 1']);
    const params = { ...base, history };
    const { last, problem, result } = solve(def.build(params, ELASTIC));
    expect(def.estimateSize(params)).toMatchObject({ nodes: problem.nodeCount, elements: problem.elements.length, dofs: problem.nDof });
    // Equilibrium in x: the symmetry section carries what the strut end is pushed with.
    expect(last.history['apex.Fx'] + last.history['strutEnd.Fx']).toBeCloseTo(0, 9);
    // The strut end travels π(D − D₀)/(2N) at the end of the last segment (diastole).
    const p = templateParamsSchema.parse(params);
    if (p.template !== 'stent-strut') throw new Error('unreachable');
    const diastole = p.vesselDiameter - p.pulsatileChange / 2;
    expect(last.history['strutTip.ux']).toBeCloseTo((Math.PI * (diastole - p.expandedDiameter)) / (2 * p.crownsPerRing), 9);
    // Closing the V bends the crown: its inner fibre is compressed circumferentially, the outer stretched.
    const crimped = result.frames.filter((f) => f.segmentName === 'crimp').at(-1)!;
    expect(crimped.history['crownInner.sxx']).toBeLessThan(0);
    expect(crimped.history['crownOuter.sxx']).toBeGreaterThan(0);
  });

  it('plate with a hole: σ_yy at the hole side = 3σ (Kirsch), modest default mesh', () => {
    const def = templates['plate-with-hole'];
    for (const elementType of ['q8', 't6'] as const) {
      const params = { template: 'plate-with-hole', elementType };
      const { last, problem } = solve(def.build(params, ELASTIC));
      check({
        suite: SUITE,
        name: `plate-with-hole template (${elementType}, defaults: Ø2 in 40 × 40 mm): σ_yy at 90° from the load`,
        computed: last.history['holeSide.syy'],
        target: 300,
        unit: 'MPa',
        tolerance: 0.05,
        source: 'closed form: Kirsch (1898) σθθ = σ(1 − 2cos2θ)',
        tag: 'closed',
      });
      check({
        suite: SUITE,
        name: `plate-with-hole template (${elementType}): σ_xx on the load axis`,
        computed: last.history['holeTop.sxx'],
        target: -100,
        unit: 'MPa',
        tolerance: 0.08,
        source: 'closed form: Kirsch (1898) σθθ = σ(1 − 2cos2θ)',
        tag: 'closed',
      });
      expect(def.estimateSize(params)).toMatchObject({ nodes: problem.nodeCount, elements: problem.elements.length, dofs: problem.nDof });
    }
  });
});

describe('template curves and size estimates', () => {
  it('curve keys are history values of the solved models', () => {
    const cases: [keyof typeof templates, Record<string, unknown>][] = [
      ['tensile-coupon', { form: 'wire', history: quick(1) }],
      ['tensile-coupon', { form: 'strip', history: quick(1) }],
      ['actuator-wire', { history: quick(5) }],
      ['wire-bending', { history: quick(0.2) }],
      ['stent-strut', { history: quick(7.5) }],
      ['plate-with-hole', { history: quick(10) }],
    ];
    for (const [name, extra] of cases) {
      const params = { template: name, ...extra };
      const { last } = solve(templates[name].build(params, ELASTIC));
      for (const c of templates[name].curves(params)) {
        expect(last.history, `${name}: ${c.title}`).toHaveProperty([c.x.key]);
        expect(last.history, `${name}: ${c.title}`).toHaveProperty([c.y.key]);
      }
    }
  });

  it('estimateSize matches the built model for other element types and densities', () => {
    const cases: [keyof typeof templates, Record<string, unknown>][] = [
      ['plate-with-hole', { elementType: 't3', cellsAround: 3, cellsRadial: 5 }],
      ['plate-with-hole', { elementType: 'q4-eas', cellsAround: 5, cellsRadial: 4 }],
      ['tensile-coupon', { form: 'strip', elementType: 'q8', cellsAcross: 3, gaugeLength: 12 }],
      ['stent-strut', { elementType: 'q8', cellsAcross: 2, cellsAlongStrut: 7, cellsAroundCrown: 5 }],
      ['wire-bending', { layout: 'three-point', beamElements: 7 }],
      ['actuator-wire', { barElements: 9, biasSpring: true }],
    ];
    for (const [name, extra] of cases) {
      const params = { template: name, ...extra };
      const parsed = parseModel(templates[name].build(params, ELASTIC));
      if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
      const problem = buildProblem(parsed.model);
      const estimate = templates[name].estimateSize(params);
      expect(estimate, `${name} ${JSON.stringify(extra)}`).toMatchObject({ nodes: problem.nodeCount, elements: problem.elements.length, dofs: problem.nDof });
      // Each increment is at most 1/n of its segment, so the run has at least Σn increments.
      const least = parsed.model.segments.reduce((sum, s) => sum + Math.round(1 / s.increments.max), 0);
      expect(estimate.increments).toBe(least);
    }
  });
});

describe('bad template parameters are refused with the field named', () => {
  const refused = (name: keyof typeof templates, params: Record<string, unknown>): { path: string; message: string }[] => {
    try {
      templates[name].build({ template: name, ...params });
    } catch (e) {
      expect(e).toBeInstanceOf(TemplateParamsError);
      return (e as TemplateParamsError).issues;
    }
    throw new Error('parameters were accepted');
  };

  it('negative width, zero increments, impossible geometry', () => {
    expect(refused('tensile-coupon', { form: 'strip', gaugeWidth: -2 })).toContainEqual({ path: 'gaugeWidth', message: 'gaugeWidth must be > 0 mm' });
    expect(refused('stent-strut', { strutWidth: -0.1 })).toContainEqual({ path: 'strutWidth', message: 'strutWidth must be > 0 mm' });
    expect(refused('actuator-wire', { history: [{ name: 'cool', temperature: 20, increments: 0 }] })).toContainEqual({ path: 'history[0].increments', message: 'increments must be ≥ 1' });
    expect(refused('tensile-coupon', { form: 'tube', diameter: 1, wallThickness: 0.6 })[0].path).toBe('wallThickness');
    expect(refused('plate-with-hole', { holeDiameter: 50 }).map((i) => i.path)).toContain('plateWidth');
    expect(refused('stent-strut', { crimpedDiameter: 2 })[0]).toMatchObject({ path: 'crimpedDiameter' });
    expect(refused('actuator-wire', { lowTemperature: 120 })[0].path).toBe('lowTemperature');
    expect(refused('wire-bending', { diameter: 'thick' })[0]).toEqual({ path: 'diameter', message: 'diameter must be a number' });
    expect(refused('plate-with-hole', { history: [] })[0]).toEqual({ path: 'history', message: 'history needs at least one segment' });
  });

  it('the shared union refuses an unknown template', () => {
    const r = templateParamsSchema.safeParse({ template: 'bridge' });
    expect(r.success).toBe(false);
  });
});

describe('history presets', () => {
  it('write the named sequences', () => {
    const iso = presets.isobaricThermalCycle({ load: 7, low: 20, high: 110, cycles: 2 });
    expect(iso.map((s) => [s.name, s.load, s.temperature])).toEqual([
      ['apply load', 7, undefined],
      ['cool 1', undefined, 20],
      ['heat 1', undefined, 110],
      ['cool 2', undefined, 20],
      ['heat 2', undefined, 110],
    ]);
    // ASTM F2516: load to 6 % strain, then unload.
    expect(presets.tensileTestSequence().map((s) => s.load)).toEqual([6, 0]);
    const sme = presets.shapeMemorySequence({ peak: 5, low: -20, high: 60 });
    expect(sme.map((s) => s.name)).toEqual(['cool', 'load to 5', 'unload', 'heat (recovery)', 'cool back']);
    const pulses = presets.pulsatileCycles({ high: 7.63, low: 7.57, cycles: 4 });
    expect(pulses).toHaveLength(8);
    // 72 beats per minute (ASTM F2477's rate): one cycle lasts 60/72 s.
    expect(pulses[0].duration + pulses[1].duration).toBeCloseTo(60 / 72, 12);
  });
});

// ---------------------------------------------------------------------------------------------
// SMA: Lagoudas 2012 closed forms (constant H, E_A = E_M, Δα = 0, n₁…n₄ = 1), sma-models.md §1.

const SMA_SOURCE = 'Lagoudas et al. 2012 closed-form transformation lines (constant H, n = 1)';
const closedFormMaterial = (m: { Ms0: number; Mf0: number; As0: number; Af0: number; C_M: number; C_A: number }): MaterialParams => ({
  model: 'lagoudas2012',
  E_A: 50000,
  E_M: 50000,
  nu: 0.33,
  alpha_A: 0,
  alpha_M: 0,
  T_ref: 20,
  ...m,
  sigma_star: 200,
  H_min: 0.04,
  H_sat: 0.04,
  k_t: 0,
  n1: 1,
  n2: 1,
  n3: 1,
  n4: 1,
});

/** x where the least-squares line through the points with 0.05 < ξ < 0.95 reaches ξ = target. */
function where(points: [number, number][], target: number): number {
  const pts = points.filter(([, xi]) => xi > 0.05 && xi < 0.95);
  expect(pts.length, 'frames inside the transformation').toBeGreaterThanOrEqual(20);
  const n = pts.length;
  const mx = pts.reduce((s, p) => s + p[0], 0) / n;
  const my = pts.reduce((s, p) => s + p[1], 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (const [x, y] of pts) {
    sxy += (x - mx) * (y - my);
    sxx += (x - mx) ** 2;
  }
  return mx + (target - my) / (sxy / sxx);
}

describe('SMA cycles through the templates (Lagoudas 2012)', () => {
  it('tensile coupon wire at 50 °C: pseudoelastic loop to 6 % with the closed-form plateau stresses', () => {
    const m = { Ms0: 18, Mf0: 2, As0: 22, Af0: 38, C_M: 7, C_A: 8 };
    const T = 50;
    const def = templates['tensile-coupon'];
    const params = { template: 'tensile-coupon', form: 'wire', testTemperature: T, history: def.presets.tensileTest.segments({ template: 'tensile-coupon' }) };
    const { result, last } = solve(def.build(params, closedFormMaterial(m)));
    const area = circleArea(0.5);
    const curve = (name: string) => result.frames.filter((f) => f.segmentName === name).map((f): [number, number] => [f.history['pull.Fx'] / area, f.pointXi[0]]);
    const loading = curve('load to 6 %');
    const unloading = curve('unload');
    const cases: [string, number, number][] = [
      ['forward start σ = C_M(T − Ms0)', where(loading, 0), m.C_M * (T - m.Ms0)],
      ['forward finish σ = C_M(T − Mf0)', where(loading, 1), m.C_M * (T - m.Mf0)],
      ['reverse start σ = C_A(T − As0)', where(unloading, 1), m.C_A * (T - m.As0)],
      ['reverse finish σ = C_A(T − Af0)', where(unloading, 0), m.C_A * (T - m.Af0)],
    ];
    for (const [name, computed, target] of cases) {
      check({ suite: SUITE, name: `tensile coupon wire at ${T} °C: ${name}`, computed, target, unit: 'MPa', tolerance: 0.005, source: SMA_SOURCE, tag: 'closed' });
    }
    expect(Math.max(...loading.map(([, xi]) => xi))).toBe(1);
    // Full recovery: back to zero strain and zero force, all austenite.
    expect(last.pointXi[0]).toBe(0);
    expect(Math.abs(last.history['pull.Fx'])).toBeLessThan(1e-6);
  });

  it('actuator wire: isobaric cycle with the weight, transformation temperatures shifted by σ/C', () => {
    const m = { Ms0: 55, Mf0: 40, As0: 65, Af0: 80, C_M: 7, C_A: 8 };
    const def = templates['actuator-wire'];
    const base = { template: 'actuator-wire', weight: 7, lowTemperature: 20, highTemperature: 110 };
    const params = { ...base, history: def.presets.isobaric.segments(base) };
    const { result, last } = solve(def.build(params, closedFormMaterial(m)));
    const sigma = 7 / circleArea(0.25);
    const curve = (name: string) => result.frames.filter((f) => f.segmentName === name).map((f): [number, number] => [f.history['stroke.temperature'], f.pointXi[0]]);
    const cool = curve('cool');
    const heat = curve('heat');
    const cases: [string, number, number][] = [
      ['Ms(σ) = Ms0 + σ/C_M', where(cool, 0), m.Ms0 + sigma / m.C_M],
      ['Mf(σ) = Mf0 + σ/C_M', where(cool, 1), m.Mf0 + sigma / m.C_M],
      ['As(σ) = As0 + σ/C_A', where(heat, 1), m.As0 + sigma / m.C_A],
      ['Af(σ) = Af0 + σ/C_A', where(heat, 0), m.Af0 + sigma / m.C_A],
    ];
    for (const [name, computed, target] of cases) {
      check({ suite: SUITE, name: `actuator wire at ${sigma.toFixed(1)} MPa: ${name}`, computed, target, unit: '°C', tolerance: 0.1, absolute: true, source: SMA_SOURCE, tag: 'closed' });
    }
    // Stroke of the cycle = H·L (the strain jump is H with constant H and ΔS = 0).
    const cooled = result.frames.filter((f) => f.segmentName === 'cool').at(-1)!;
    check({ suite: SUITE, name: 'actuator wire: stroke on cooling = H·L', computed: cooled.history['stroke.ux'] - last.history['stroke.ux'], target: 0.04 * 100, unit: 'mm', tolerance: 1e-6, source: SMA_SOURCE, tag: 'closed' });
  });

  it('actuator wire with a bias spring: start and finish temperatures at the spring-shifted stresses', () => {
    const m = { Ms0: 55, Mf0: 40, As0: 65, Af0: 80, C_M: 7, C_A: 8 };
    const def = templates['actuator-wire'];
    const [W, F0, k, L, E, H] = [7, 1, 0.5, 100, 50000, 0.04];
    const base = { template: 'actuator-wire', weight: W, biasSpring: true, springStiffness: k, springPreload: F0, length: L, lowTemperature: 20, highTemperature: 110 };
    const { result } = solve(def.build({ ...base, history: def.presets.isobaric.segments(base) }, closedFormMaterial(m)));
    const A = circleArea(0.25);
    // Wire and spring share the end displacement u: σA = W + F₀ − k·u with u = L(σ/E + Hξ),
    // so σ(ξ) = (W + F₀ − kLHξ)/(A + kL/E): austenite (ξ = 0) and martensite (ξ = 1) stresses.
    const sigma0 = (W + F0) / (A + (k * L) / E);
    const sigma1 = (W + F0 - k * L * H) / (A + (k * L) / E);
    const curve = (name: string) => result.frames.filter((f) => f.segmentName === name).map((f): [number, number] => [f.history['stroke.temperature'], f.pointXi[0]]);
    const cases: [string, number, number][] = [
      ['Ms at σ(ξ=0)', where(curve('cool'), 0), m.Ms0 + sigma0 / m.C_M],
      ['Mf at σ(ξ=1)', where(curve('cool'), 1), m.Mf0 + sigma1 / m.C_M],
      ['As at σ(ξ=1)', where(curve('heat'), 1), m.As0 + sigma1 / m.C_A],
      ['Af at σ(ξ=0)', where(curve('heat'), 0), m.Af0 + sigma0 / m.C_A],
    ];
    for (const [name, computed, target] of cases) {
      check({ suite: SUITE, name: `actuator wire with bias spring ${k} N/mm: ${name}`, computed, target, unit: '°C', tolerance: 0.1, absolute: true, source: `${SMA_SOURCE}, with the linear spring's equilibrium`, tag: 'closed' });
    }
  });

  it('actuator wire, shape-memory sequence (Souza–Auricchio): residual strain and free recovery temperatures', () => {
    // The phase-fraction model cannot reorient martensite below Mf, so the shape-memory
    // sequence uses the transformation-strain model (sma-models.md §2).
    const s = { R: 50, h: 500, beta: 5, T0: 20, eps_L: 0.05 };
    const material: MaterialParams = { model: 'souza-auricchio', E: 50000, nu: 0.3, alpha: 0, T_ref: 20, ...s, asymmetry: 0 };
    const L = 100;
    const history = presets.shapeMemorySequence({ peak: 6, low: 10, high: 60, increments: 250 });
    const { result } = solve(templates['actuator-wire'].build({ template: 'actuator-wire', length: L, lowTemperature: 10, highTemperature: 60, history }, material));
    const source = 'Souza et al. (1998) / Auricchio & Petrini (2004) uniaxial closed forms';
    const end = (name: string) => result.frames.filter((f) => f.segmentName === name).at(-1)!;
    // After loading past saturation and unloading below T0, the strain left is √(2/3)·ε_L.
    const residual = Math.sqrt(2 / 3) * s.eps_L;
    check({ suite: SUITE, name: 'actuator wire, shape memory: residual strain after unloading', computed: end('unload').history['stroke.ux'] / L, target: residual, unit: '–', tolerance: 1e-6, source, tag: 'closed' });
    // Free recovery on heating: starts at T0 + (R − hε_L)/β, ends at T0 + R/β (strain linear in T).
    const heat = result.frames.filter((f) => f.segmentName === 'heat (recovery)').map((f): [number, number] => [f.history['stroke.temperature'], f.history['stroke.ux'] / L / residual]);
    check({ suite: SUITE, name: 'actuator wire, shape memory: free recovery starts', computed: where(heat, 1), target: s.T0 + (s.R - s.h * s.eps_L) / s.beta, unit: '°C', tolerance: 0.05, absolute: true, source, tag: 'closed' });
    check({ suite: SUITE, name: 'actuator wire, shape memory: free recovery ends', computed: where(heat, 0), target: s.T0 + s.R / s.beta, unit: '°C', tolerance: 0.05, absolute: true, source, tag: 'closed' });
    expect(Math.abs(end('cool back').history['stroke.ux'])).toBeLessThan(1e-9);
  });

  it('stent strut cell, demo superelastic material: crimp → release → body temperature → pulsatile cycle', () => {
    const def = templates['stent-strut'];
    const base = { template: 'stent-strut', pulsatileCycles: 1, cellsAcross: 2, cellsAlongStrut: 8, cellsAroundCrown: 5 };
    const history = def.presets.deployment.segments(base).map((s) => ({ ...s, increments: s.name === 'crimp' || s.name === 'release' ? 25 : 4 }));
    const { result } = solve(def.build({ ...base, history }));
    const end = (name: string) => result.frames.filter((f) => f.segmentName === name).at(-1)!;
    const xiMax = (f: Frame) => Math.max(...f.pointXi);
    // Crimping below Af0 + σ/C transforms the crown; releasing reverses part of it.
    expect(xiMax(end('crimp'))).toBeGreaterThan(0.1);
    expect(xiMax(end('release'))).toBeLessThan(xiMax(end('crimp')));
    // Warming at a held diameter raises the transformation stresses (Clausius–Clapeyron, slope
    // C_A > 0): martensite reverts and the ring pushes outwards harder.
    expect(xiMax(end('body temperature'))).toBeLessThan(xiMax(end('release')));
    expect(-end('body temperature').history['strutEnd.Fx']).toBeGreaterThan(-end('release').history['strutEnd.Fx']);
  });

  it('default demo materials complete the default histories (coupon wire, actuator wire)', () => {
    for (const name of ['tensile-coupon', 'actuator-wire'] as const) {
      const { last } = solve(templates[name].build({ template: name }));
      expect(last.segmentName).toBe(name === 'tensile-coupon' ? 'unload' : 'heat');
    }
  });
});
