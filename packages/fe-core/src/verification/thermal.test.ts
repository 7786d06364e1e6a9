/**
 * Fully constrained thermal strain (closed form): E = 200 GPa, ν = 0.3, α = 12e-6/°C, ΔT = 100 °C.
 * A bar held at both ends: σ = −EαΔT = −240 MPa. A plate held on every edge in plane stress
 * (equal biaxial): σ = −EαΔT/(1 − ν) = −342.86 MPa.
 */
import { describe, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { line, rectangle } from '../mesh/structured';
import { check, solveModel } from './support';

const E = 200000, nu = 0.3, alpha = 12e-6, dT = 100;
const steel = { model: 'linear-elastic' as const, E, nu, alpha, T_ref: 20 };
const SOURCE = 'thermal stress of a fully constrained body, closed form σ = −EαΔT (bar), −EαΔT/(1−ν) (biaxial)';

describe('fully constrained thermal strain', () => {
  it('bar held at both ends (bar2)', () => {
    const mesh = line({ from: [0, 0], to: [100, 0], n: 4 }, { type: 'bar2', section: 'rod', material: 'steel' });
    const model: ModelInput = {
      format: 'phaseloop-model/1',
      ...mesh,
      nodeSets: { ...mesh.nodeSets, ends: [1, 5] },
      sections: { rod: { kind: 'bar', area: 10 } },
      materials: { steel },
      supports: [{ type: 'fixed', set: 'ends' }, { type: 'fixed', set: 'all', dofs: ['uy'] }],
      initialTemperature: 20,
      segments: [{ name: 'heat', temperature: 20 + dT, increments: { initial: 0.5, min: 0.1, max: 1 } }],
    };
    const { last } = solveModel(model);
    check({ suite: 'Elements: closed-form solutions', name: 'thermal, bar held at both ends: σ', computed: last.pointStress[0], target: -E * alpha * dT, unit: 'MPa', tolerance: 1e-9, source: SOURCE, tag: 'closed' });
  });

  it('plate held on every node, plane stress (Q4)', () => {
    const mesh = rectangle({ width: 10, height: 10, nx: 2, ny: 2 }, { type: 'q4', section: 'sheet', material: 'steel' });
    const model: ModelInput = {
      format: 'phaseloop-model/1',
      ...mesh,
      sections: { sheet: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
      materials: { steel },
      supports: [{ type: 'fixed', set: 'all' }],
      initialTemperature: 20,
      segments: [{ name: 'heat', temperature: 20 + dT, increments: { initial: 1, min: 0.1, max: 1 } }],
    };
    const { last } = solveModel(model);
    check({ suite: 'Elements: closed-form solutions', name: 'thermal, plate held, plane stress: σ_xx (equal biaxial)', computed: last.pointStress[0], target: (-E * alpha * dT) / (1 - nu), unit: 'MPa', tolerance: 1e-9, source: SOURCE, tag: 'closed' });
    check({ suite: 'Elements: closed-form solutions', name: 'thermal, plate held, plane stress: σ_yy (equal biaxial)', computed: last.pointStress[1], target: (-E * alpha * dT) / (1 - nu), unit: 'MPa', tolerance: 1e-9, source: SOURCE, tag: 'closed' });
  });
});
