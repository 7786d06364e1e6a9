/**
 * Writes the example model documents of this folder from the structured meshers:
 *   npx tsx examples/generate.ts
 * The JSON files are committed; the fe-core test `cli/examples.test.ts` solves every one.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ModelInput } from '@phaseloop/shared';
import { line, quarterPlateWithHole, rectangle } from '@phaseloop/fe-core/mesh/structured';

const here = dirname(fileURLToPath(import.meta.url));

/** JSON with short arrays and objects (a node, an element) kept on one line. */
function compact(value: unknown, indent = ''): string {
  const flat = JSON.stringify(value);
  if (flat.length <= 96 || value === null || typeof value !== 'object') return flat;
  const inner = indent + '  ';
  if (Array.isArray(value)) return `[\n${value.map((v) => inner + compact(v, inner)).join(',\n')}\n${indent}]`;
  const entries = Object.entries(value as Record<string, unknown>).map(([k, v]) => `${inner}${JSON.stringify(k)}: ${compact(v, inner)}`);
  return `{\n${entries.join(',\n')}\n${indent}}`;
}

function write(name: string, model: ModelInput): void {
  // Twelve significant digits keep the files short and the geometry exact enough.
  if (Array.isArray(model.nodes)) for (const n of model.nodes) { n.x = +n.x.toPrecision(12); n.y = +n.y.toPrecision(12); }
  writeFileSync(join(here, name), compact(model) + '\n');
}

// Cantilever beam, tip load: δ = PL³/3EI = 2.000 mm (Euler–Bernoulli), L = 100, b = h = 10 mm.
const beam = line({ from: [0, 0], to: [100, 0], n: 10 }, { type: 'beam2', section: 'rect10', material: 'steel' });
write('cantilever-beam.json', {
  format: 'phaseloop-model/1',
  title: 'Cantilever beam with a tip load (10 Euler–Bernoulli elements)',
  ...beam,
  sections: { rect10: { kind: 'beam', theory: 'euler-bernoulli', crossSection: { shape: 'rectangle', width: 10, height: 10 }, fibres: 16 } },
  materials: { steel: { model: 'linear-elastic', E: 200000, nu: 0.3 } },
  supports: [{ type: 'fixed', set: 'start' }],
  loads: [{ type: 'force', name: 'tipLoad', set: 'end', dof: 'fy' }],
  segments: [{ name: 'load', duration: 1, targets: { tipLoad: -1000 }, increments: { initial: 0.5, min: 0.01, max: 1 } }],
  output: { fields: ['displacement', 'reaction'], points: [{ name: 'tip', x: 100, y: 0 }], reactionSums: [{ name: 'wall', set: 'start' }] },
});

// Quarter of a plate with a hole, J2 plasticity, loaded past first yield at the hole and unloaded.
const plate = quarterPlateWithHole({ radius: 5, halfWidth: 50, halfHeight: 50, nAround: 6, nRadial: 8, ratio: 8 }, { type: 'q8', section: 'sheet', material: 'steel' });
write('plate-with-hole.json', {
  format: 'phaseloop-model/1',
  title: 'Quarter plate with a hole in tension, elastic–plastic (J2), load and unload',
  ...plate,
  sections: { sheet: { kind: 'continuum', analysis: 'planeStress', thickness: 2 } },
  materials: { steel: { model: 'j2-plastic', E: 200000, nu: 0.3, sigma_y: 250, H_iso: 2000, H_kin: 0 } },
  supports: [
    { type: 'symmetry', set: 'left', normal: 'x' },
    { type: 'symmetry', set: 'bottom', normal: 'y' },
  ],
  loads: [{ type: 'traction', name: 'pull', edgeSet: 'top', direction: [0, 1] }],
  segments: [
    { name: 'load', duration: 1, targets: { pull: 120 }, increments: { initial: 0.2, min: 0.001, max: 0.25 } },
    { name: 'unload', duration: 1, targets: { pull: 0 }, increments: { initial: 0.25, min: 0.001, max: 0.5 } },
  ],
  output: {
    fields: ['displacement', 'reaction', 'stress', 'vonMises', 'principalStress', 'eqPlasticStrain'],
    points: [{ name: 'holeEdge', x: 5, y: 0 }, { name: 'corner', x: 50, y: 50 }],
    reactionSums: [{ name: 'bottomEdge', set: 'bottom' }],
  },
});

// Bar held at both ends and heated by 100 °C: σ = −EαΔT = −240 MPa.
const bar = line({ from: [0, 0], to: [200, 0], n: 4 }, { type: 'bar2', section: 'rod', material: 'steel' });
write('bar-thermal.json', {
  format: 'phaseloop-model/1',
  title: 'Bar held at both ends, heated from 20 °C to 120 °C',
  ...bar,
  nodeSets: { ...bar.nodeSets, ends: [1, 5] },
  sections: { rod: { kind: 'bar', area: 12.5 } },
  materials: { steel: { model: 'linear-elastic', E: 200000, nu: 0.3, alpha: 12e-6, T_ref: 20 } },
  supports: [
    { type: 'fixed', set: 'ends' },
    { type: 'fixed', set: 'all', dofs: ['uy'] },
  ],
  initialTemperature: 20,
  segments: [{ name: 'heat', duration: 10, temperature: 120, increments: { initial: 0.25, min: 0.01, max: 0.5 } }],
  output: { fields: ['displacement', 'reaction', 'temperature', 'stress'], reactionSums: [{ name: 'leftEnd', set: 'start' }, { name: 'rightEnd', set: 'end' }] },
});

// Plane-stress cantilever strip of Q8 elements (used when no beam elements are wanted).
const strip = rectangle({ width: 100, height: 10, nx: 20, ny: 2 }, { type: 'q8', section: 'strip', material: 'steel' });
write('cantilever-plane-stress.json', {
  format: 'phaseloop-model/1',
  title: 'Cantilever strip in plane stress (Q8), shear traction at the free end',
  ...strip,
  sections: { strip: { kind: 'continuum', analysis: 'planeStress', thickness: 10 } },
  materials: { steel: { model: 'linear-elastic', E: 200000, nu: 0.3 } },
  supports: [{ type: 'fixed', set: 'left' }],
  loads: [{ type: 'traction', name: 'shear', edgeSet: 'right', direction: [0, -1] }],
  segments: [{ name: 'load', targets: { shear: 10 }, increments: { initial: 1, min: 0.01, max: 1 } }],
  output: { fields: ['displacement', 'reaction', 'stress', 'vonMises'], points: [{ name: 'tip', x: 100, y: 5 }], reactionSums: [{ name: 'wall', set: 'left' }] },
});

// Superelastic NiTi strip at body temperature (demo values, not a real alloy's data): pulled to
// 6 % strain by a prescribed end displacement and released (Lagoudas 2012, plane stress, Q4-EAS).
const coupon = rectangle({ width: 20, height: 2, nx: 10, ny: 2 }, { type: 'q4-eas', section: 'sheet', material: 'demoNiTi' });
write('superelastic-strip.json', {
  format: 'phaseloop-model/1',
  title: 'Superelastic NiTi strip at 37 °C, pulled to 6 % and released (demo material values)',
  ...coupon,
  nodeSets: { ...coupon.nodeSets, origin: [1] },
  sections: { sheet: { kind: 'continuum', analysis: 'planeStress', thickness: 0.5 } },
  materials: {
    demoNiTi: {
      model: 'lagoudas2012', E_A: 60000, E_M: 40000, nu: 0.33, Ms0: 18, Mf0: 2, As0: 22, Af0: 38, C_M: 6.5, C_A: 8,
      sigma_star: 200, H_min: 0.04, H_sat: 0.045, k_t: 0.01, n1: 0.5, n2: 0.5, n3: 0.5, n4: 0.5,
    },
  },
  supports: [
    { type: 'fixed', set: 'left', dofs: ['ux'] },
    { type: 'fixed', set: 'origin', dofs: ['uy'] },
  ],
  loads: [{ type: 'displacement', name: 'stretch', set: 'right', dof: 'ux' }],
  initialTemperature: 37,
  segments: [
    { name: 'load', duration: 1, targets: { stretch: 1.2 }, increments: { initial: 0.02, min: 1e-4, max: 0.04 } },
    { name: 'unload', duration: 1, targets: { stretch: 0 }, increments: { initial: 0.02, min: 1e-4, max: 0.04 } },
  ],
  output: {
    fields: ['displacement', 'reaction', 'stress', 'strain', 'vonMises', 'martensiteFraction', 'transformationStrain'],
    points: [{ name: 'middle', x: 10, y: 1 }],
    reactionSums: [{ name: 'grip', set: 'left' }],
  },
});
