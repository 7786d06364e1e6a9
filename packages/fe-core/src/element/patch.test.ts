/**
 * Patch tests (MacNeal & Harder 1985 geometry): a 0.24 × 0.12 rectangle cut into five distorted
 * quadrilaterals by the interior nodes (0.04, 0.02), (0.18, 0.03), (0.16, 0.08), (0.08, 0.08);
 * triangles split each quad, quadratic elements add straight mid-edge nodes. Boundary nodes get
 * the exact linear field, interior nodes are free: a consistent element reproduces the field and
 * its constant stress at every point to round-off.
 *
 * Plane stress, E = 1e6, ν = 0.25, u = 1e-3(x + y/2), v = 1e-3(y + x/2):
 *   ε_x = ε_y = 1e-3, γ_xy = 1e-3; σ_x = E/(1−ν²)(ε_x + ν ε_y) = 1e6/0.9375 · 1.25e-3 = 1333.33,
 *   σ_y = 1333.33, τ_xy = G γ = 4e5 · 1e-3 = 400.
 * Plane strain (same field): λ = 4e5, μ = 4e5; σ_x = σ_y = (λ + 2μ)1e-3 + λ·1e-3 = 1600,
 *   σ_z = λ(ε_x + ε_y) = 800, τ_xy = 400.
 * Axisymmetric (patch shifted to r = 1 + x, z = y), u_r = 1e-3 r, u_z = 1e-3(r + z):
 *   ε_rr = ε_θθ = ε_zz = 1e-3, γ_rz = 1e-3; σ_rr = σ_θθ = σ_zz = λ·3e-3 + 2μ·1e-3 = 2000,
 *   τ_rz = 400. Equilibrium: ∂σ_rr/∂r + ∂τ_rz/∂z + (σ_rr − σ_θθ)/r = 0 (no radial load) and
 *   ∂τ_rz/∂r + ∂σ_zz/∂z + τ_rz/r + b_z = 0, so b_z = −400/r, applied as consistent loads
 *   ∫ N b_z 2πr dA = −800π ∫ N dA.
 */
import { describe, expect, it } from 'vitest';
import { recordCheck } from '@phaseloop/tests/support/verification';
import { createLinearElastic } from '../material/elastic';
import { ContinuumGeometry } from './continuum';
import { elementKernels } from './index';
import { TestModel, addMidsideNodes, splitQuads, type PlainMesh } from './testing';
import type { ContinuumAnalysis, ElementName } from './types';

const patch: PlainMesh = {
  coords: [0, 0, 0.24, 0, 0.24, 0.12, 0, 0.12, 0.04, 0.02, 0.18, 0.03, 0.16, 0.08, 0.08, 0.08],
  elements: [[0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7], [4, 5, 6, 7]],
};

function meshFor(name: ElementName): PlainMesh {
  switch (name) {
    case 't3': return splitQuads(patch);
    case 't6': return addMidsideNodes(splitQuads(patch));
    case 'q8': return addMidsideNodes(patch);
    default: return patch;
  }
}

const onBoundary = (x: number, y: number): boolean =>
  Math.abs(x) < 1e-12 || Math.abs(x - 0.24) < 1e-12 || Math.abs(y) < 1e-12 || Math.abs(y - 0.12) < 1e-12;

const material = createLinearElastic({ model: 'linear-elastic', E: 1e6, nu: 0.25, alpha: 0, T_ref: 20 });
const S2 = Math.SQRT2;

interface Case {
  analysis: ContinuumAnalysis;
  field: (x: number, y: number) => [number, number];
  /** Kelvin–Mandel targets [11, 22, 33, ·, ·, √2·12]. */
  stress: number[];
  shift: number;
  bodyZ?: (r: number) => number;
}

const cases: Case[] = [
  { analysis: 'planeStress', shift: 0, field: (x, y) => [1e-3 * (x + y / 2), 1e-3 * (y + x / 2)], stress: [1e6 / 0.9375 * 1.25e-3, 1e6 / 0.9375 * 1.25e-3, 0, 0, 0, 400 * S2] },
  { analysis: 'planeStrain', shift: 0, field: (x, y) => [1e-3 * (x + y / 2), 1e-3 * (y + x / 2)], stress: [1600, 1600, 800, 0, 0, 400 * S2] },
  { analysis: 'axisymmetric', shift: 1, field: (r, z) => [1e-3 * r, 1e-3 * (r + z)], stress: [2000, 2000, 2000, 0, 0, 400 * S2], bodyZ: (r) => -400 / r },
];

const names: ElementName[] = ['t3', 'q4', 'q4-eas', 'q4-bbar', 't6', 'q8'];

describe.each(names)('%s patch test', (name) => {
  for (const c of cases) {
    it(`${c.analysis}: reproduces the linear field and constant stress`, () => {
      const kernel = elementKernels[name];
      const base = meshFor(name);
      const coords = base.coords.map((v, i) => (i % 2 === 0 ? v + c.shift : v));
      const model = new TestModel({ kernel, section: { kind: 'continuum', analysis: c.analysis, thickness: 1 }, material, coords, elements: base.elements });
      const fixed = new Map<number, number>();
      const exact = new Float64Array(model.ndof);
      for (let n = 0; n < model.nodes; n++) {
        const x = coords[2 * n], y = coords[2 * n + 1];
        const [ux, uy] = c.field(x, y);
        exact[2 * n] = ux;
        exact[2 * n + 1] = uy;
        if (onBoundary(base.coords[2 * n], y)) {
          fixed.set(2 * n, ux);
          fixed.set(2 * n + 1, uy);
        }
      }
      const loads = new Float64Array(model.ndof);
      if (c.bodyZ) {
        // Consistent body load ∫ N b_z dV with the element's own rule.
        const shape = kernel.shape!, rule = kernel.rule!;
        const g = new ContinuumGeometry(shape);
        for (const el of base.elements) {
          const xe = new Float64Array(el.flatMap((n) => [coords[2 * n], coords[2 * n + 1]]));
          for (let q = 0; q < rule.count; q++) {
            g.at(xe, rule.points[2 * q], rule.points[2 * q + 1]);
            const dV = rule.weights[q] * g.detJ * 2 * Math.PI * g.x;
            el.forEach((n, a) => (loads[2 * n + 1] += g.N[a] * c.bodyZ!(g.x) * dV));
          }
        }
      }
      const result = model.solve({ fixed, loads });
      expect(result.converged).toBe(true);
      let uErr = 0;
      for (let d = 0; d < model.ndof; d++) uErr = Math.max(uErr, Math.abs(model.u[d] - exact[d]));
      expect(uErr).toBeLessThan(1e-13);
      let worst = 0;
      let worstValue = c.stress[0];
      for (const out of model.outputs) {
        for (let p = 0; p < out.stress.length / 6; p++) {
          for (let k = 0; k < 6; k++) {
            const err = Math.abs(out.stress[6 * p + k] - c.stress[k]);
            if (err > worst) {
              worst = err;
              worstValue = k === 0 ? out.stress[6 * p] : c.stress[0] + Math.sign(out.stress[6 * p + k] - c.stress[k]) * err;
            }
          }
        }
      }
      const check = recordCheck({
        suite: 'Elements: patch tests',
        name: `${name} ${c.analysis} patch (MacNeal–Harder distorted mesh), worst stress component`,
        computed: worstValue, target: c.stress[0], unit: 'MPa', tolerance: 1e-9,
        source: c.analysis === 'axisymmetric' ? 'closed form: uniform axisymmetric stress field (derived in the test header)' : 'MacNeal & Harder (1985) patch, closed-form constant stress',
        tag: 'closed',
      });
      expect(check.pass).toBe(true);
    });
  }
});

describe('axisymmetric elements touching the axis (r = 0)', () => {
  // Same axisymmetric field on a 3 × 2 mesh of [0, 0.3] × [0, 0.2] whose first column of nodes
  // lies on the axis (u_r = 1e-3 r vanishes there); integration points never sit at r = 0.
  for (const name of names) {
    it(`${name}: uniform field reproduced with nodes on the axis`, () => {
      const kernel = elementKernels[name];
      const rect: PlainMesh = { coords: [], elements: [] };
      for (let j = 0; j <= 2; j++) for (let i = 0; i <= 3; i++) rect.coords.push(0.1 * i + (i > 0 && i < 3 && j === 1 ? 0.02 : 0), 0.1 * j);
      for (let j = 0; j < 2; j++) for (let i = 0; i < 3; i++) rect.elements.push([j * 4 + i, j * 4 + i + 1, j * 4 + i + 5, j * 4 + i + 4]);
      const mesh = name === 't3' ? splitQuads(rect) : name === 't6' ? addMidsideNodes(splitQuads(rect)) : name === 'q8' ? addMidsideNodes(rect) : rect;
      const model = new TestModel({ kernel, section: { kind: 'continuum', analysis: 'axisymmetric', thickness: 1 }, material, coords: mesh.coords, elements: mesh.elements });
      const fixed = new Map<number, number>();
      for (let n = 0; n < model.nodes; n++) {
        const r = mesh.coords[2 * n], z = mesh.coords[2 * n + 1];
        const edge = r < 1e-12 || Math.abs(r - 0.3) < 1e-12 || z < 1e-12 || Math.abs(z - 0.2) < 1e-12;
        if (edge) {
          fixed.set(2 * n, 1e-3 * r);
          fixed.set(2 * n + 1, 2e-3 * z);
        }
      }
      expect(model.solve({ fixed }).converged).toBe(true);
      // u_r = 1e-3 r, u_z = 2e-3 z: σ_rr = σ_θθ = λ·4e-3 + 2μ·1e-3 = 2400, σ_zz = 1600 + 1600 = 3200.
      for (const out of model.outputs) {
        for (let p = 0; p < out.stress.length / 6; p++) {
          expect(out.stress[6 * p]).toBeCloseTo(2400, 7);
          expect(out.stress[6 * p + 1]).toBeCloseTo(3200, 7);
          expect(out.stress[6 * p + 2]).toBeCloseTo(2400, 7);
        }
      }
    });
  }
});
