/**
 * Assembly and Dirichlet elimination: the CSR pattern, the element scatter, edge-load patterns
 * (resultants checked against closed forms) and the model errors that assembly raises.
 */
import { describe, expect, it } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { ellipticRing, rectangle } from '../mesh/structured';
import { Assembler } from './assembler';
import { buildProblem, describeDof, ModelError } from './problem';

function model(extra: Partial<ModelInput>, type: 'q4' | 'q8' | 't6' = 'q4'): ModelInput {
  const mesh = rectangle({ width: 4, height: 2, nx: 2, ny: 1 }, { type, section: 's', material: 'm' });
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 3 } },
    materials: { m: { model: 'linear-elastic', E: 1000, nu: 0.25 } },
    supports: [{ type: 'fixed', set: 'left' }],
    segments: [{ name: 'a' }],
    ...extra,
  };
}

function problemOf(input: ModelInput) {
  const parsed = parseModel(input);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return buildProblem(parsed.model);
}

describe('assembly', () => {
  it('builds a sorted, structurally symmetric pattern over the free dofs only', () => {
    const problem = problemOf(model({}));
    const asm = new Assembler(problem);
    const { n, rowPtr, colIdx } = asm.matrix;
    // 6 nodes × 2 dofs, the 2 left nodes held.
    expect(problem.nDof).toBe(12);
    expect(n).toBe(8);
    const entries = new Set<string>();
    for (let i = 0; i < n; i++) {
      for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) {
        if (p > rowPtr[i]) expect(colIdx[p]).toBeGreaterThan(colIdx[p - 1]);
        entries.add(`${i},${colIdx[p]}`);
      }
    }
    for (const e of entries) {
      const [i, j] = e.split(',');
      expect(entries.has(`${j},${i}`)).toBe(true);
    }
  });

  it('assembles a symmetric tangent whose row sums vanish for a free body (rigid translation)', () => {
    const problem = problemOf(model({ supports: [] }));
    const asm = new Assembler(problem);
    const zero = new Float64Array(problem.nDof);
    const T = new Float64Array(problem.nodeCount).fill(20);
    const state = new Float64Array(problem.stateSize);
    asm.initState(state, T);
    const status = { ok: true, element: 0, message: '' };
    asm.assemble({ u: zero, uOld: zero, temperature: T, temperatureOld: T, state, stateOld: state.slice() }, true, status);
    expect(status.ok).toBe(true);
    expect(asm.isSymmetric()).toBe(true);
    const { n, rowPtr, colIdx, values } = asm.matrix;
    for (let i = 0; i < n; i++) {
      let sx = 0;
      for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) if (colIdx[p] % 2 === 0) sx += values[p];
      expect(Math.abs(sx)).toBeLessThan(1e-9);
    }
  });

  it('turns a uniform traction into nodal forces whose resultant is traction × length × thickness', () => {
    for (const type of ['q4', 'q8'] as const) {
      const problem = problemOf(model({ loads: [{ type: 'traction', name: 't', edgeSet: 'right', direction: [3, 4] }] }, type));
      const f = problem.loadPatterns[0]!;
      let fx = 0, fy = 0;
      for (let d = 0; d < f.length; d += 2) {
        fx += f[d];
        fy += f[d + 1];
      }
      expect(fx).toBeCloseTo(0.6 * 2 * 3, 12);
      expect(fy).toBeCloseTo(0.8 * 2 * 3, 12);
    }
  });

  it('pressure on a curved quadratic edge: resultant p·chord (closed form ∮ p n ds)', () => {
    const mesh = ellipticRing({ inner: { a: 1, b: 1 }, outer: { a: 2, b: 2 }, nAround: 6, nRadial: 2 }, { type: 'q8', section: 's', material: 'm' });
    const problem = problemOf({
      ...model({}),
      ...mesh,
      supports: [],
      loads: [{ type: 'pressure', name: 'p', edgeSet: 'outer' }],
    });
    const f = problem.loadPatterns[0]!;
    let fx = 0, fy = 0;
    for (let d = 0; d < f.length; d += 2) {
      fx += f[d];
      fy += f[d + 1];
    }
    // A unit pressure on the quarter arc of radius 2 pushes inwards with resultant (−2, −2)·t.
    expect(fx).toBeCloseTo(-2 * 3, 5);
    expect(fy).toBeCloseTo(-2 * 3, 5);
  });

  it('axisymmetric edge loads are total ring forces (2πr per unit length)', () => {
    const mesh = rectangle({ x0: 5, width: 2, height: 1, nx: 1, ny: 1 }, { type: 'q4', section: 'ring', material: 'm' });
    const problem = problemOf({
      ...model({}),
      ...mesh,
      sections: { ring: { kind: 'continuum', analysis: 'axisymmetric' } },
      supports: [],
      loads: [{ type: 'traction', name: 'cap', edgeSet: 'top', direction: [0, 1] }],
    });
    const f = problem.loadPatterns[0]!;
    let fy = 0;
    for (let d = 1; d < f.length; d += 2) fy += f[d];
    expect(fy).toBeCloseTo(Math.PI * (7 ** 2 - 5 ** 2), 10);
  });

  it('rejects a direction prescribed twice with a readable error', () => {
    const input = model({ loads: [{ type: 'displacement', name: 'pull', set: 'left', dof: 'ux' }] });
    expect(() => problemOf(input)).toThrow(ModelError);
    expect(() => problemOf(input)).toThrow(/prescribed twice/);
  });

  it('names dofs by node id and direction', () => {
    const problem = problemOf(model({}));
    expect(describeDof(problem, 0)).toEqual({ node: problem.nodeIds[0], direction: 'ux' });
    expect(describeDof(problem, 5)).toEqual({ node: problem.nodeIds[2], direction: 'uy' });
  });
});
