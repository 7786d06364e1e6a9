import { describe, expect, it } from 'vitest';
import { recordCheck } from '@phaseloop/tests/support/verification';
import { createLinearElastic } from './elastic';
import { ReducedMaterial } from './reduce';
import { driveReduced, tangentErrorReduced, tangentErrorSolid } from './reduceTesting';

const steel = { model: 'linear-elastic' as const, E: 200_000, nu: 0.3, alpha: 12e-6, T_ref: 20 };

describe('linear elastic material', () => {
  it('3D tangent matches finite differences', () => {
    const m = createLinearElastic(steel);
    const strain = Float64Array.from([1e-3, -2e-4, 3e-4, 1e-4, -5e-5, 2e-4]);
    const err = tangentErrorSolid(m, { strain, strainOld: new Float64Array(6), temperature: 80, temperatureOld: 20 }, new Float64Array(1));
    expect(err).toBeLessThan(1e-7);
  });

  it('plane-stress condensed tangent equals E/(1−ν²)[[1,ν,0],[ν,1,0],[0,0,1−ν]] (Kelvin–Mandel shear)', () => {
    // Closed form: plane-stress Hooke matrix; Kelvin–Mandel shear entry 2G = E(1−ν)/(1−ν²).
    const r = new ReducedMaterial(createLinearElastic(steel), 'planeStress');
    const { stresses } = driveReduced(r, [[1e-3, 0, 0]]);
    const c = steel.E / (1 - steel.nu ** 2);
    expect(stresses[0][0]).toBeCloseTo(c * 1e-3, 8);
    expect(stresses[0][1]).toBeCloseTo(c * steel.nu * 1e-3, 8);
    const err = tangentErrorReduced(r, { strain: Float64Array.from([1e-3, 2e-4, 1e-4]), strainOld: new Float64Array(3), temperature: 20, temperatureOld: 20 }, new Float64Array(1));
    expect(err).toBeLessThan(1e-7);
  });

  it('fully constrained bar heated by 100 K: σ = −EαΔT = −240 MPa', () => {
    const r = new ReducedMaterial(createLinearElastic(steel), 'uniaxial');
    const { stresses } = driveReduced(r, [[0]], [120]);
    const target = -steel.E * steel.alpha * 100;
    const check = recordCheck({
      suite: 'Materials', name: 'thermal, fully constrained bar (uniaxial reduction)', computed: stresses[0][0], target,
      unit: 'MPa', tolerance: 1e-9, source: 'closed form: σ = −EαΔT', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    expect(target).toBeCloseTo(-240, 10);
  });

  it('equal-biaxial constrained plate heated by 100 K: σ = −EαΔT/(1−ν) = −342.9 MPa', () => {
    const r = new ReducedMaterial(createLinearElastic(steel), 'planeStress');
    const { stresses } = driveReduced(r, [[0, 0, 0]], [120]);
    const target = (-steel.E * steel.alpha * 100) / (1 - steel.nu);
    const check = recordCheck({
      suite: 'Materials', name: 'thermal, constrained equal-biaxial plane stress', computed: stresses[0][0], target,
      unit: 'MPa', tolerance: 1e-9, source: 'closed form: σ = −EαΔT/(1−ν)', tag: 'closed',
    });
    expect(check.pass).toBe(true);
    expect(stresses[0][1]).toBeCloseTo(stresses[0][0], 8);
  });

  it('uniaxial reduction gives σ = Eε and a tangent matching finite differences', () => {
    const r = new ReducedMaterial(createLinearElastic(steel), 'uniaxial');
    const strain = Float64Array.from([1e-3]);
    const { stresses } = driveReduced(r, [[1e-3]]);
    expect(stresses[0][0]).toBeCloseTo(200, 8);
    const err = tangentErrorReduced(r, { strain, strainOld: new Float64Array(1), temperature: 20, temperatureOld: 20 }, new Float64Array(3));
    expect(err).toBeLessThan(1e-7);
  });
});
