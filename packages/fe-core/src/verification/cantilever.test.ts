/**
 * Cantilever with a tip load through the whole pipeline (model document → solve → frames):
 * Euler–Bernoulli δ = PL³/3EI, θ = PL²/2EI; Timoshenko adds the shear deflection PL/κGA with
 * κ = 5/6 for a rectangle. L = 100, b = h = 10 mm, E = 200 GPa, ν = 0.3, P = 1000 N:
 * δ = 2.0000 mm (EB), 2.0156 mm (Timoshenko).
 */
import { describe, it } from 'vitest';
import type { ModelInput } from '@phaseloop/shared';
import { line } from '../mesh/structured';
import { check, solveModel } from './support';

const L = 100, b = 10, h = 10, E = 200000, nu = 0.3, P = 1000;
const I = (b * h ** 3) / 12;
const G = E / (2 * (1 + nu));
const SOURCE = 'cantilever closed form δ = PL³/3EI (+ PL/κGA, κ = 5/6)';

function cantilever(theory: 'euler-bernoulli' | 'timoshenko', n: number) {
  const mesh = line({ from: [0, 0], to: [L, 0], n }, { type: 'beam2', section: 'rect', material: 'steel' });
  const model: ModelInput = {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { rect: { kind: 'beam', theory, crossSection: { shape: 'rectangle', width: b, height: h }, fibres: 16 } },
    materials: { steel: { model: 'linear-elastic', E, nu } },
    supports: [{ type: 'fixed', set: 'start' }],
    loads: [{ type: 'force', name: 'tip', set: 'end', dof: 'fy' }],
    segments: [{ name: 'load', targets: { tip: -P }, increments: { initial: 1, min: 0.1, max: 1 } }],
    output: { fields: ['displacement', 'reaction'], points: [{ name: 'tip', x: L, y: 0 }], reactionSums: [{ name: 'wall', set: 'start' }] },
  };
  return solveModel(model).last;
}

describe('cantilever beam, tip load', () => {
  it('Euler–Bernoulli fibre beam, 4 elements', () => {
    const last = cantilever('euler-bernoulli', 4);
    check({ suite: 'Elements: beams', name: 'cantilever EB, 4 elements: tip deflection', computed: -last.history['tip.uy'], target: (P * L ** 3) / (3 * E * I), unit: 'mm', tolerance: 0.002, source: SOURCE, tag: 'closed' });
    check({ suite: 'Elements: beams', name: 'cantilever EB, 4 elements: tip rotation', computed: -last.history['tip.rz'], target: (P * L ** 2) / (2 * E * I), unit: 'rad', tolerance: 0.002, source: SOURCE, tag: 'closed' });
    check({ suite: 'Elements: beams', name: 'cantilever EB: wall moment reaction', computed: last.history['wall.Mz'], target: P * L, unit: 'N·mm', tolerance: 1e-6, source: 'static equilibrium M = PL', tag: 'closed' });
  });

  it('Timoshenko fibre beam, 20 elements', () => {
    const last = cantilever('timoshenko', 20);
    const target = (P * L ** 3) / (3 * E * I) + (P * L) / ((5 / 6) * G * b * h);
    check({ suite: 'Elements: beams', name: 'cantilever Timoshenko, 20 elements: tip deflection', computed: -last.history['tip.uy'], target, unit: 'mm', tolerance: 0.003, source: SOURCE, tag: 'closed' });
  });
});
