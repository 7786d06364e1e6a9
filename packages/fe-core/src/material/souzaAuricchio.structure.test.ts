/**
 * The transformation-strain SMA model inside structures solved by the nonlinear driver:
 *  - shape-memory sequence in a plane-stress strip (Q4, uniform uniaxial stress): traction
 *    loading below T0, unloading, free recovery on heating — equal to the material-point response
 *    increment by increment;
 *  - pseudoelastic loop of a quarter plate with a hole (Q8) with quadratic Newton convergence.
 */
import { describe, expect, it } from 'vitest';
import { rectangle } from '../mesh/structured';
import { runMaterialPoint } from './materialPoint';
import { assertCheck } from './materialPointTesting';
import { plateWithHoleLoop, solveRecording } from './structureTesting';
import { createSouzaAuricchio } from './souzaAuricchio';

const SUITE = 'SMA: Souza–Auricchio';
const NITI = { model: 'souza-auricchio' as const, E: 52000, nu: 0.33, alpha: 0, T_ref: 20, h: 1000, beta: 6.2, T0: -10, R: 60, eps_L: 0.05 };


describe('Souza–Auricchio in structures', () => {
  it('q4 strip: load below T0, unload, free recovery on heating = material point', () => {
    const L = 20;
    const H = 4;
    const mesh = rectangle({ width: L, height: H, nx: 4, ny: 2 }, { type: 'q4', section: 's', material: 'niti' });
    const { result, cutBacks } = solveRecording({
      format: 'phaseloop-model/1',
      ...mesh,
      nodeSets: { ...mesh.nodeSets, origin: [1] },
      sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
      materials: { niti: NITI },
      initialTemperature: -30,
      supports: [
        { type: 'fixed', set: 'left', dofs: ['ux'] },
        { type: 'fixed', set: 'origin', dofs: ['uy'] },
      ],
      loads: [{ type: 'traction', name: 'pull', edgeSet: 'right', direction: [1, 0] }],
      segments: [
        { name: 'load', targets: { pull: 200 }, increments: { initial: 0.02, min: 0.001, max: 0.02 } },
        { name: 'unload', targets: { pull: 0 }, increments: { initial: 0.05, min: 0.001, max: 0.05 } },
        { name: 'heat', temperature: 20, increments: { initial: 0.01, min: 0.001, max: 0.01 } },
      ],
      output: { fields: ['displacement', 'reaction', 'transformationStrain'], points: [{ name: 'tip', x: L, y: 0 }], reactionSums: [{ name: 'left', set: 'left' }] },
      solver: { forceTolerance: 1e-10, displacementTolerance: 1e-10, lineSearch: false },
    });
    expect(result.status, result.failure?.message).toBe('succeeded');
    expect(cutBacks).toBe(0);
    const mp = runMaterialPoint(createSouzaAuricchio(NITI), {
      control: 'stress',
      path: result.frames.map((f) => ({ value: -f.history['left.Fx'] / H, temperature: f.temperature[0], increments: 1 })),
    });
    expect(mp.ok, mp.message).toBe(true);
    let worst = 0;
    result.frames.forEach((f, k) => (worst = Math.max(worst, Math.abs(f.history['tip.ux'] / L - mp.rows[k].strain))));
    assertCheck({ suite: SUITE, name: 'q4 strip shape-memory sequence: max |ε_structure − ε_material point|', computed: worst, target: 0, unit: '-', tolerance: 1e-9, absolute: true, source: 'closed form: uniform uniaxial stress in a strip on rollers equals the material-point response' });
    // residual strain after unloading, recovered after heating above T0 + R/β
    const unloaded = result.frames.filter((f) => f.segment === 1).at(-1)!;
    assertCheck({ suite: SUITE, name: 'q4 strip: residual strain after unloading √(2/3)ε_L', computed: unloaded.history['tip.ux'] / L, target: Math.sqrt(2 / 3) * NITI.eps_L, unit: '-', tolerance: 1e-9, source: 'closed form, Souza 1998 / Auricchio–Petrini 2004 uniaxial reduction' });
    expect(Math.abs(result.frames.at(-1)!.history['tip.ux'])).toBeLessThan(1e-10);
  });

  it('q8 quarter plate with a hole: pseudoelastic loop with quadratic Newton convergence', () => {
    const { result, sequences } = solveRecording(plateWithHoleLoop('q8', NITI));
    expect(result.status, result.failure?.message).toBe('succeeded');
    const peak = result.frames.reduce((a, f) => Math.max(a, ...Array.from(f.pointXi)), 0);
    expect(peak).toBeGreaterThan(0.5);
    expect(Math.abs(result.frames.at(-1)!.history['base.Fy'])).toBeLessThan(1e-6);
    const orders: number[] = [];
    for (const r of sequences) {
      for (let k = 1; k + 1 < r.length; k++) {
        if (r[k - 1] < 1e-2 && r[k + 1] > 1e-12) orders.push(Math.log(r[k + 1] / r[k]) / Math.log(r[k] / r[k - 1]));
      }
    }
    orders.sort((a, b) => a - b);
    expect(orders.length).toBeGreaterThan(5);
    assertCheck({ suite: SUITE, name: 'q8 plate with a hole, pseudoelastic loop: Newton order (median)', computed: orders[Math.floor(orders.length / 2)], target: 2, unit: '–', tolerance: 0.5, absolute: true, source: 'quadratic convergence of Newton with the consistent tangent (Simo & Hughes 1998, Computational Inelasticity)' });
  });
});
