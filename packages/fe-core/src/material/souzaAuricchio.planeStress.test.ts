/**
 * Plane stress with the transformation-strain model: the condensed tangent at and around
 * saturation, and Newton convergence of a strip driven past saturation and back WITHOUT the
 * driver's predictor.
 *
 * Diagnosis recorded here (a reported slow/stalling plane-stress convergence):
 *  - the 3D tangent in the saturated (γ) branch and the condensed plane-stress tangent agree with
 *    central differences at saturation and on both sides of the saturation transition;
 *  - tightening the local σ33 tolerance changes nothing in the global residual sequences;
 *  - what stalls are increments in which Newton falls into a 2-cycle with an unchanging branch
 *    pattern (elastic points plus saturated, reorienting points next to the driven edge): the
 *    saturated reorientation response levels off like a perfectly plastic one, and full Newton
 *    without a start from the predictor cycles on it. A line search removes the cycles; the
 *    converging increments are quadratic in either case.
 */
import { describe, expect, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { rectangle } from '../mesh/structured';
import { assertCheck } from './materialPointTesting';
import { ReducedMaterial, createReducedOutput } from './reduce';
import { driveReduced, tangentErrorReduced } from './reduceTesting';
import { createSouzaAuricchio, type SouzaAuricchioInput } from './souzaAuricchio';
import { solveRecording } from './structureTesting';

const SUITE = 'SMA: Souza–Auricchio';
const S1: SouzaAuricchioInput = { E: 52000, nu: 0.33, alpha: 0, T_ref: 20, h: 1000, beta: 6.2, T0: -10, R: 60, eps_L: 0.05 };
const T = 37;

describe('Souza–Auricchio plane stress: condensed tangent around saturation', () => {
  const red = new ReducedMaterial(createSouzaAuricchio(S1), 'planeStress');
  const virgin = new Float64Array(red.stateSize);
  const zero = new Float64Array(3);
  const dir = [1, -0.35, 0.25];
  const load = (s: number) => ({ strain: Float64Array.from(dir, (x) => x * s), strainOld: zero, temperature: T, temperatureOld: T });
  const norm = (s: number) => {
    const st = new Float64Array(red.stateSize);
    const out = createReducedOutput('planeStress');
    red.update(load(s), virgin, 0, st, 0, out);
    expect(out.ok, out.message).toBe(true);
    return Math.hypot(...st.subarray(0, 6));
  };
  // Strain scale at which one increment from the virgin state just reaches ‖eᵗʳ‖ = ε_L (bisection).
  let lo = 0.01;
  let hi = 0.2;
  for (let k = 0; k < 60; k++) {
    const mid = 0.5 * (lo + hi);
    if (norm(mid) < S1.eps_L * (1 - 1e-13)) lo = mid;
    else hi = mid;
  }
  const sSat = hi;

  it('agrees with central differences just before, just after and well past the saturation transition', () => {
    expect(norm(sSat * (1 - 1e-5))).toBeLessThan(S1.eps_L);
    expect(norm(sSat * (1 + 1e-5))).toBeCloseTo(S1.eps_L, 14);
    for (const [name, f, h] of [
      ['just before saturation', 1 - 1e-5, 1e-10],
      ['just after saturation', 1 + 1e-5, 1e-10],
      ['saturated, 5 % past', 1.05, 1e-8],
      ['saturated, deep (3× the transition strain)', 3, 1e-8],
    ] as const) {
      const err = tangentErrorReduced(red, load(sSat * f), virgin, h);
      expect(err, name).toBeLessThan(1e-5);
    }
  });

  it('agrees with central differences from a saturated state: reorientation, reverse from saturation, elastic unloading', () => {
    const { stateOld, strainOld } = driveReduced(red, [Array.from(dir, (x) => x * 1.4 * sSat)], [T], T);
    expect(Math.hypot(...stateOld.subarray(0, 6))).toBeCloseTo(S1.eps_L, 14);
    const cases: [string, number[]][] = [
      ['reorientation at saturation', [strainOld[0] * 1.02, strainOld[1] + 0.01, strainOld[2] - 0.012]],
      ['reverse from saturation', Array.from(strainOld, (x) => x * 0.55)],
      ['elastic unloading at saturation', Array.from(strainOld, (x) => x * 0.97)],
    ];
    for (const [name, strain] of cases) {
      const err = tangentErrorReduced(red, { strain: Float64Array.from(strain), strainOld, temperature: T, temperatureOld: T }, stateOld, 1e-8);
      expect(err, name).toBeLessThan(1e-5);
    }
  });
});

const NITI = { model: 'souza-auricchio' as const, ...S1 };

function strip(lineSearch: boolean) {
  const L = 20;
  const H = 4;
  const mesh = rectangle({ width: L, height: H, nx: 4, ny: 2 }, { type: 'q4', section: 's', material: 'niti' });
  const input: ModelInput = {
    format: 'phaseloop-model/1',
    ...mesh,
    nodeSets: { ...mesh.nodeSets, origin: [1] },
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
    materials: { niti: NITI },
    initialTemperature: T,
    supports: [
      { type: 'fixed', set: 'left', dofs: ['ux'] },
      { type: 'fixed', set: 'origin', dofs: ['uy'] },
    ],
    loads: [{ type: 'displacement', name: 'pull', set: 'right', dof: 'ux' }],
    segments: [
      { name: 'load', targets: { pull: 0.07 * L }, increments: { initial: 0.04, min: 0.001, max: 0.04 } },
      { name: 'unload', targets: { pull: 0 }, increments: { initial: 0.04, min: 0.001, max: 0.04 } },
    ],
    output: { fields: ['displacement', 'reaction'], points: [], reactionSums: [{ name: 'left', set: 'left' }] },
    solver: { forceTolerance: 1e-10, displacementTolerance: 1e-10, lineSearch },
  };
  const { result, sequences } = solveRecording(input, { predictor: false });
  expect(result.status, result.failure?.message).toBe('succeeded');
  // order estimate log(r_{k+1}/r_k)/log(r_k/r_{k−1}) inside the basin and above round-off
  const orders: number[] = [];
  for (const r of sequences) {
    for (let k = 1; k + 1 < r.length; k++) {
      if (r[k - 1] < 1e-2 && r[k + 1] > 1e-12) orders.push(Math.log(r[k + 1] / r[k]) / Math.log(r[k] / r[k - 1]));
    }
  }
  orders.sort((a, b) => a - b);
  return { result, orders, median: orders[Math.floor(orders.length / 2)] };
}

describe('Souza–Auricchio plane stress: Newton without the predictor', () => {
  const SOURCE = 'quadratic convergence of Newton with the consistent tangent (Simo & Hughes 1998, Computational Inelasticity)';

  it('q4 strip pulled past saturation and back, line search on: no cut-back, quadratic', () => {
    const { result, orders, median } = strip(true);
    expect(result.stats.cutBacks).toBe(0);
    expect(orders.length).toBeGreaterThan(20);
    // no linear stretch: every order estimate stays well above 1
    expect(orders[0]).toBeGreaterThan(1.3);
    assertCheck({ suite: SUITE, name: 'plane-stress q4 strip past saturation, no predictor, line search: Newton order (median)', computed: median, target: 2, unit: '–', tolerance: 0.5, absolute: true, source: SOURCE });
  });

  it('q4 strip without line search: the increments that converge are quadratic (stalled ones are cut back)', () => {
    const { orders, median } = strip(false);
    expect(orders.length).toBeGreaterThan(20);
    assertCheck({ suite: SUITE, name: 'plane-stress q4 strip past saturation, no predictor, no line search: Newton order (median)', computed: median, target: 2, unit: '–', tolerance: 0.5, absolute: true, source: SOURCE });
  });
});
