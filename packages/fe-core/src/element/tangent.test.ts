/**
 * Finite-difference checks of every element tangent: K must equal ∂fint/∂u (central differences)
 * for elastic and J2 materials, in the plastic range for J2, in plane stress (local σ33 = 0
 * iteration inside the material reduction), plane strain and axisymmetric.
 */
import { describe, expect, it } from 'vitest';
import { createLinearElastic } from '../material/elastic';
import { createJ2Plastic } from '../material/j2';
import { createMaterialReport, type Material } from '../material/types';
import { elementKernels } from './index';
import { TestModel, elementTangentError } from './testing';
import { createElementOutput, type ContinuumAnalysis, type ElementName, type Section } from './types';

const elastic = createLinearElastic({ model: 'linear-elastic', E: 200_000, nu: 0.3, alpha: 1e-5, T_ref: 20 });
const j2 = createJ2Plastic({ model: 'j2-plastic', E: 200_000, nu: 0.3, alpha: 1e-5, T_ref: 20, sigma_y: 250, H_iso: 5000, H_kin: 3000 });
/**
 * Test-only nonlinear elastic material with a NON-SYMMETRIC tangent, like the SMA models:
 * σ = C:ε + (β + γ (a·ε)) (a·ε) b, so dσ/dε = C + (β + 2γ (a·ε)) b ⊗ a with a ≠ b.
 */
function skewMaterial(): Material<unknown> {
  const base = createLinearElastic({ model: 'linear-elastic', E: 200_000, nu: 0.3, alpha: 0, T_ref: 20 });
  const a = [1, 0.5, 0.2, 0.1, 0, 0.3], b = [0.2, 1, 0.1, 0, 0.2, 0.4];
  const beta = 20_000, gamma = 4e6;
  return {
    model: 'skew-test', stateSize: 0, params: {},
    initState() {},
    update(input, so, oo, st, no, out) {
      base.update(input, so, oo, st, no, out);
      let ae = 0;
      for (let i = 0; i < 6; i++) ae += a[i] * input.strain[i];
      for (let i = 0; i < 6; i++) {
        out.stress[i] += (beta + gamma * ae) * ae * b[i];
        for (let j = 0; j < 6; j++) out.tangent[i * 6 + j] += (beta + 2 * gamma * ae) * b[i] * a[j];
      }
    },
    report: base.report,
  };
}

const materials: [string, Material<unknown>][] = [['elastic', elastic as Material<unknown>], ['J2', j2 as Material<unknown>], ['non-symmetric', skewMaterial()]];

/** One distorted element of each type (corners of a skewed quad, mid-edge nodes bowed slightly). */
const geometry: Record<string, number[]> = {
  t3: [0, 0, 1.1, 0.1, 0.2, 0.9],
  t6: [0, 0, 1.1, 0.1, 0.2, 0.9, 0.56, 0.02, 0.68, 0.52, 0.08, 0.46],
  q4: [0, 0, 1.2, 0.1, 1.0, 0.9, 0.1, 1.1],
  q8: [0, 0, 1.2, 0.1, 1.0, 0.9, 0.1, 1.1, 0.6, 0.02, 1.12, 0.5, 0.55, 1.03, 0.03, 0.55],
};
const geometryOf = (name: ElementName): number[] => geometry[name.startsWith('q4') ? 'q4' : name];

/** Deterministic displacement pattern of size n, amplitude a. */
const pattern = (n: number, a: number): number[] => Array.from({ length: n }, (_, i) => a * Math.sin(1.7 * i + 0.3));

function continuumCase(name: ElementName, analysis: ContinuumAnalysis, material: Material<unknown>): { error: number; plastic: boolean } {
  const kernel = elementKernels[name];
  const coords = geometryOf(name).map((v, i) => (analysis === 'axisymmetric' && i % 2 === 0 ? v + 1 : v));
  const nodes = coords.length / 2;
  const model = new TestModel({ kernel, section: { kind: 'continuum', analysis, thickness: 2 }, material, coords, elements: [Array.from({ length: nodes }, (_, i) => i)] });
  model.u.set(pattern(model.ndof, 4e-3));
  model.temperature.fill(60);
  const ctx = model.context(0);
  const error = elementTangentError(kernel, ctx, 1e-8);
  return { error, plastic: anyPlastic(model) };
}

/** Relative skew part of the element tangent, to show the non-symmetric case is really tested. */
function asymmetry(name: ElementName, analysis: ContinuumAnalysis): number {
  const kernel = elementKernels[name];
  const coords = geometryOf(name).map((v, i) => (analysis === 'axisymmetric' && i % 2 === 0 ? v + 1 : v));
  const nodes = coords.length / 2;
  const model = new TestModel({ kernel, section: { kind: 'continuum', analysis, thickness: 2 }, material: skewMaterial(), coords, elements: [Array.from({ length: nodes }, (_, i) => i)] });
  model.u.set(pattern(model.ndof, 4e-3));
  const out = createElementOutput(kernel, model.input.section);
  kernel.evaluate(model.context(0), out);
  const nd = model.ndof;
  let skew = 0, size = 0;
  for (let i = 0; i < nd; i++) {
    for (let j = 0; j < nd; j++) {
      skew = Math.max(skew, Math.abs(out.K[i * nd + j] - out.K[j * nd + i]));
      size = Math.max(size, Math.abs(out.K[i * nd + j]));
    }
  }
  return skew / size;
}

function anyPlastic(model: TestModel<unknown>): boolean {
  const report = createMaterialReport();
  const ms = model.reduced.stateSize;
  const points = model.input.kernel.pointsPerElement(model.input.section);
  for (let p = 0; p < points; p++) {
    model.reduced.report(model.state, p * ms, report);
    if (report.eqPlastic > 0) return true;
  }
  return false;
}

describe('continuum element tangents vs finite differences', () => {
  const names: ElementName[] = ['t3', 'q4', 'q4-eas', 'q4-bbar', 't6', 'q8'];
  const analyses: ContinuumAnalysis[] = ['planeStress', 'planeStrain', 'axisymmetric'];
  for (const name of names) {
    for (const analysis of analyses) {
      for (const [label, material] of materials) {
        it(`${name}, ${analysis}, ${label}`, () => {
          const { error, plastic } = continuumCase(name, analysis, material);
          expect(error).toBeLessThan(label === 'elastic' ? 1e-7 : 1e-5);
          if (label === 'J2') expect(plastic).toBe(true);
          if (label === 'non-symmetric') expect(asymmetry(name, analysis)).toBeGreaterThan(1e-3);
        });
      }
    }
  }
});

describe('bar and beam tangents vs finite differences', () => {
  const sections: [ElementName, Section][] = [
    ['bar2', { kind: 'bar', area: 50 }],
    ['beam2-eb', { kind: 'beam', shape: { type: 'rectangle', b: 10, h: 20 }, fibres: 12 }],
    ['beam2-timo', { kind: 'beam', shape: { type: 'rectangle', b: 10, h: 20 }, fibres: 12 }],
    ['beam2-timo', { kind: 'beam', shape: { type: 'tube', do: 20, di: 14 }, fibres: 10 }],
  ];
  for (const [name, section] of sections) {
    for (const [label, material] of materials) {
      it(`${name} (${section.kind === 'beam' ? section.shape.type : 'bar'}), ${label}, inclined member`, () => {
        const kernel = elementKernels[name];
        const model = new TestModel({ kernel, section, material, coords: [10, 5, 70, 85], elements: [[0, 1]] });
        model.u.set(kernel.dofsPerNode === 3 ? [0.01, -0.02, 0.004, 0.09, 0.05, -0.03] : [0.01, -0.02, 0.4, 0.5]);
        model.temperature.fill(50);
        const error = elementTangentError(kernel, model.context(0), 1e-7);
        expect(error).toBeLessThan(label === 'elastic' ? 1e-7 : 1e-5);
        if (label === 'J2') expect(anyPlastic(model)).toBe(true);
      });
    }
  }
});
