import { describe, expect, it } from 'vitest';
import { recordCheck } from '@phaseloop/tests/support/verification';
import { createJ2Plastic, J2_STATE_SIZE } from './j2';
import { ReducedMaterial, type StressState } from './reduce';
import { driveReduced, tangentErrorReduced, tangentErrorSolid } from './reduceTesting';
import { createMaterialPointOutput } from './types';

const base = { model: 'j2-plastic' as const, E: 200_000, nu: 0.3, alpha: 0, T_ref: 20, sigma_y: 250, H_iso: 0, H_kin: 0 };
const mixed = { ...base, H_iso: 8000, H_kin: 4000 };

/** Loads a 3D point along `strain` from the virgin state in one step and returns its new state. */
function plasticState(params: typeof base, strain: number[]): Float64Array {
  const m = createJ2Plastic(params);
  const old = new Float64Array(J2_STATE_SIZE);
  const state = new Float64Array(J2_STATE_SIZE);
  m.update({ strain: Float64Array.from(strain), strainOld: new Float64Array(6), temperature: 20, temperatureOld: 20 }, old, 0, state, 0, createMaterialPointOutput());
  return state;
}

describe('J2 plasticity: consistent tangent', () => {
  const strains = [
    [2e-4, -1e-4, 0, 0, 0, 1e-4], // elastic
    [4e-3, -1e-3, -1e-3, 5e-4, 0, 1e-3], // plastic from virgin
  ];
  for (const params of [base, mixed, { ...base, H_kin: 5000 }]) {
    it(`matches finite differences, H_iso = ${params.H_iso}, H_kin = ${params.H_kin}`, () => {
      const m = createJ2Plastic(params);
      for (const s of strains) {
        const err = tangentErrorSolid(m, { strain: Float64Array.from(s), strainOld: new Float64Array(6), temperature: 20, temperatureOld: 20 }, new Float64Array(J2_STATE_SIZE), 1e-9);
        expect(err).toBeLessThan(1e-5);
      }
      // Continued plastic loading from a prestrained, back-stressed state, and a reversal.
      const old = plasticState(params, [3e-3, -1.5e-3, -1.5e-3, 0, 0, 0]);
      for (const s of [[5e-3, -2e-3, -2e-3, 0, 1e-3, 0], [-4e-3, 2e-3, 2e-3, 0, 0, 0]]) {
        const err = tangentErrorSolid(m, { strain: Float64Array.from(s), strainOld: new Float64Array(6), temperature: 20, temperatureOld: 20 }, old, 1e-9);
        expect(err).toBeLessThan(1e-5);
      }
    });
  }

  const reductions: StressState[] = ['uniaxial', 'planeStress', 'planeStrain', 'axisymmetric'];
  for (const ss of reductions) {
    it(`condensed ${ss} tangent matches finite differences in the plastic range`, () => {
      const r = new ReducedMaterial(createJ2Plastic(mixed), ss);
      const full = [3e-3, -1e-3, 5e-4, 1.5e-3];
      const strain = ss === 'uniaxial' ? [3e-3] : ss === 'axisymmetric' ? full : [3e-3, -1e-3, 1.5e-3];
      const half = strain.map((v) => v / 2);
      const { stateOld, strainOld } = driveReduced(r, [half]);
      const err = tangentErrorReduced(r, { strain: Float64Array.from(strain), strainOld, temperature: 20, temperatureOld: 20 }, stateOld, 1e-9);
      expect(err).toBeLessThan(1e-5);
    });
  }
});

describe('J2 plasticity: uniaxial closed forms', () => {
  it('linear hardening: σ = σ_y + E_t(ε − ε_y), E_t = EH/(E + H), H = H_iso + H_kin', () => {
    const r = new ReducedMaterial(createJ2Plastic(mixed), 'uniaxial');
    const path = Array.from({ length: 10 }, (_, k) => [((k + 1) / 10) * 0.01]);
    const { stresses } = driveReduced(r, path);
    const H = mixed.H_iso + mixed.H_kin;
    const Et = (mixed.E * H) / (mixed.E + H);
    const target = mixed.sigma_y + Et * (0.01 - mixed.sigma_y / mixed.E);
    const check = recordCheck({
      suite: 'Materials', name: 'J2 uniaxial linear hardening, σ at ε = 1 %', computed: stresses[9][0], target, unit: 'MPa',
      tolerance: 1e-9, source: 'closed form: bilinear uniaxial response σ_y + E_t(ε − σ_y/E)', tag: 'closed',
    });
    expect(check.pass).toBe(true);
  });

  it('perfectly plastic plane stress under equal-biaxial strain settles at σ11 = σ22 = σ_y', () => {
    // Equal-biaxial stress has von Mises σ̄ = σ, so the σ33 = 0 iteration must land on σ_y.
    const r = new ReducedMaterial(createJ2Plastic(base), 'planeStress');
    const { stresses } = driveReduced(r, [[2e-3, 2e-3, 0], [4e-3, 4e-3, 0]]);
    // Closed form: equal-biaxial von Mises σ̄ = σ, so a perfectly plastic point sits at σ_y.
    expect(stresses[1][0]).toBeCloseTo(base.sigma_y, 8);
    expect(stresses[1][1]).toBeCloseTo(base.sigma_y, 8);
  });

  it('kinematic hardening: reverse yield after unloading from σ_max occurs at σ_max − 2σ_y (Bauschinger)', () => {
    const p = { ...base, H_kin: 10_000 };
    const r = new ReducedMaterial(createJ2Plastic(p), 'uniaxial');
    const up = Array.from({ length: 5 }, (_, k) => [(k + 1) * 1e-3]);
    const { stresses: loaded, stateOld, strainOld } = driveReduced(r, up);
    expect(loaded[4][0]).toBeGreaterThan(p.sigma_y);
    const sMax = loaded[4][0];
    // Elastic unloading spans 2σ_y: one elastic step to just above the reverse-yield point,
    // then a plastic step; the closed-form reversal point is σ_max − 2σ_y with slope E_t after it.
    const Et = (p.E * p.H_kin) / (p.E + p.H_kin);
    const eEnd = strainOld[0] - (2 * p.sigma_y) / p.E - 1e-3; // 1e-3 past the reverse-yield strain
    const fresh = new ReducedMaterial(createJ2Plastic(p), 'uniaxial');
    const state = new Float64Array(fresh.stateSize);
    const o = { stress: new Float64Array(1), tangent: new Float64Array(1), fullStrain: new Float64Array(6), fullStress: new Float64Array(6), ok: true, message: '' };
    fresh.update({ strain: Float64Array.from([eEnd]), strainOld, temperature: 20, temperatureOld: 20 }, stateOld, 0, state, 0, o);
    const target = sMax - 2 * p.sigma_y - Et * 1e-3;
    const check = recordCheck({
      suite: 'Materials', name: 'J2 kinematic hardening, stress 1e-3 past reverse yield', computed: o.stress[0], target, unit: 'MPa',
      tolerance: 1e-9, source: 'closed form: Prager kinematic hardening, reverse yield at σ_max − 2σ_y', tag: 'closed',
    });
    expect(check.pass).toBe(true);
  });

  it('heated, fully constrained perfectly plastic bar stops at −σ_y', () => {
    const p = { ...base, alpha: 12e-6 };
    const r = new ReducedMaterial(createJ2Plastic(p), 'uniaxial');
    const temps = [70, 120, 220];
    const { stresses } = driveReduced(r, [[0], [0], [0]], temps);
    // −EαΔT: −120 and −240 MPa (elastic), then −480 is capped at the yield stress.
    expect(stresses[0][0]).toBeCloseTo(-120, 8);
    expect(stresses[1][0]).toBeCloseTo(-240, 8);
    expect(stresses[2][0]).toBeCloseTo(-250, 8);
  });
});
