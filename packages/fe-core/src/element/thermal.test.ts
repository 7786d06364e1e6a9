/**
 * Thermal strain through the elements: nodal temperatures are interpolated to the material
 * points, which subtract α(T − T_ref). Closed forms (E = 200 GPa, α = 12e-6, ΔT = 100):
 * fully constrained bar σ = −EαΔT = −240 MPa; constrained plate in plane stress
 * σ = −EαΔT/(1 − ν) = −342.9 MPa; in plane strain (all strains zero) σ = −EαΔT/(1 − 2ν) = −600 MPa;
 * an unconstrained body expands freely, u = αΔT x, without stress.
 */
import { describe, expect, it } from 'vitest';
import { recordCheck } from '@phaseloop/tests/support/verification';
import { createLinearElastic } from '../material/elastic';
import type { Material } from '../material/types';
import { elementKernels } from './index';
import { TestModel, addMidsideNodes, rectangleMesh, splitQuads, type PlainMesh } from './testing';
import type { ContinuumAnalysis, ElementName, Section } from './types';

const E = 200_000, nu = 0.3, alpha = 12e-6, dT = 100;
const steel = createLinearElastic({ model: 'linear-elastic', E, nu, alpha, T_ref: 20 }) as Material<unknown>;

function meshFor(name: ElementName): PlainMesh {
  const base = rectangleMesh(3, 2, 0, 3, 0, 2);
  if (name === 't3') return splitQuads(base);
  if (name === 't6') return addMidsideNodes(splitQuads(base));
  if (name === 'q8') return addMidsideNodes(base);
  return base;
}

function heated(name: ElementName, analysis: ContinuumAnalysis, constrained: boolean) {
  const mesh = meshFor(name);
  const model = new TestModel({ kernel: elementKernels[name], section: { kind: 'continuum', analysis, thickness: 1 }, material: steel, coords: mesh.coords.map((v, i) => (i % 2 === 0 && analysis === 'axisymmetric' ? v + 1 : v)), elements: mesh.elements });
  const fixed = new Map<number, number>();
  if (constrained) for (let d = 0; d < model.ndof; d++) fixed.set(d, 0);
  else if (analysis === 'axisymmetric') fixed.set(1, 0); // only the axial rigid motion exists
  else {
    fixed.set(0, 0);
    fixed.set(1, 0);
    fixed.set(2 * 3 + 1, 0); // node (3, 0): v = 0 removes the rotation
  }
  const r = model.solve({ fixed, temperature: new Float64Array(model.nodes).fill(20 + dT) });
  expect(r.converged).toBe(true);
  return model;
}

describe('thermal strain in continuum elements', () => {
  const names: ElementName[] = ['t3', 'q4', 'q4-eas', 'q4-bbar', 't6', 'q8'];
  for (const name of names) {
    it(`${name}: constrained plate σ = −342.9 MPa (plane stress), −600 MPa (plane strain)`, () => {
      for (const [analysis, target] of [['planeStress', (-E * alpha * dT) / (1 - nu)], ['planeStrain', (-E * alpha * dT) / (1 - 2 * nu)]] as const) {
        const model = heated(name, analysis, true);
        let worst = 0;
        for (const out of model.outputs) for (let p = 0; p < out.stress.length / 6; p++) worst = Math.max(worst, Math.abs(out.stress[6 * p] - target), Math.abs(out.stress[6 * p + 1] - target));
        const check = recordCheck({
          suite: 'Elements: thermal', name: `${name} constrained heated plate, ${analysis}: σ_xx`, computed: target + worst, target,
          unit: 'MPa', tolerance: 1e-9, source: analysis === 'planeStress' ? 'closed form: σ = −EαΔT/(1−ν)' : 'closed form: σ = −EαΔT/(1−2ν)', tag: 'closed',
        });
        expect(check.pass).toBe(true);
      }
    });
    it(`${name}: free expansion u = αΔT x without stress (plane stress and axisymmetric)`, () => {
      for (const analysis of ['planeStress', 'axisymmetric'] as const) {
        const model = heated(name, analysis, false);
        // Node 0 sits at the origin (plane) or at r = 1 on z = 0 (axisymmetric, u_r = αΔT r).
        for (let n = 0; n < model.nodes; n++) {
          expect(model.u[2 * n]).toBeCloseTo(alpha * dT * model.coords[2 * n], 12);
          expect(model.u[2 * n + 1]).toBeCloseTo(alpha * dT * model.coords[2 * n + 1], 12);
        }
        for (const out of model.outputs) for (const s of out.stress) expect(Math.abs(s)).toBeLessThan(1e-7);
      }
    });
  }
});

describe('thermal strain in bars and beams', () => {
  const cases: [ElementName, Section][] = [
    ['bar2', { kind: 'bar', area: 100 }],
    ['beam2-eb', { kind: 'beam', shape: { type: 'rectangle', b: 10, h: 10 } }],
    ['beam2-timo', { kind: 'beam', shape: { type: 'circle', d: 10 } }],
  ];
  for (const [name, section] of cases) {
    it(`${name}: fully constrained, heated by 100 K → σ = −240 MPa in every fibre`, () => {
      const kernel = elementKernels[name];
      const model = new TestModel({ kernel, section, material: steel, coords: [0, 0, 60, 80, 120, 160], elements: [[0, 1], [1, 2]] });
      const fixed = new Map<number, number>();
      const dpn = kernel.dofsPerNode;
      for (const n of [0, 2]) for (let d = 0; d < dpn; d++) fixed.set(dpn * n + d, 0);
      const r = model.solve({ fixed, temperature: new Float64Array(3).fill(120) });
      expect(r.converged).toBe(true);
      let worst = 0;
      for (const out of model.outputs) for (let p = 0; p < out.stress.length / 6; p++) worst = Math.max(worst, Math.abs(out.stress[6 * p] + 240));
      const check = recordCheck({
        suite: 'Elements: thermal', name: `${name} fully constrained heated member: axial stress`, computed: -240 + worst, target: -E * alpha * dT,
        unit: 'MPa', tolerance: 1e-9, source: 'closed form: σ = −EαΔT', tag: 'closed',
      });
      expect(check.pass).toBe(true);
    });
  }
});
