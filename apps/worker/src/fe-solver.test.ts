/**
 * The real solver in its thread leaves, besides RESULT.json, the split result files: a mesh file
 * and one file per frame whose values are RESULT.json's own. No database is needed: the hooks
 * collect what the worker would store.
 */
import { describe, expect, it } from 'vitest';
import { RESULT_FRAME_FORMAT, RESULT_MESH_FILE, RESULT_MESH_FORMAT, type ResultFrameFile, type ResultMesh } from '@phaseloop/fe-core/output/split';
import type { ResultDocument } from '@phaseloop/fe-core';
import { createFeCoreSolver } from './fe-solver';
import type { OutputFile, RunSnapshotForSolver } from './solver';

/** A steel bar of 4 elements pulled at its end in two increments (demo values). */
const model = {
  format: 'phaseloop-model/1',
  nodes: [0, 1, 2, 3, 4].map((i) => ({ id: i + 1, x: 5 * i, y: 0 })),
  elements: [0, 1, 2, 3].map((i) => ({ id: i + 1, type: 'bar2', nodes: [i + 1, i + 2], section: 'wire', material: 'm' })),
  sections: { wire: { kind: 'bar', area: 0.5 } },
  materials: { m: { model: 'linear-elastic', E: 200_000, nu: 0.3 } },
  nodeSets: { start: [1], end: [5], all: [1, 2, 3, 4, 5] },
  supports: [{ type: 'fixed', set: 'start' }, { type: 'fixed', set: 'all', dofs: ['uy'] }],
  loads: [{ type: 'force', name: 'pull', set: 'end', dof: 'fx' }],
  segments: [{ name: 'pull', targets: { pull: 100 }, increments: { initial: 0.5, min: 0.1, max: 0.5 } }],
  output: { fields: ['displacement', 'stress', 'vonMises'], points: [], reactionSums: [], integrationPoints: false },
};

const snapshot: RunSnapshotForSolver = {
  study: { id: 's', name: 'split files', revision: 1, definition: { model } },
  materials: [],
  solverVersion: 'test',
};

function parse<T>(file: OutputFile | undefined): T {
  expect(file, 'file stored').toBeDefined();
  return JSON.parse(new TextDecoder().decode(file!.bytes)) as T;
}

describe('fe-core solver output files', () => {
  it('writes result-mesh.json and one result-frame file per frame equal to RESULT.json', async () => {
    const solver = createFeCoreSolver();
    const outcome = await solver.solve(snapshot, { onIteration: () => {}, onFrame: async () => {}, shouldStop: () => false });
    expect(outcome.kind, outcome.message).toBe('succeeded');
    const files = new Map((outcome.files ?? []).map((f) => [f.name, f]));
    const doc = parse<ResultDocument>(files.get('result.json'));
    const mesh = parse<ResultMesh>(files.get(RESULT_MESH_FILE));
    expect(mesh.format).toBe(RESULT_MESH_FORMAT);
    expect(mesh.nodes).toEqual(doc.nodes);
    expect(mesh.elements.map((e) => e.section)).toEqual(['wire', 'wire', 'wire', 'wire']);
    expect(mesh.sections?.wire).toEqual({ kind: 'bar', area: 0.5 });
    // Frame 0 (unloaded) and two increments.
    expect(doc.frames.length).toBe(3);
    expect(mesh.frames.length).toBe(doc.frames.length);
    const frameFiles = [...files.keys()].filter((n) => /^result-frame-\d+\.json$/.test(n));
    expect(frameFiles.length).toBe(doc.frames.length);
    doc.frames.forEach((frame, k) => {
      const f = parse<ResultFrameFile>(files.get(mesh.frames[k]!.file));
      expect(f.format).toBe(RESULT_FRAME_FORMAT);
      expect(f.index).toBe(frame.index);
      expect(f.nodal.displacement).toEqual(frame.nodal.displacement!.flat());
      expect(f.nodal.vonMises).toEqual(frame.nodal.vonMises!.flat());
    });
    // Closed form (axial bar): tip displacement of the last frame F L / (E A) = 100 · 20 / (200 000 · 0.5).
    const last = parse<ResultFrameFile>(files.get(mesh.frames[2]!.file));
    expect(last.nodal.displacement![3 * 4]).toBeCloseTo(0.02, 10);
  }, 60_000);
});
