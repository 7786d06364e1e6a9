/**
 * Thermal cycling under constant load through the whole pipeline (model document → force-
 * controlled segments with temperature ramps → Lagoudas 2012 material → frames): a NiTi wire
 * (bar elements) carries σ = 100 MPa while it is cooled from 80 °C to −20 °C and heated back.
 *
 * Closed forms (sma-models.md §1, constant H, E_A = E_M, Δα = 0, n₁…n₄ = 1): under constant
 * stress, cooling transforms between Ms0 + σ/C_M and Mf0 + σ/C_M, heating between As0 + σ/C_A
 * and Af0 + σ/C_A, ξ is linear in T in between, and the strain jump is H (Lagoudas et al. 2012).
 */
import { describe, expect, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { line } from '../mesh/structured';
import type { Frame } from '../output/frame';
import { check, solveModel } from './support';

const sigma = 100, A = 0.5, L = 50, H = 0.04;
const m = { Ms0: 18, Mf0: 2, As0: 22, Af0: 38, C_M: 7, C_A: 8 };
const SOURCE = 'Lagoudas et al. 2012 closed-form isobaric transformation temperatures (constant H)';
const SUITE = 'Nonlinear driver: SMA through the pipeline';

/** T where the straight line through the frames with 0.05 < ξ < 0.95 reaches ξ = target
 *  (on heating the reverse transformation starts at ξ = 1, As, and ends at ξ = 0, Af). */
function temperatureAt(frames: Frame[], target: number): number {
  const pts = frames.filter((f) => f.pointXi[0] > 0.05 && f.pointXi[0] < 0.95).map((f) => [f.temperature[0], f.pointXi[0]]);
  const n = pts.length;
  const mx = pts.reduce((s, p) => s + p[0], 0) / n;
  const my = pts.reduce((s, p) => s + p[1], 0) / n;
  let sxy = 0, sxx = 0;
  for (const [x, y] of pts) {
    sxy += (x - mx) * (y - my);
    sxx += (x - mx) ** 2;
  }
  const slope = sxy / sxx;
  return mx + (target - my) / slope;
}

describe('NiTi wire cooled and heated under constant load (Lagoudas 2012, bar elements)', () => {
  it('transforms at the stress-shifted temperatures with a strain jump of H', () => {
    const mesh = line({ from: [0, 0], to: [L, 0], n: 2 }, { type: 'bar2', section: 'wire', material: 'niti' });
    const model: ModelInput = {
      format: 'phaseloop-model/1',
      ...mesh,
      sections: { wire: { kind: 'bar', area: A } },
      materials: { niti: { model: 'lagoudas2012', E_A: 50000, E_M: 50000, nu: 0.33, ...m, sigma_star: 200, H_min: H, H_sat: H, k_t: 0 } },
      supports: [{ type: 'fixed', set: 'start' }, { type: 'fixed', set: 'all', dofs: ['uy'] }],
      loads: [{ type: 'force', name: 'weight', set: 'end', dof: 'fx' }],
      initialTemperature: 80,
      segments: [
        { name: 'hang weight', targets: { weight: sigma * A }, increments: { initial: 0.5, min: 0.01, max: 1 } },
        { name: 'cool', duration: 100, temperature: -20, increments: { initial: 0.01, min: 1e-5, max: 0.01 } },
        { name: 'heat', duration: 100, temperature: 80, increments: { initial: 0.01, min: 1e-5, max: 0.01 } },
      ],
      output: { fields: ['displacement', 'martensiteFraction'], points: [{ name: 'end', x: L, y: 0 }], reactionSums: [], integrationPoints: false },
    };
    const { result } = solveModel(model);
    const cool = result.frames.filter((f) => f.segmentName === 'cool');
    const heat = result.frames.filter((f) => f.segmentName === 'heat');
    const strain = (f: Frame) => f.history['end.ux'] / L;
    const cases: [string, number, number][] = [
      ['Ms(σ) on cooling', temperatureAt(cool, 0), m.Ms0 + sigma / m.C_M],
      ['Mf(σ) on cooling', temperatureAt(cool, 1), m.Mf0 + sigma / m.C_M],
      ['As(σ) on heating', temperatureAt(heat, 1), m.As0 + sigma / m.C_A],
      ['Af(σ) on heating', temperatureAt(heat, 0), m.Af0 + sigma / m.C_A],
    ];
    for (const [name, computed, target] of cases) {
      check({ suite: SUITE, name: `wire at ${sigma} MPa: ${name}`, computed, target, unit: '°C', tolerance: 0.05, absolute: true, source: SOURCE, tag: 'closed' });
    }
    check({
      suite: SUITE,
      name: `wire at ${sigma} MPa: strain jump over the cooling segment`,
      computed: strain(cool[cool.length - 1]) - strain(cool[0]),
      target: H,
      unit: '–',
      tolerance: 1e-6,
      absolute: true,
      source: SOURCE,
      tag: 'closed',
    });
    // Shape recovery: back to the austenite strain σ/E after heating.
    expect(strain(heat[heat.length - 1])).toBeCloseTo(sigma / 50000, 9);
  });
});
