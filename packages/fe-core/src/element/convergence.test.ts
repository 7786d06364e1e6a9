/**
 * Mesh convergence and Newton convergence.
 *
 * Rates: Lamé thick cylinder (a = 10, b = 20, p = 100 MPa, E = 200 GPa, ν = 0.3) in plane strain,
 * as an axisymmetric strip with u_z = 0; exact u_r = (1 + ν)/E [(1 − 2ν) A r + B/r],
 * A = p a²/(b² − a²), B = p a² b²/(b² − a²). The L2 displacement error
 * ‖u − u_h‖ = (∫ (u_r − u_h)² 2πr dA)^½ must fall as h² for linear and h³ for quadratic elements
 * (fitted log–log slope within 0.1, check-values "convergence rate").
 *
 * Newton: with the consistent element tangents a J2 problem converges quadratically near the
 * solution: the observed order of the residual sequence is about 2.
 */
import { describe, expect, it } from 'vitest';
import { recordCheck } from '@phaseloop/tests/support/verification';
import { createLinearElastic } from '../material/elastic';
import { createJ2Plastic } from '../material/j2';
import type { Material } from '../material/types';
import { gaussQuad, gaussTriangle } from '../quadrature/gauss';
import { ContinuumGeometry } from './continuum';
import { elementKernels } from './index';
import { TestModel, addMidsideNodes, rectangleMesh, splitQuads, type PlainMesh } from './testing';
import type { ContinuumAnalysis, ElementName } from './types';

const a = 10, b = 20, p = 100, E = 200_000, nu = 0.3;
const A = (p * a * a) / (b * b - a * a), B = (p * a * a * b * b) / (b * b - a * a);
const exact = (r: number): number => ((1 + nu) / E) * ((1 - 2 * nu) * A * r + B / r);
const steel = createLinearElastic({ model: 'linear-elastic', E, nu, alpha: 0, T_ref: 20 }) as Material<unknown>;

/** One row of square elements through the wall (the strip height shrinks with the mesh). */
function meshFor(name: ElementName, nr: number): PlainMesh {
  const base = rectangleMesh(nr, 1, a, b, 0, (b - a) / nr);
  if (name === 't3') return splitQuads(base);
  if (name === 't6') return addMidsideNodes(splitQuads(base));
  if (name === 'q8') return addMidsideNodes(base);
  return base;
}

function l2Error(name: ElementName, nr: number): number {
  const kernel = elementKernels[name];
  const mesh = meshFor(name, nr);
  const dz = (b - a) / nr;
  const model = new TestModel({ kernel, section: { kind: 'continuum', analysis: 'axisymmetric', thickness: 1 }, material: steel, coords: mesh.coords, elements: mesh.elements });
  const fixed = new Map<number, number>();
  for (let n = 0; n < model.nodes; n++) fixed.set(2 * n + 1, 0);
  // Consistent pressure load on r = a: edge shape functions integrated with weight 2πa.
  const loads = new Float64Array(model.ndof);
  const innerNodes = [];
  for (let n = 0; n < model.nodes; n++) if (Math.abs(mesh.coords[2 * n] - a) < 1e-12) innerNodes.push(n);
  const quadraticEdge = innerNodes.length === 3;
  for (const n of innerNodes) {
    const z = mesh.coords[2 * n + 1];
    const share = dz * (quadraticEdge ? (Math.abs(z - dz / 2) < 1e-12 ? 4 / 6 : 1 / 6) : 1 / 2);
    loads[2 * n] = p * 2 * Math.PI * a * share;
  }
  expect(model.solve({ fixed, loads }).converged).toBe(true);
  // Error integral with a rule well above the element's own.
  const shape = kernel.shape!;
  const rule = shape.cell === 'quad' ? gaussQuad(4) : gaussTriangle(7);
  const g = new ContinuumGeometry(shape);
  let sum = 0;
  for (const el of mesh.elements) {
    const xe = new Float64Array(el.flatMap((n) => [mesh.coords[2 * n], mesh.coords[2 * n + 1]]));
    for (let q = 0; q < rule.count; q++) {
      g.at(xe, rule.points[2 * q], rule.points[2 * q + 1]);
      let uh = 0;
      el.forEach((n, k) => (uh += g.N[k] * model.u[2 * n]));
      sum += (exact(g.x) - uh) ** 2 * rule.weights[q] * g.detJ * 2 * Math.PI * g.x;
    }
  }
  // Per unit height, so strips of different heights compare.
  return Math.sqrt(sum / dz);
}

describe('mesh convergence rate, L2 displacement error (Lamé cylinder)', () => {
  const cases: [ElementName, number][] = [['t3', 2], ['q4', 2], ['q4-eas', 2], ['t6', 3], ['q8', 3]];
  for (const [name, rate] of cases) {
    it(`${name}: slope ${rate} (meshes of 8, 16, 32 elements through the wall)`, () => {
      const ns = [8, 16, 32];
      const errors = ns.map((n) => l2Error(name, n));
      // Least-squares slope of log e against log h (h ∝ 1/n).
      const xs = ns.map((n) => Math.log(1 / n)), ys = errors.map(Math.log);
      const mx = xs.reduce((s, v) => s + v, 0) / 3, my = ys.reduce((s, v) => s + v, 0) / 3;
      let sxy = 0, sxx = 0;
      for (let i = 0; i < 3; i++) {
        sxy += (xs[i] - mx) * (ys[i] - my);
        sxx += (xs[i] - mx) ** 2;
      }
      const slope = sxy / sxx;
      const check = recordCheck({
        suite: 'Elements: convergence', name: `${name} L2 displacement error rate, Lamé cylinder (8/16/32 elements)`, computed: slope, target: rate,
        unit: '-', tolerance: 0.1, absolute: true, source: 'closed form: Lamé cylinder; theoretical L2 rate p + 1 for degree-p elements', tag: 'closed',
      });
      expect(check.pass).toBe(true);
    });
  }
});

describe('Newton convergence with consistent element tangents (J2)', () => {
  const j2 = createJ2Plastic({ model: 'j2-plastic', E, nu, alpha: 0, T_ref: 20, sigma_y: 250, H_iso: 2000, H_kin: 1000 }) as Material<unknown>;
  const cases: [ElementName, ContinuumAnalysis][] = [['q4', 'planeStress'], ['q4-eas', 'planeStrain'], ['q4-bbar', 'axisymmetric'], ['t6', 'planeStress'], ['q8', 'axisymmetric']];
  for (const [name, analysis] of cases) {
    it(`${name}, ${analysis}: quadratic convergence while yielding spreads`, () => {
      // Tapered plate pulled at its wide end: stress varies along the length, so yielding is partial.
      const base = meshFor(name === 'q4-eas' || name === 'q4-bbar' ? 'q4' : name, 6);
      const coords = base.coords.map((v, i) => (i % 2 === 1 ? v * (1 + 0.05 * (base.coords[i - 1] - a)) : v));
      const model = new TestModel({ kernel: elementKernels[name], section: { kind: 'continuum', analysis, thickness: 1 }, material: j2, coords, elements: base.elements });
      // Five displacement increments of 0.006 (mean strain 0.3 % at the end, ε_y = 0.125 %).
      let r = { iterations: 0, residuals: [] as number[], converged: false };
      for (let step = 1; step <= 5; step++) {
        const fixed = new Map<number, number>();
        for (let n = 0; n < model.nodes; n++) {
          const x = coords[2 * n];
          if (Math.abs(x - a) < 1e-12) fixed.set(2 * n, 0);
          if (Math.abs(x - b) < 1e-12) fixed.set(2 * n, 0.006 * step);
        }
        fixed.set(1, 0);
        r = model.solve({ fixed, maxIterations: 30 });
        expect(r.converged).toBe(true);
        model.commit();
      }
      expect(r.iterations).toBeGreaterThan(2); // genuinely nonlinear
      // Observed order p = log(r_{k+1}/r_k) / log(r_k/r_{k−1}) over the last iterations: ≈ 2 for
      // Newton with a consistent tangent (about 1 with an inconsistent one).
      const res = r.residuals;
      const order = (k: number): number => Math.log(res[k + 1] / res[k]) / Math.log(res[k] / res[k - 1]);
      const last = res.length - 2;
      expect(Math.max(order(last), order(last - 1))).toBeGreaterThan(1.7);
    });
  }
});
