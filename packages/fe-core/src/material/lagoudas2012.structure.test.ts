/**
 * The phase-fraction SMA model inside structures solved by the nonlinear driver:
 *  - a plane-stress strip (Q4 and Q8) in uniform uniaxial stress must reproduce the material-point
 *    response increment by increment (the displacement field is linear, so every integration
 *    point sees the driver's strain history exactly), for a pseudoelastic loop and for an
 *    isobaric thermal cycle under constant traction;
 *  - a quarter plate with a hole (Q8 and Q4) and a fibre beam in three-point bending run a full
 *    pseudoelastic load–unload with Newton converging quadratically (consistent, non-symmetric
 *    tangent; e.g. Simo & Hughes 1998, Computational Inelasticity, §3.3).
 */
import { describe, expect, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { line, rectangle } from '../mesh/structured';
import type { AnalysisResult } from '../solve/nonlinear/driver';
import { createLagoudas2012 } from './lagoudas2012';
import { runMaterialPoint } from './materialPoint';
import { assertCheck } from './materialPointTesting';
import { plateWithHoleLoop, solveRecording } from './structureTesting';

const SUITE = 'SMA: Lagoudas 2012';
/** Issue 4's example alloy, with T_ref at the test temperature (no initial thermal stress). */
const ALLOY = {
  model: 'lagoudas2012' as const,
  E_A: 60000, E_M: 45000, nu: 0.33, alpha_A: 1.1e-5, alpha_M: 6.6e-6, T_ref: 37,
  Ms0: 10, Mf0: -5, As0: 15, Af0: 30, C_M: 7, C_A: 7, sigma_star: 300,
  H_min: 0.02, H_sat: 0.05, k_t: 0.01, n1: 1, n2: 1, n3: 1, n4: 1,
};


/** Median observed order log(r_{k+1}/r_k)/log(r_k/r_{k−1}) in the asymptotic range. */
function newtonOrder(sequences: number[][], start = 1e-2): { median: number; samples: number } {
  const orders: number[] = [];
  for (const r of sequences) {
    for (let k = 1; k + 1 < r.length; k++) {
      if (r[k - 1] < start && r[k + 1] > 1e-12) orders.push(Math.log(r[k + 1] / r[k]) / Math.log(r[k] / r[k - 1]));
    }
  }
  orders.sort((a, b) => a - b);
  return { median: orders[Math.floor(orders.length / 2)], samples: orders.length };
}

const L = 20;
const H = 4;
const solverTight = { forceTolerance: 1e-10, displacementTolerance: 1e-10, lineSearch: false };

function strip(type: 'q4' | 'q8', extra: Partial<ModelInput> & Pick<ModelInput, 'segments'>): ModelInput {
  const mesh = rectangle({ width: L, height: H, nx: 4, ny: 2 }, { type, section: 's', material: 'niti' });
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    nodeSets: { ...mesh.nodeSets, origin: [1] },
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
    materials: { niti: ALLOY },
    supports: [
      { type: 'fixed', set: 'left', dofs: ['ux'] },
      { type: 'fixed', set: 'origin', dofs: ['uy'] },
    ],
    output: { fields: ['displacement', 'reaction', 'stress', 'martensiteFraction'], points: [{ name: 'tip', x: L, y: 0 }], reactionSums: [{ name: 'left', set: 'left' }] },
    solver: solverTight,
    ...extra,
  };
}

function expectSucceeded(r: AnalysisResult): void {
  expect(r.status, r.failure?.message).toBe('succeeded');
}

describe('Lagoudas 2012 in a plane-stress strip: structure = material point', () => {
  for (const type of ['q4', 'q8'] as const) {
    it(`${type}: pseudoelastic loop to 6 % at 37 °C`, () => {
      const { result, cutBacks } = solveRecording(
        strip(type, {
          initialTemperature: 37,
          loads: [{ type: 'displacement', name: 'pull', set: 'right', dof: 'ux' }],
          segments: [
            { name: 'load', targets: { pull: 0.06 * L }, increments: { initial: 0.02, min: 0.001, max: 0.02 } },
            { name: 'unload', targets: { pull: 0 }, increments: { initial: 0.02, min: 0.001, max: 0.02 } },
          ],
        }),
      );
      expectSucceeded(result);
      expect(cutBacks).toBeLessThanOrEqual(2);
      // Replay the same strain increments at one material point.
      const strains = result.frames.map((f) => f.history['tip.ux'] / L);
      const mp = runMaterialPoint(createLagoudas2012(ALLOY), {
        control: 'strain',
        path: strains.map((value) => ({ value, temperature: 37, increments: 1 })),
      });
      expect(mp.ok, mp.message).toBe(true);
      let worst = 0;
      let peakXi = 0;
      result.frames.forEach((f, k) => {
        const sigma = -f.history['left.Fx'] / (H * 1);
        worst = Math.max(worst, Math.abs(sigma - mp.rows[k].stress));
        peakXi = Math.max(peakXi, f.pointXi[0]);
      });
      expect(peakXi).toBeGreaterThan(0.99);
      assertCheck({ suite: SUITE, name: `${type} strip pseudoelastic loop: max |σ_structure − σ_material point|`, computed: worst, target: 0, unit: 'MPa', tolerance: 1e-6, absolute: true, source: 'closed form: uniform uniaxial stress in a strip on rollers equals the material-point response' });
      expect(result.frames.at(-1)!.pointXi.every((x) => x === 0)).toBe(true);
    });
  }

  it('q8: isobaric thermal cycle under 150 MPa traction (cool 60 → −20 °C, heat back)', () => {
    const sigma = 150;
    const hot = { ...ALLOY, T_ref: 60 }; // stress-free start at 60 °C
    const input = strip('q8', {
      materials: { niti: hot },
      initialTemperature: 60,
      loads: [{ type: 'traction', name: 'pull', edgeSet: 'right', direction: [1, 0] }],
      segments: [
        { name: 'load', targets: { pull: sigma }, increments: { initial: 0.1, min: 0.001, max: 0.1 } },
        { name: 'cool', temperature: -20, increments: { initial: 0.0125, min: 0.0005, max: 0.0125 } },
        { name: 'heat', temperature: 60, increments: { initial: 0.0125, min: 0.0005, max: 0.0125 } },
      ],
    });
    const { result, cutBacks, sequences } = solveRecording(input);
    expectSucceeded(result);
    expect(cutBacks).toBe(0); // force and temperature control: no cut-back needed
    const temps = result.frames.map((f) => f.temperature[0]);
    const stresses = result.frames.map((f) => -f.history['left.Fx'] / H);
    // Material point along the same (σ, T) increments, stress control.
    const mp = runMaterialPoint(createLagoudas2012(hot), {
      control: 'stress',
      path: [{ value: 0, temperature: 60 }, ...result.frames.slice(1).map((f, k) => ({ value: stresses[k + 1], temperature: temps[k + 1], increments: 1 }))],
    });
    expect(mp.ok, mp.message).toBe(true);
    let worst = 0;
    const u0 = result.frames[0].history['tip.ux'];
    result.frames.forEach((f, k) => {
      worst = Math.max(worst, Math.abs((f.history['tip.ux'] - u0) / L - mp.rows[k].strain));
    });
    assertCheck({ suite: SUITE, name: 'q8 strip isobaric cycle at 150 MPa: max |ε_structure − ε_material point|', computed: worst, target: 0, unit: '-', tolerance: 1e-9, absolute: true, source: 'closed form: uniform uniaxial stress in a strip on rollers equals the material-point response' });
    const coldest = result.frames.reduce((a, f) => (f.temperature[0] < a.temperature[0] ? f : a));
    expect(coldest.pointXi[0]).toBe(1);
    expect(result.frames.at(-1)!.pointXi[0]).toBe(0);
    expect(newtonOrder(sequences).samples).toBeGreaterThan(0);
  });
});

describe('Lagoudas 2012 in structures: full loops with quadratic Newton convergence', () => {
  for (const type of ['q8', 'q4'] as const) {
    it(`${type} quarter plate with a hole: pseudoelastic load–unload at 37 °C`, () => {
      const { result, sequences, cutBacks } = solveRecording(plateWithHoleLoop(type, ALLOY));
      expectSucceeded(result);
      const peak = result.frames.reduce((a, f) => Math.max(a, ...Array.from(f.pointXi)), 0);
      expect(peak).toBeGreaterThan(0.5);
      const last = result.frames.at(-1)!;
      expect(Math.max(...Array.from(last.pointXi))).toBe(0);
      expect(Math.abs(last.history['base.Fy'])).toBeLessThan(1e-6);
      const { median, samples } = newtonOrder(sequences);
      expect(samples).toBeGreaterThan(5);
      assertCheck({ suite: SUITE, name: `${type} plate with a hole, pseudoelastic loop: Newton order (median; ${cutBacks} cut-backs)`, computed: median, target: 2, unit: '–', tolerance: 0.5, absolute: true, source: 'quadratic convergence of Newton with the consistent tangent (Simo & Hughes 1998, Computational Inelasticity)' });
    });
  }

  it('fibre beam (wire) in three-point bending: pseudoelastic load–unload at 37 °C', () => {
    const span = 20;
    const mesh = line({ from: [0, 0], to: [span, 0], n: 16 }, { type: 'beam2', section: 'wire', material: 'niti' });
    const mid = mesh.nodes.find((n) => Math.abs(n.x - span / 2) < 1e-9)!.id;
    const d = 0.5;
    const { result, sequences, cutBacks } = solveRecording({
      format: 'phaseloop-model/1',
      ...mesh,
      nodeSets: { ...mesh.nodeSets, mid: [mid] },
      sections: { wire: { kind: 'beam', theory: 'euler-bernoulli', crossSection: { shape: 'circle', diameter: d }, fibres: 24 } },
      materials: { niti: ALLOY },
      initialTemperature: 37,
      supports: [
        { type: 'fixed', set: 'start', dofs: ['ux', 'uy'] },
        { type: 'fixed', set: 'end', dofs: ['uy'] },
      ],
      loads: [{ type: 'displacement', name: 'press', set: 'mid', dof: 'uy' }],
      segments: [
        { name: 'load', targets: { press: -2 }, increments: { initial: 0.025, min: 0.001, max: 0.025 } },
        { name: 'unload', targets: { press: 0 }, increments: { initial: 0.025, min: 0.001, max: 0.025 } },
      ],
      output: { fields: ['displacement', 'reaction', 'martensiteFraction'], points: [], reactionSums: [{ name: 'mid', set: 'mid' }, { name: 'ends', set: 'start' }] },
      solver: { forceTolerance: 1e-9, displacementTolerance: 1e-9, lineSearch: false },
    });
    expectSucceeded(result);
    expect(cutBacks).toBeLessThanOrEqual(2);
    const peak = result.frames.reduce((a, f) => Math.max(a, ...Array.from(f.pointXi)), 0);
    expect(peak).toBeGreaterThan(0.3);
    expect(Math.max(...Array.from(result.frames.at(-1)!.pointXi))).toBe(0);
    // Full pseudoelastic recovery: no force left at zero deflection; hysteresis: at half the
    // deflection the force on unloading is below the one on loading; equilibrium at every frame.
    expect(Math.abs(result.frames.at(-1)!.history['mid.Fy'])).toBeLessThan(1e-7);
    const half = result.frames.filter((f) => Math.abs(f.time - 0.5) < 1e-9 || Math.abs(f.time - 1.5) < 1e-9);
    expect(half).toHaveLength(2);
    expect(Math.abs(half[1].history['mid.Fy'])).toBeLessThan(0.95 * Math.abs(half[0].history['mid.Fy']));
    for (const f of result.frames) expect(Math.abs(f.history['mid.Fy'] + 2 * f.history['ends.Fy'])).toBeLessThan(1e-9 * Math.max(1, Math.abs(f.history['mid.Fy'])));
    // Convergence is fast enough that round-off is reached one step after the asymptotic range,
    // so the order cannot be fitted; check the quadratic bound r_{k+1} ≤ C r_k² instead (median
    // over all Newton steps below 2 % residual; a step in which fibres switch branch, elastic ↔
    // transforming, may exceed it, but only a few may).
    const ratios: number[] = [];
    for (const r of sequences) {
      for (let k = 1; k + 1 < r.length; k++) {
        if (r[k] < 0.02 && r[k + 1] > 1e-11) ratios.push(r[k + 1] / (r[k] * r[k]));
      }
    }
    ratios.sort((a, b) => a - b);
    expect(ratios.length).toBeGreaterThan(5);
    expect(ratios.filter((c) => c > 10).length).toBeLessThanOrEqual(Math.ceil(0.1 * ratios.length));
    assertCheck({ suite: SUITE, name: 'fibre beam three-point bending: median r_{k+1}/r_k² over Newton steps (≤ 10: quadratic)', computed: ratios[Math.floor(ratios.length / 2)], target: 0, unit: '–', tolerance: 10, absolute: true, source: 'quadratic convergence of Newton with the consistent tangent (Simo & Hughes 1998, Computational Inelasticity)' });
    expect(Math.max(...sequences.map((r) => r.length))).toBeLessThanOrEqual(6);
  });
});
