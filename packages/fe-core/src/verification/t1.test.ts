/**
 * NAFEMS T1, membrane with a hot spot (The Standard NAFEMS Benchmarks, TNSB Rev. 3, 1990).
 * Plane stress quarter model of a square plate (here 10 × 10 mm); inside a radius a = 1 mm
 * around the origin the free thermal strain is 1e-3, outside 0; E = 100 GPa, ν = 0.3; symmetry on
 * both axes. Target: σ_yy just outside the spot on the x axis = 50 MPa. Closed form for a disc of
 * radius b with an inclusion (plane stress): σ_θθ(a⁺) = (EαΔT/2)(1 + a²/b²), which is 50 MPa as
 * b → ∞ (50.5 for b = 10, 50.25 for b = 14.1, the corner distance).
 *
 * The spot is its own region (material "hot" with α = 1e-3/°C, heated by 1 °C); the stress just
 * outside is recovered from the elements outside the spot only, since σ_yy jumps at r = a.
 */
import { describe, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { mergeParts, quarterDisc, quarterPlateWithHole } from '../mesh/structured';
import { recoverNodal } from '../output/recovery';
import { check, nodeAt, solveModel } from './support';

describe('NAFEMS T1 hot spot', () => {
  it('σ_yy just outside the spot on the x axis (Q8)', () => {
    const n = 12;
    const spot = quarterDisc({ radius: 1, n }, { type: 'q8', section: 'sheet', material: 'hot' });
    const plate = quarterPlateWithHole({ radius: 1, halfWidth: 10, halfHeight: 10, nAround: n, nRadial: 16, ratio: 12 }, { type: 'q8', section: 'sheet', material: 'cold' });
    const mesh = mergeParts([spot, plate]);
    const model: ModelInput = {
      format: 'phaseloop-model/1',
      ...mesh,
      sections: { sheet: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
      materials: {
        hot: { model: 'linear-elastic', E: 100000, nu: 0.3, alpha: 1e-3, T_ref: 0 },
        cold: { model: 'linear-elastic', E: 100000, nu: 0.3, alpha: 0, T_ref: 0 },
      },
      supports: [
        { type: 'symmetry', set: 'left', normal: 'x' },
        { type: 'symmetry', set: 'bottom', normal: 'y' },
      ],
      initialTemperature: 0,
      segments: [{ name: 'heat spot', temperature: 1, increments: { initial: 1, min: 0.1, max: 1 } }],
    };
    const { problem, last } = solveModel(model);
    const outside = problem.elements.filter((e) => e.materialName === 'cold').map((e) => e.index);
    const stress = recoverNodal(problem, last.pointStress, 6, outside);
    const syy = stress[6 * nodeAt(problem, 1, 0) + 1];
    check({
      suite: 'Elements: NAFEMS benchmarks',
      name: 'T1 hot spot, Q8: σ_yy just outside the spot at (1, 0)',
      computed: syy,
      target: 50,
      unit: 'MPa',
      tolerance: 0.02,
      source: 'NAFEMS TNSB Rev. 3 (1990), T1; closed-form disc (EαΔT/2)(1 + a²/b²)',
      tag: 'pub',
    });
  });
});
