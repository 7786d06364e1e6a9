/**
 * Gmsh .msh import (ASCII 2.2 and 4.1), with small meshes written by hand: physical groups to
 * sets, orientation, quadratic elements, and messages that name the offending line. Imported
 * meshes are solved under uniform tension: every element type used here reproduces the uniform
 * stress state exactly (patch test), so the end displacement is σL/E.
 */
import { describe, expect, it } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { buildProblem } from '../assembly/problem';
import { runAnalysis } from '../solve/nonlinear/driver';
import { GmshFormatError, parseGmsh, type GmshMesh } from './gmsh';

const msh = (...lines: string[]) => lines.join('\n') + '\n';

/** 2 × 1 mm rectangle of two 4-node quadrilaterals; groups left, right (curves), plate, corner. */
const RECT_22 = msh(
  '$MeshFormat',
  '2.2 0 8',
  '$EndMeshFormat',
  '$PhysicalNames',
  '4',
  '0 4 "corner"',
  '1 1 "left"',
  '1 2 "right"',
  '2 3 "plate"',
  '$EndPhysicalNames',
  '$Nodes',
  '6',
  '1 0 0 0',
  '2 1 0 0',
  '3 2 0 0',
  '4 2 1 0',
  '5 1 1 0',
  '6 0 1 0',
  '$EndNodes',
  '$Elements',
  '5',
  '1 15 2 4 1 1',
  '2 1 2 1 4 6 1',
  '3 1 2 2 2 3 4',
  '4 3 2 3 1 1 2 5 6',
  '5 3 2 3 1 2 3 4 5',
  '$EndElements',
);

/** The same rectangle in format 4.1; the second quadrilateral is listed clockwise. */
const RECT_41 = msh(
  '$MeshFormat',
  '4.1 0 8',
  '$EndMeshFormat',
  '$PhysicalNames',
  '3',
  '1 1 "left"',
  '1 2 "right"',
  '2 3 "plate"',
  '$EndPhysicalNames',
  '$Entities',
  '0 2 1 0',
  '1 0 0 0 0 1 0 1 1 0',
  '2 2 0 0 2 1 0 1 2 0',
  '1 0 0 0 2 1 0 1 3 0',
  '$EndEntities',
  '$Nodes',
  '1 6 1 6',
  '2 1 0 6',
  '1',
  '2',
  '3',
  '4',
  '5',
  '6',
  '0 0 0',
  '1 0 0',
  '2 0 0',
  '2 1 0',
  '1 1 0',
  '0 1 0',
  '$EndNodes',
  '$Elements',
  '3 4 1 4',
  '1 1 1 1',
  '1 6 1',
  '1 2 1 1',
  '2 3 4',
  '2 1 3 2',
  '3 1 2 5 6',
  '4 2 5 4 3',
  '$EndElements',
);

/** Unit square: two 6-node triangles or one 9-node quadrilateral, with 3-node boundary lines. */
const SQUARE_NODES = ['$Nodes', '9', '1 0 0 0', '2 1 0 0', '3 1 1 0', '4 0 1 0', '5 0.5 0 0', '6 1 0.5 0', '7 0.5 1 0', '8 0 0.5 0', '9 0.5 0.5 0', '$EndNodes'];
const square = (...elements: string[]) =>
  msh(
    '$MeshFormat',
    '2.2 0 8',
    '$EndMeshFormat',
    '$PhysicalNames',
    '2',
    '1 1 "left"',
    '1 2 "right"',
    '$EndPhysicalNames',
    ...SQUARE_NODES,
    '$Elements',
    String(elements.length + 2),
    '1 8 2 1 1 4 1 8',
    '2 8 2 2 2 2 3 6',
    ...elements,
    '$EndElements',
  );
const SQUARE_T6 = square('3 9 2 0 1 1 2 3 5 6 9', '4 9 2 0 1 1 3 4 9 7 8');
const SQUARE_Q9 = square('3 10 2 0 1 1 2 3 4 5 6 7 8 9');

/** Uniform tension σ on the right edge, left edge held in x, one node held in y. */
function pullRight(mesh: GmshMesh, holdY: number, sigma: number, E: number): number {
  const groups = [...new Set(mesh.elements.map((e) => e.material))];
  const model: ModelInput = {
    format: 'phaseloop-model/1',
    nodes: mesh.nodes,
    elements: mesh.elements,
    nodeSets: { ...mesh.nodeSets, holdY: [holdY] },
    edgeSets: mesh.edgeSets,
    sections: Object.fromEntries(groups.map((g) => [g, { kind: 'continuum', analysis: 'planeStress', thickness: 1 }])),
    materials: Object.fromEntries(groups.map((g) => [g, { model: 'linear-elastic', E, nu: 0.3 }])),
    supports: [
      { type: 'fixed', set: 'left', dofs: ['ux'] },
      { type: 'fixed', set: 'holdY', dofs: ['uy'] },
    ],
    loads: [{ type: 'traction', name: 'pull', edgeSet: 'right', direction: [1, 0] }],
    segments: [{ name: 'pull', targets: { pull: sigma }, increments: { initial: 1, min: 0.1, max: 1 } }],
    output: { fields: ['displacement'], points: [], reactionSums: [{ name: 'left', set: 'left' }], integrationPoints: false },
  };
  const parsed = parseModel(model);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  const problem = buildProblem(parsed.model);
  const result = runAnalysis(problem);
  expect(result.status).toBe('succeeded');
  const last = result.frames[result.frames.length - 1];
  expect(last.history['left.Fx']).toBeCloseTo(-sigma * 1, 9);
  const rightNode = problem.nodeIndex.get(mesh.nodeSets.right[0])!;
  return last.displacement[3 * rightNode];
}

describe('Gmsh import, format 2.2', () => {
  it('reads nodes, quadrilaterals and physical groups as node, edge and element sets', () => {
    const mesh = parseGmsh(RECT_22);
    expect(mesh.version).toBe('2.2');
    expect(mesh.nodes).toHaveLength(6);
    expect(mesh.elements.map((e) => [e.id, e.type, e.nodes, e.material])).toEqual([
      [4, 'q4', [1, 2, 5, 6], 'plate'],
      [5, 'q4', [2, 3, 4, 5], 'plate'],
    ]);
    expect(mesh.nodeSets).toEqual({ corner: [1], left: [1, 6], right: [3, 4], plate: [1, 2, 3, 4, 5, 6] });
    // Left line 6–1 is edge 4 (corner 4 → corner 1) of element 4; right line 3–4 is edge 2 of element 5.
    expect(mesh.edgeSets).toEqual({ left: [{ element: 4, edge: 4 }], right: [{ element: 5, edge: 2 }] });
    expect(mesh.elementSets).toEqual({ plate: [4, 5] });
    expect(mesh.warnings).toEqual([]);
  });

  it('solves: uniform tension gives u = σL/E at the loaded edge (closed form)', () => {
    const E = 70000;
    const u = pullRight(parseGmsh(RECT_22, { quadType: 'q4-eas' }), 1, 50, E);
    expect(u).toBeCloseTo((50 * 2) / E, 12);
  });

  it('6-node triangles and 9-node quadrilaterals (imported as q8) with 3-node boundary lines', () => {
    const t6 = parseGmsh(SQUARE_T6);
    expect(t6.elements.map((e) => e.type)).toEqual(['t6', 't6']);
    expect(t6.elements[1].nodes).toEqual([1, 3, 4, 9, 7, 8]);
    expect(t6.nodeSets.right).toEqual([2, 3, 6]);
    expect(t6.edgeSets.right).toEqual([{ element: 3, edge: 2 }]);
    // Physical tag 0 = in no group: such elements get the section and material name "default".
    expect(t6.elements[0].material).toBe('default');
    const q9 = parseGmsh(SQUARE_Q9);
    expect(q9.elements[0]).toMatchObject({ type: 'q8', nodes: [1, 2, 3, 4, 5, 6, 7, 8] });
    expect(q9.warnings.join(' ')).toMatch(/nine-node quadrilaterals were imported as eight-node/);
    expect(q9.warnings.join(' ')).toMatch(/1 nodes that no element uses/);
    const E = 100000;
    expect(pullRight(t6, 1, 20, E)).toBeCloseTo(20 / E, 12);
    expect(pullRight(q9, 1, 20, E)).toBeCloseTo(20 / E, 12);
  });

  it('a mesh of lines only becomes bar elements', () => {
    const text = msh('$MeshFormat', '2.2 0 8', '$EndMeshFormat', '$Nodes', '3', '1 0 0 0', '2 5 0 0', '3 10 0 0', '$EndNodes', '$Elements', '2', '1 1 2 7 1 1 2', '2 1 2 7 1 2 3', '$EndElements');
    const mesh = parseGmsh(text);
    expect(mesh.elements.map((e) => [e.type, e.nodes, e.section])).toEqual([
      ['bar2', [1, 2], 'curve7'],
      ['bar2', [2, 3], 'curve7'],
    ]);
    expect(mesh.nodeSets.curve7).toEqual([1, 2, 3]);
  });
});

describe('Gmsh import, format 4.1', () => {
  it('reads entity blocks, physical tags of entities, and turns clockwise elements round', () => {
    const mesh = parseGmsh(RECT_41);
    expect(mesh.version).toBe('4.1');
    expect(mesh.elements.map((e) => [e.id, e.nodes])).toEqual([
      [3, [1, 2, 5, 6]],
      [4, [2, 3, 4, 5]],
    ]);
    expect(mesh.nodeSets).toEqual({ left: [1, 6], right: [3, 4], plate: [1, 2, 3, 4, 5, 6] });
    expect(mesh.edgeSets.right).toEqual([{ element: 4, edge: 2 }]);
    const E = 70000;
    expect(pullRight(mesh, 1, 50, E)).toBeCloseTo((50 * 2) / E, 12);
  });

  it('skips sections it does not need and reads parametric node blocks', () => {
    const l = RECT_41.trimEnd().split('\n');
    // Parametric block: each coordinate line carries x y z then the parametric u.
    const coords = l.slice(24, 30).map((c) => `${c} 0.5`);
    const text = [...l.slice(0, 15), '$Comments', 'made by hand', '$EndComments', ...l.slice(15, 17), '2 1 1 6', ...l.slice(18, 24), ...coords, ...l.slice(30)].join('\n');
    const mesh = parseGmsh(text);
    expect(mesh.nodes).toEqual(parseGmsh(RECT_41).nodes);
    expect(mesh.edgeSets).toEqual(parseGmsh(RECT_41).edgeSets);
  });

  it('gives the same model as the 2.2 file', () => {
    const a = parseGmsh(RECT_22);
    const b = parseGmsh(RECT_41);
    expect(b.nodes).toEqual(a.nodes);
    expect(b.elements.map((e) => e.nodes)).toEqual(a.elements.map((e) => e.nodes));
  });
});

describe('bad .msh files: the message names the line and what was expected', () => {
  const failure = (text: string): GmshFormatError => {
    try {
      parseGmsh(text);
    } catch (e) {
      expect(e).toBeInstanceOf(GmshFormatError);
      return e as GmshFormatError;
    }
    throw new Error('the file was accepted');
  };
  const lines22 = RECT_22.trimEnd().split('\n');
  const edit = (lineNo: number, text: string | null) => {
    const copy = lines22.slice();
    if (text === null) copy.splice(lineNo - 1, 1);
    else copy[lineNo - 1] = text;
    return copy.join('\n');
  };

  it('not a mesh file', () => {
    const e = failure('solid cube\nfacet normal 0 0 1\n');
    expect(e.line).toBe(1);
    expect(e.message).toMatch(/^line 1: expected \$MeshFormat/);
  });

  it('binary or unknown version', () => {
    expect(failure(edit(2, '2.2 1 8')).message).toBe('line 2: binary .msh files are not supported: export as ASCII (file type 0)');
    expect(failure(edit(2, '3.0 0 8')).message).toMatch(/^line 2: expected format version 2\.2 or 4\.1, found "3\.0"/);
  });

  it('a node count larger than the nodes listed', () => {
    // Line 12 announces the node count; the 7th "node" read is $EndNodes on line 19.
    const e = failure(edit(12, '7'));
    expect(e.line).toBe(19);
    expect(e.message).toBe('line 19: expected a node "tag x y z", found "$EndNodes"');
  });

  it('a node count smaller than the nodes listed', () => {
    const e = failure(edit(12, '5'));
    expect(e.message).toBe('line 18: expected $EndNodes, found "6 0 1 0" (a count earlier in the section may be wrong)');
  });

  it('a node out of the x–y plane', () => {
    const e = failure(edit(17, '5 1 1 0.5'));
    expect(e.line).toBe(17);
    expect(e.message).toMatch(/node 5 has z = 0\.5 while earlier nodes have z = 0: only flat meshes/);
  });

  it('an element with a missing node, a wrong node count, a non-number, an unsupported type', () => {
    expect(failure(edit(25, '4 3 2 3 1 1 2 5 60')).message).toBe('line 25: element 4 refers to node 60, which is not in $Nodes');
    expect(failure(edit(25, '4 3 2 3 1 1 2 5')).message).toBe('line 25: expected 9 numbers for element 4 (4-node quadrilateral with 2 tags), found 8');
    expect(failure(edit(26, '5 3 2 3 1 2 x 4 5')).message).toBe('line 26: expected an element "tag type tag-count tags… nodes…", found "x" (not an integer)');
    expect(failure(edit(26, '5 4 2 3 1 2 3 4 5')).message).toMatch(/^line 26: element type 4 is not supported/);
  });

  it('a truncated file and a bad physical name', () => {
    const truncated = lines22.slice(0, 24).join('\n');
    expect(failure(truncated).message).toBe('line 24: the file ends where an element "tag type tag-count tags… nodes…" was expected');
    expect(failure(edit(6, '0 4 corner')).message).toBe('line 6: expected a physical name as: dimension tag "name", found "0 4 corner"');
  });

  it('4.1: a block count that does not add up, and a line that is no element edge', () => {
    const l41 = RECT_41.trimEnd().split('\n');
    const wrong = l41.slice();
    wrong[32] = '3 5 1 4';
    expect(failure(wrong.join('\n')).message).toBe('line 33: the header announced 5 elements, the blocks hold 4');
    const stray = l41.slice();
    stray[34] = '1 1 5';
    expect(failure(stray.join('\n')).message).toBe('line 35: line element 1 (nodes 1, 5) is not an edge of any 2D element');
  });
});
