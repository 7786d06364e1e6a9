/**
 * The split result files (mesh file + one file per frame) hold the same numbers as RESULT.json,
 * survive a JSON round trip, and carry the ranges and sections a viewer needs without the frames.
 */
import { describe, expect, it } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { buildProblem } from '../assembly/problem';
import { line, rectangle } from '../mesh/structured';
import { runAnalysis } from '../solve/nonlinear/driver';
import { buildResultDocument, RESULT_FORMAT } from './result';
import { RESULT_FRAME_FORMAT, RESULT_MESH_FORMAT, resultFrameFileName, splitResultDocument, type ResultFrameFile, type ResultMesh } from './split';

function resultOf(input: ModelInput) {
  const parsed = parseModel(input);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  const problem = buildProblem(parsed.model);
  return buildResultDocument(problem, runAnalysis(problem), 0);
}

/** A plate pulled in three increments, with integration-point output. */
function plate(): ModelInput {
  const mesh = rectangle({ width: 10, height: 4, nx: 4, ny: 2 }, { type: 'q4', section: 's', material: 'm' });
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    nodeSets: { ...mesh.nodeSets, corner: [1] },
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
    materials: { m: { model: 'linear-elastic', E: 1000, nu: 0.3 } },
    supports: [{ type: 'fixed', set: 'left', dofs: ['ux'] }, { type: 'fixed', set: 'corner', dofs: ['uy'] }],
    loads: [{ type: 'traction', name: 'pull', edgeSet: 'right', direction: [1, 0] }],
    segments: [{ name: 'pull', targets: { pull: 6 }, increments: { initial: 1 / 3, min: 0.1, max: 1 / 3 } }],
    output: { fields: ['displacement', 'stress', 'vonMises'], points: [], reactionSums: [], integrationPoints: true },
  };
}

/** A tube cantilever of beam elements with a tip load: nodal stresses are null at beam nodes. */
function tubeCantilever(): ModelInput {
  const mesh = line({ from: [0, 0], to: [20, 0], n: 4 }, { type: 'beam2', section: 'tube', material: 'm' });
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { tube: { kind: 'beam', crossSection: { shape: 'tube', outerDiameter: 2, wallThickness: 0.3 } } },
    materials: { m: { model: 'linear-elastic', E: 50_000, nu: 0.3 } },
    supports: [{ type: 'fixed', set: 'start' }],
    loads: [{ type: 'force', name: 'tip', set: 'end', dof: 'fy' }],
    segments: [{ name: 'load', targets: { tip: -1 } }],
    output: { fields: ['displacement', 'vonMises'], points: [], reactionSums: [], integrationPoints: false },
  };
}

describe('split result files', () => {
  it('one frame file per frame, each equal to the RESULT.json frame after a JSON round trip', () => {
    const doc = resultOf(plate());
    const split = splitResultDocument(doc);
    const mesh = JSON.parse(JSON.stringify(split.mesh)) as ResultMesh;
    const files = split.frames.map((f) => JSON.parse(JSON.stringify(f)) as ResultFrameFile);
    expect(doc.frames.length).toBe(4);
    expect(files.length).toBe(doc.frames.length);
    expect(mesh.frames.length).toBe(doc.frames.length);
    expect(mesh.format).toBe(RESULT_MESH_FORMAT);
    expect(mesh.resultFormat).toBe(RESULT_FORMAT);
    expect(mesh.nodes).toEqual(doc.nodes);
    expect(mesh.coordinates).toEqual(doc.coordinates);
    expect(mesh.history).toEqual(doc.history);
    expect(mesh).not.toHaveProperty('frames.0.nodal');
    doc.frames.forEach((frame, k) => {
      const file = files[k];
      expect(file.format).toBe(RESULT_FRAME_FORMAT);
      expect(file.index).toBe(frame.index);
      expect(mesh.frames[k].file).toBe(resultFrameFileName(frame.index));
      expect(file.nodeCount).toBe(doc.nodes.length);
      for (const [field, rows] of Object.entries(frame.nodal)) {
        const width = doc.fields[field].length;
        expect(file.nodal[field].length).toBe(rows.length * width);
        rows.forEach((row, i) => expect(file.nodal[field].slice(i * width, (i + 1) * width)).toEqual(row));
      }
      for (const [field, rows] of Object.entries(frame.points ?? {})) {
        expect(file.points?.[field]).toEqual(rows.flat());
      }
    });
  });

  it('ranges per frame bound every component, and the displacement magnitude is √(ux² + uy²)', () => {
    const doc = resultOf(plate());
    const { mesh } = splitResultDocument(doc);
    const last = doc.frames.length - 1;
    const sxx = doc.frames[last].nodal.stress.map((r) => r?.[0] ?? Number.NaN);
    expect(mesh.frames[last].ranges.stress[0]).toEqual([Math.min(...sxx), Math.max(...sxx)]);
    // Closed form: uniform tension σx = 6 MPa (traction over the right edge), so every nodal σx is 6.
    expect(mesh.frames[last].ranges.stress[0][0]).toBeCloseTo(6, 8);
    const mags = doc.frames[last].nodal.displacement.map((r) => Math.hypot(r?.[0] ?? 0, r?.[1] ?? 0));
    expect(mesh.frames[last].displacementMagnitude).toEqual([Math.min(...mags), Math.max(...mags)]);
    // Frame 0 is unloaded: every displacement is zero.
    expect(mesh.frames[0].displacementMagnitude).toEqual([0, 0]);
  });

  it('keeps nulls (no contributing element) and carries each element section', () => {
    const doc = resultOf(tubeCantilever());
    const { mesh, frames } = splitResultDocument(doc);
    expect(doc.elements.every((e) => e.section === 'tube')).toBe(true);
    expect(mesh.sections?.tube).toMatchObject({ kind: 'beam', crossSection: { shape: 'tube', outerDiameter: 2, wallThickness: 0.3 } });
    const last = frames[frames.length - 1];
    // Beam fibres are not averaged to nodes: von Mises is null at every node; each beam element
    // carries it at its governing point instead, in the mesh file's lineElements order.
    expect(last.nodal.vonMises.every((v) => v === null)).toBe(true);
    expect(mesh.lineElements).toEqual([1, 2, 3, 4]);
    const vm = last.lineElements?.vonMises ?? [];
    expect(vm).toEqual(doc.frames[frames.length - 1].lineElements?.vonMises.flat());
    expect(vm.length).toBe(4);
    // The bending moment P (L − x) falls towards the tip, so each element's largest stress does too,
    // and none exceeds the root's outer-fibre stress M c / I.
    for (let k = 1; k < 4; k++) expect(vm[k]!).toBeLessThan(vm[k - 1]!);
    const I = (Math.PI * (2 ** 4 - 1.4 ** 4)) / 64;
    expect(vm[0]!).toBeLessThanOrEqual((1 * 20 * 1) / I);
    expect(vm[0]!).toBeGreaterThan(0.5 * (1 * 20 * 1) / I);
    // The legend range of the frame covers the beam values.
    expect(mesh.frames[frames.length - 1].ranges.vonMises).toEqual([[Math.min(...(vm as number[])), Math.max(...(vm as number[]))]]);
    // Closed form (Euler–Bernoulli cantilever, e.g. Timoshenko & Gere): tip deflection P L³ / (3 E I), I = π (D⁴ − d⁴) / 64.
    const tip = last.nodal.displacement[3 * (doc.nodes.length - 1) + 1];
    expect(tip).toBeCloseTo(-(1 * 20 ** 3) / (3 * 50_000 * I), 3);
  });
});
