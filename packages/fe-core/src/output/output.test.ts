/**
 * Derived fields and writers: von Mises and principal values against closed forms, recovery of
 * linear stress fields (exact for every element), and the structure of the VTU, PVD and CSV text.
 */
import { describe, expect, it } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { buildProblem } from '../assembly/problem';
import { rectangle } from '../mesh/structured';
import { runAnalysis } from '../solve/nonlinear/driver';
import { historyCsv, nodalCsv } from './csv';
import { nodalAverage, principalValues, vonMises } from './frame';
import { patchRecovery, recoverNodal } from './recovery';
import { buildResultDocument } from './result';
import { frameToVtu, framesToPvd } from './vtu';
import { interpolate, locatePoint } from './probe';
import { quarterPlateWithHole } from '../mesh/structured';

const S2 = Math.SQRT2;

describe('derived fields', () => {
  it('von Mises: uniaxial σ → σ, pure shear τ → √3 τ (Kelvin–Mandel input)', () => {
    expect(vonMises([250, 0, 0, 0, 0, 0])).toBeCloseTo(250, 12);
    expect(vonMises([0, 0, 0, 0, 0, S2 * 100])).toBeCloseTo(Math.sqrt(3) * 100, 12);
    expect(vonMises([50, 50, 50, 0, 0, 0])).toBeCloseTo(0, 12);
  });

  it('principal values of a plane tensor: (σx+σy)/2 ± √(((σx−σy)/2)² + τ²)', () => {
    const out = new Float64Array(3);
    principalValues([80, -20, 5, 0, 0, S2 * 30], 0, out);
    const c = 30, r = Math.hypot(50, 30);
    expect(out[0]).toBeCloseTo(c + r, 10);
    expect(out[1]).toBeCloseTo(5, 10);
    expect(out[2]).toBeCloseTo(c - r, 10);
    principalValues([1, 2, 3, S2 * 0.5, S2 * 0.25, S2 * 0.75], 0, out);
    // Invariants of the tensor: trace 6 and determinant 1.6875.
    expect(out[0] + out[1] + out[2]).toBeCloseTo(6, 10);
    expect(out[0] * out[1] * out[2]).toBeCloseTo(1 * (2 * 3 - 0.25) - 0.75 * (0.75 * 3 - 0.5 * 0.25) + 0.25 * (0.75 * 0.5 - 2 * 0.25), 10);
  });
});

function bending(type: 't3' | 'q4' | 't6' | 'q8'): ModelInput {
  const mesh = rectangle({ width: 10, height: 4, nx: 5, ny: 2 }, { type, section: 's', material: 'm' });
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    nodeSets: { ...mesh.nodeSets, corner: [1] },
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
    materials: { m: { model: 'linear-elastic', E: 1000, nu: 0.3 } },
    supports: [{ type: 'fixed', set: 'left', dofs: ['ux'] }, { type: 'fixed', set: 'corner', dofs: ['uy'] }],
    loads: [{ type: 'traction', name: 'pull', edgeSet: 'right', direction: [1, 0] }],
    segments: [{ name: 'pull', targets: { pull: 7 }, increments: { initial: 1, min: 0.1, max: 1 } }],
    output: { fields: ['displacement', 'stress', 'vonMises', 'principalStress'], points: [{ name: 'p', x: 10, y: 4 }], reactionSums: [{ name: 'left', set: 'left' }], integrationPoints: true },
  };
}

function solve(input: ModelInput) {
  const parsed = parseModel(input);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  const problem = buildProblem(parsed.model);
  return { problem, result: runAnalysis(problem) };
}

describe('nodal recovery', () => {
  it('reproduces a uniform stress field at every node for every element type', () => {
    for (const type of ['t3', 'q4', 't6', 'q8'] as const) {
      const { problem, result } = solve(bending(type));
      const last = result.frames[result.frames.length - 1];
      for (const s of [nodalAverage(problem, last.pointStress, 6), patchRecovery(problem, last.pointStress, 6), recoverNodal(problem, last.pointStress, 6)]) {
        for (let n = 0; n < problem.nodeCount; n++) {
          expect(s[6 * n]).toBeCloseTo(7, 8);
          expect(s[6 * n + 1]).toBeCloseTo(0, 8);
        }
      }
    }
  });

  it('extrapolates a linear field exactly from the points (Q8 fit of x + 2y)', () => {
    const { problem } = solve(bending('q8'));
    const field = new Float64Array(problem.pointCount);
    for (let p = 0; p < problem.pointCount; p++) field[p] = problem.pointCoords[2 * p] + 2 * problem.pointCoords[2 * p + 1];
    const nodal = nodalAverage(problem, field, 1);
    for (let n = 0; n < problem.nodeCount; n++) expect(nodal[n]).toBeCloseTo(problem.coords[2 * n] + 2 * problem.coords[2 * n + 1], 9);
  });
});

describe('writers', () => {
  const { problem, result } = solve(bending('q8'));

  it('VTU: counts, quadratic cell type, requested arrays; PVD lists frames with times', () => {
    const vtu = frameToVtu(problem, result.frames[1], ['displacement', 'stress', 'vonMises']);
    expect(vtu).toMatch(new RegExp(`NumberOfPoints="${problem.nodeCount}" NumberOfCells="${problem.elements.length}"`));
    expect(vtu).toContain('Name="displacement" NumberOfComponents="3"');
    expect(vtu).toContain('Name="stress" NumberOfComponents="6"');
    const types = vtu.split('Name="types"')[1].split('</DataArray>')[0];
    expect(types.trim().split(/\s+/).slice(-problem.elements.length).every((t) => t === '23')).toBe(true);
    const pvd = framesToPvd(result.frames.map((f, k) => ({ time: f.time, file: `frame_${k}.vtu` })));
    expect(pvd.match(/<DataSet /g)?.length).toBe(result.frames.length);
    expect(pvd).toContain('timestep="1"');
  });

  it('CSV: history row per frame, nodal row per node', () => {
    const h = historyCsv(result.frames).trim().split('\n');
    expect(h.length).toBe(result.frames.length + 1);
    expect(h[0].split(',')).toContain('left.Fx');
    const n = nodalCsv(problem, result.frames[1], ['displacement', 'vonMises']).trim().split('\n');
    expect(n.length).toBe(problem.nodeCount + 1);
    expect(n[0]).toBe('node,x,y,displacement.ux,displacement.uy,displacement.rz,vonMises.value');
  });

  it('RESULT.json: frames, history columns, integration points; reactions balance the load', () => {
    const doc = buildResultDocument(problem, result, 0.1);
    expect(doc.status).toBe('succeeded');
    expect(doc.frames.length).toBe(result.frames.length);
    expect(doc.history['left.Fx'][1]).toBeCloseTo(-7 * 4, 9);
    expect(doc.pointCoordinates?.length).toBe(problem.pointCount);
    const json = JSON.parse(JSON.stringify(doc));
    expect(json.fields.stress).toEqual(['xx', 'yy', 'zz', 'yz', 'xz', 'xy']);
    expect(json.frames[1].nodal.displacement.length).toBe(problem.nodeCount);
  });
});

describe('point probes', () => {
  it('interpolate a uniaxial displacement field exactly inside elements (u_x = σx/E · x)', () => {
    for (const type of ['t3', 'q4', 't6', 'q8'] as const) {
      const input = bending(type);
      input.output!.points = [{ name: 'inside', x: 3.3, y: 1.7 }];
      const { problem, result } = solve(input);
      const last = result.frames[result.frames.length - 1];
      // Plane stress, σx = 7 MPa, E = 1000, left edge on rollers: u_x = 7x/1000.
      expect(last.history['inside.ux']).toBeCloseTo((7 * 3.3) / 1000, 12);
      expect(last.history['inside.sxx']).toBeCloseTo(7, 8);
      expect(locatePoint(problem, 3.3, 1.7).element).toBeGreaterThan(0);
    }
  });

  it('inverts the curved quadratic map and falls back to the nearest node outside the mesh', () => {
    const part = quarterPlateWithHole({ radius: 1, halfWidth: 4, halfHeight: 4, nAround: 3, nRadial: 3, ratio: 2 }, { type: 'q8', section: 's', material: 'm' });
    const { problem } = solve({ ...bending('q8'), ...part, supports: [{ type: 'symmetry', set: 'left', normal: 'x' }, { type: 'symmetry', set: 'bottom', normal: 'y' }], loads: [], segments: [{ name: 'none' }], output: { fields: ['displacement'], points: [], reactionSums: [], integrationPoints: false } });
    // A point on the hole's arc at 30°, inside the mesh: its weights reproduce its coordinates.
    const x = Math.cos(Math.PI / 6) * 1.05, y = Math.sin(Math.PI / 6) * 1.05;
    const probe = locatePoint(problem, x, y);
    expect(probe.element).toBeGreaterThan(0);
    expect(interpolate(probe, problem.coords, 2, 0)).toBeCloseTo(x, 12);
    expect(interpolate(probe, problem.coords, 2, 1)).toBeCloseTo(y, 12);
    // Inside the hole: no element, the nearest node on the arc.
    const hole = locatePoint(problem, 0.2, 0.2);
    expect(hole.element).toBe(0);
    expect(Math.hypot(problem.coords[2 * hole.nodes[0]], problem.coords[2 * hole.nodes[0] + 1])).toBeCloseTo(1, 12);
  });
});
