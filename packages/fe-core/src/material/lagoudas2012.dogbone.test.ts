/**
 * Acceptance runs of issue 4 on the plane-stress dogbone of the tensile-coupon template (quarter
 * model, Q4 and Q8) with the example alloy: a full pseudoelastic load–unload to 6 % at
 * 37 °C (prescribed grip displacement) and an isobaric thermal cycle under a constant grip
 * traction, both without failure and with Newton converging quadratically.
 */
import { describe, expect, it } from 'vitest';
import type { MaterialParams, Model } from '@phaseloop/shared';
import { buildProblem } from '../assembly/problem';
import { runAnalysis } from '../solve/nonlinear/driver';
import { buildTensileCoupon } from '../templates/tensileCoupon';
import { assertCheck } from './materialPointTesting';

const SUITE = 'SMA: Lagoudas 2012';
const ALLOY: MaterialParams = {
  model: 'lagoudas2012',
  E_A: 60000, E_M: 45000, nu: 0.33, alpha_A: 1.1e-5, alpha_M: 6.6e-6, T_ref: 37,
  Ms0: 10, Mf0: -5, As0: 15, Af0: 30, C_M: 7, C_A: 7, sigma_star: 300,
  H_min: 0.02, H_sat: 0.05, k_t: 0.01, n1: 1, n2: 1, n3: 1, n4: 1,
};

function run(model: Model) {
  const sequences: number[][] = [];
  let cutBacks = 0;
  const result = runAnalysis(buildProblem(model), {
    onIteration: (i) => {
      if (i.iteration === 0) sequences.push([]);
      sequences[sequences.length - 1].push(i.residualNorm);
    },
    onCutBack: () => cutBacks++,
  });
  const orders: number[] = [];
  for (const r of sequences) {
    for (let k = 1; k + 1 < r.length; k++) {
      if (r[k - 1] < 2e-2 && r[k + 1] > 1e-12) orders.push(Math.log(r[k + 1] / r[k]) / Math.log(r[k] / r[k - 1]));
    }
  }
  orders.sort((a, b) => a - b);
  return { result, cutBacks, median: orders[Math.floor(orders.length / 2)], samples: orders.length };
}

/** The template meshes Q4-EAS or Q8; plain Q4 uses the same nodes with the element type changed. */
function dogbone(type: 'q4' | 'q8'): Model {
  const elementType = type === 'q8' ? 'q8' : 'q4-eas';
  const model = buildTensileCoupon({ template: 'tensile-coupon', form: 'strip', elementType, cellsAcross: type === 'q8' ? 1 : 2, testTemperature: 37 }, ALLOY);
  const elements = model.elements.map((e) => ({ ...e, type }));
  return { ...model, elements, solver: { forceTolerance: 1e-9, displacementTolerance: 1e-9, lineSearch: false } };
}

describe('issue 4 acceptance: plane-stress dogbone with the Lagoudas 2012 model', () => {
  for (const type of ['q4', 'q8'] as const) {
    it(`${type}: pseudoelastic load–unload to 6 % at 37 °C`, () => {
      const { result, cutBacks, median, samples } = run(dogbone(type));
      expect(result.status, result.failure?.message).toBe('succeeded');
      const peak = result.frames.reduce((a, f) => Math.max(a, ...Array.from(f.pointXi)), 0);
      expect(peak).toBeGreaterThan(0.9);
      const last = result.frames.at(-1)!;
      expect(Math.max(...Array.from(last.pointXi))).toBe(0);
      expect(Math.abs(last.history['grip.Fx'])).toBeLessThan(1e-6);
      expect(samples).toBeGreaterThan(5);
      assertCheck({ suite: SUITE, name: `dogbone ${type}, pseudoelastic 6 % loop at 37 °C: Newton order (median; ${cutBacks} cut-backs)`, computed: median, target: 2, unit: '–', tolerance: 0.5, absolute: true, source: 'quadratic convergence of Newton with the consistent tangent (Simo & Hughes 1998, Computational Inelasticity)' });
    });

    it(`${type}: isobaric thermal cycle under 150 MPa gauge stress (60 → −20 → 60 °C)`, () => {
      const base = dogbone(type);
      const gaugeHalfWidth = 1; // template default gaugeWidth 2 mm
      const thickness = 0.5;
      const force = 150 * gaugeHalfWidth * thickness; // quarter model: half width, full thickness
      const model: Model = {
        ...base,
        initialTemperature: 60,
        loads: [{ type: 'force', name: 'pull', set: 'grip', dof: 'fx' }],
        segments: [
          { name: 'load', duration: 1, targets: { pull: force / base.nodeSets.grip.length }, increments: { initial: 0.1, min: 0.001, max: 0.1, maxIterations: 15 }, frames: 'every' },
          { name: 'cool', duration: 1, targets: {}, temperature: -20, increments: { initial: 0.0125, min: 0.0005, max: 0.0125, maxIterations: 15 }, frames: 'every' },
          { name: 'heat', duration: 1, targets: {}, temperature: 60, increments: { initial: 0.0125, min: 0.0005, max: 0.0125, maxIterations: 15 }, frames: 'every' },
        ],
        materials: { niti: { ...ALLOY, T_ref: 60 } as MaterialParams },
      };
      const { result } = run(model);
      expect(result.status, result.failure?.message).toBe('succeeded');
      const cold = result.frames.filter((f) => f.segment === 1).at(-1)!;
      const gaugeXi = cold.pointXi[0];
      expect(gaugeXi).toBeGreaterThan(0.99);
      expect(Math.max(...Array.from(result.frames.at(-1)!.pointXi))).toBe(0);
      // a strain jump of the order of H_cur(150 MPa) at the extensometer
      expect(cold.history['extensometer.ux']).toBeGreaterThan(result.frames.filter((f) => f.segment === 0).at(-1)!.history['extensometer.ux']);
    });
  }
});
