import { describe, expect, it } from 'vitest';
import { recordCheck } from '@phaseloop/tests/support/verification';
import { createLinearElastic } from '../material/elastic';
import { createJ2Plastic } from '../material/j2';
import type { Material } from '../material/types';
import { fibreLayout } from './beamSection';
import { elementKernels } from './index';
import { TestModel } from './testing';
import type { BeamSection, ElementName } from './types';

const steel = createLinearElastic({ model: 'linear-elastic', E: 200_000, nu: 0.3, alpha: 0, T_ref: 20 }) as Material<unknown>;

describe('fibre sections', () => {
  const cases: [string, BeamSection, number, number][] = [
    ['rectangle 10×20', { kind: 'beam', shape: { type: 'rectangle', b: 10, h: 20 } }, 200, (10 * 20 ** 3) / 12],
    ['circle d = 12', { kind: 'beam', shape: { type: 'circle', d: 12 }, fibres: 9 }, (Math.PI * 144) / 4, (Math.PI * 12 ** 4) / 64],
    ['tube 20/14', { kind: 'beam', shape: { type: 'tube', do: 20, di: 14 }, fibres: 24 }, (Math.PI * (400 - 196)) / 4, (Math.PI * (20 ** 4 - 14 ** 4)) / 64],
  ];
  for (const [label, section, A, I] of cases) {
    it(`${label}: fibres reproduce A, zero first moment and I exactly (closed-form section properties)`, () => {
      const f = fibreLayout(section);
      expect(f.count % 2).toBe(0);
      let a = 0, s = 0, i2 = 0;
      for (let k = 0; k < f.count; k++) {
        a += f.area[k];
        s += f.area[k] * f.y[k];
        i2 += f.area[k] * f.y[k] ** 2;
      }
      expect(a / A).toBeCloseTo(1, 12);
      expect(Math.abs(s) / (A * f.depth)).toBeLessThan(1e-14);
      expect(i2 / I).toBeCloseTo(1, 12);
    });
  }
});

/** Cantilever along a direction at angle `angle`, clamped at node 0, transverse tip load P. */
function cantilever(name: ElementName, elements: number, L: number, section: BeamSection, P: number, angle = 0) {
  const c = Math.cos(angle), s = Math.sin(angle);
  const coords: number[] = [];
  for (let i = 0; i <= elements; i++) coords.push(((L * i) / elements) * c, ((L * i) / elements) * s);
  const conn = Array.from({ length: elements }, (_, e) => [e, e + 1]);
  const model = new TestModel({ kernel: elementKernels[name], section, material: steel, coords, elements: conn });
  const loads = new Float64Array(model.ndof);
  const tip = 3 * elements;
  loads[tip] = -s * P;
  loads[tip + 1] = c * P;
  const result = model.solve({ fixed: new Map([[0, 0], [1, 0], [2, 0]]), loads });
  expect(result.converged).toBe(true);
  // Transverse tip deflection and rotation.
  return { deflection: -s * model.u[tip] + c * model.u[tip + 1], rotation: model.u[tip + 2] };
}

describe('cantilever with a tip load (L = 100, b = h = 10, E = 200 GPa, ν = 0.3, P = 1000 N)', () => {
  const section: BeamSection = { kind: 'beam', shape: { type: 'rectangle', b: 10, h: 10 } };
  const E = 200_000, I = (10 * 10 ** 3) / 12, L = 100, P = 1000, G = E / 2.6, A = 100;
  const ebTarget = (P * L ** 3) / (3 * E * I);
  const timoTarget = ebTarget + (P * L) / ((5 / 6) * G * A);

  it('targets are the documented 2.0000 / 2.0156 mm', () => {
    expect(ebTarget).toBeCloseTo(2.0, 10);
    expect(timoTarget).toBeCloseTo(2.0156, 4);
  });

  for (const n of [1, 4]) {
    it(`Euler–Bernoulli, ${n} element(s): δ = PL³/3EI, θ = PL²/2EI`, () => {
      const { deflection, rotation } = cantilever('beam2-eb', n, L, section, P);
      const check = recordCheck({
        suite: 'Elements: beams', name: `beam2-eb cantilever tip deflection, ${n} element(s)`, computed: deflection, target: ebTarget,
        unit: 'mm', tolerance: 1e-9, source: 'closed form: Euler–Bernoulli cantilever δ = PL³/3EI', tag: 'closed',
      });
      expect(check.pass).toBe(true);
      expect(rotation / ((P * L ** 2) / (2 * E * I))).toBeCloseTo(1, 9);
    });
    it(`Timoshenko, ${n} element(s): δ = PL³/3EI + PL/κGA (κ = 5/6)`, () => {
      const { deflection } = cantilever('beam2-timo', n, L, section, P);
      const check = recordCheck({
        suite: 'Elements: beams', name: `beam2-timo cantilever tip deflection, ${n} element(s)`, computed: deflection, target: timoTarget,
        unit: 'mm', tolerance: 1e-9, source: 'closed form: Timoshenko cantilever δ = PL³/3EI + PL/κGA', tag: 'closed',
      });
      expect(check.pass).toBe(true);
    });
  }

  it('inclined (30°) cantilever gives the same transverse deflection (frame rotation)', () => {
    const { deflection } = cantilever('beam2-timo', 3, L, section, P, Math.PI / 6);
    expect(deflection / timoTarget).toBeCloseTo(1, 9);
  });

  it('Timoshenko element does not lock: slender cantilever (L/h = 1000) with one element', () => {
    const Ls = 10_000;
    const { deflection } = cantilever('beam2-timo', 1, Ls, section, 1);
    const target = Ls ** 3 / (3 * E * I) + Ls / ((5 / 6) * G * A);
    const check = recordCheck({
      suite: 'Elements: beams', name: 'beam2-timo slender cantilever L/h = 1000, one element (shear locking check)', computed: deflection, target,
      unit: 'mm', tolerance: 1e-8, source: 'closed form: Timoshenko cantilever δ = PL³/3EI + PL/κGA', tag: 'closed',
    });
    expect(check.pass).toBe(true);
  });
});

describe('elastic–perfectly plastic fibre beam: moment–curvature', () => {
  // b = 10, h = 20, σ_y = 250 MPa, E = 200 GPa: κ_y = 2σ_y/(E h), M_p = σ_y b h²/4;
  // closed form M = M_p[1 − (κ_y/κ)²/3] for κ ≥ κ_y.
  const b = 10, h = 20, sy = 250, E = 200_000;
  const ky = (2 * sy) / (E * h);
  const Mp = (sy * b * h * h) / 4;
  const epp = createJ2Plastic({ model: 'j2-plastic', E, nu: 0.3, alpha: 0, T_ref: 20, sigma_y: sy, H_iso: 0, H_kin: 0 }) as Material<unknown>;

  function momentCurvature(name: ElementName, fibres: number): number[] {
    // One element under a prescribed end rotation θ2 = κL with θ1 = 0, w2 and u2 free: no shear,
    // no axial force, so the curvature is uniform and the end moment equals the section moment.
    const L = 50;
    const section: BeamSection = { kind: 'beam', shape: { type: 'rectangle', b, h }, fibres };
    const model = new TestModel({ kernel: elementKernels[name], section, material: epp, coords: [0, 0, L, 0], elements: [[0, 1]] });
    const ratios: number[] = [];
    const steps = 16;
    for (let k = 1; k <= steps; k++) {
      const kappa = (4 * ky * k) / steps;
      const r = model.solve({ fixed: new Map([[0, 0], [1, 0], [2, 0], [5, kappa * L]]) });
      expect(r.converged).toBe(true);
      model.commit();
      const { fint } = model.assemble();
      if (k % 4 === 0) ratios.push(fint[5] / Mp);
    }
    return ratios; // at κ/κ_y = 1, 2, 3, 4
  }

  const closed = (r: number): number => 1 - 1 / (3 * r * r);

  for (const name of ['beam2-eb', 'beam2-timo'] as ElementName[]) {
    it(`${name}: M/M_p = 0.6667, 0.9167, 0.9792 at κ/κ_y = 1, 2, 4 (64 fibres, 0.05 %)`, () => {
      const r = momentCurvature(name, 64);
      const at = [1, 2, 4];
      for (const kr of at) {
        const computed = r[kr - 1];
        const check = recordCheck({
          suite: 'Elements: beams', name: `${name} fibre section (64 layers), M/M_p at κ/κ_y = ${kr}`, computed, target: closed(kr),
          unit: '-', tolerance: 5e-4, source: 'closed form: rectangular elastic–perfectly plastic section M = M_p[1 − (κ_y/κ)²/3]', tag: 'closed',
        });
        expect(check.pass).toBe(true);
      }
      expect(closed(1)).toBeCloseTo(0.6667, 4);
      expect(closed(2)).toBeCloseTo(0.9167, 4);
      expect(closed(4)).toBeCloseTo(0.9792, 4);
    });
  }

  it('layering error falls roughly as 1/n² (16 → 64 fibres)', () => {
    const e16 = Math.abs(momentCurvature('beam2-eb', 16)[3] - closed(4));
    const e64 = Math.abs(momentCurvature('beam2-eb', 64)[3] - closed(4));
    expect(e64).toBeLessThan(e16 / 8);
    expect(e16).toBeLessThan(5e-3);
  });
});

