/**
 * The model document of a study on an uploaded mesh: it passes the model checks, driven
 * conditions follow value × load factor, the chosen Q4 formulation replaces plain q4, and the
 * set-up problems the schema cannot see are reported by field.
 */
import { describe, expect, it } from 'vitest';
import { buildMeshModel, meshGroups, meshSettingsIssues, meshStudySettingsSchema, type MeshPartData } from './meshes';
import { parseModel } from './model';

/** Two unit squares side by side: a q4 in region "a" and two t3 outside every group ("default"). */
const MESH: MeshPartData = {
  nodes: [
    { id: 1, x: 0, y: 0 }, { id: 2, x: 1, y: 0 }, { id: 3, x: 2, y: 0 },
    { id: 4, x: 2, y: 1 }, { id: 5, x: 1, y: 1 }, { id: 6, x: 0, y: 1 },
  ],
  elements: [
    { id: 1, type: 'q4', nodes: [1, 2, 5, 6], section: 'a', material: 'a' },
    { id: 2, type: 't3', nodes: [2, 3, 4], section: 'default', material: 'default' },
    { id: 3, type: 't3', nodes: [2, 4, 5], section: 'default', material: 'default' },
  ],
  nodeSets: { left: [1, 6], right: [3, 4], a: [1, 2, 5, 6] },
  edgeSets: { left: [{ element: 1, edge: 4 }], right: [{ element: 2, edge: 2 }] },
  elementSets: { a: [1] },
};

const settings = (over: Record<string, unknown> = {}) =>
  meshStudySettingsSchema.parse({
    meshId: '00000000-0000-4000-8000-000000000001', quadType: 'q4-bbar', regionMaterials: { a: 'm1', default: 'm2' },
    conditions: [{ group: 'left', kind: 'fixed-xy' }, { group: 'right', kind: 'displacement-x', value: 0.05 }],
    history: [{ name: 'up', load: 1, increments: 4 }, { name: 'half', load: 0.5, increments: 2 }, { name: 'hold', temperature: 60, increments: 1 }],
    ...over,
  });

describe('studies on an uploaded mesh', () => {
  it('builds a model that passes the model checks, with value × load factor as targets', () => {
    const elastic = { model: 'linear-elastic' as const, E: 50_000, nu: 0.3 };
    const model = buildMeshModel(MESH, settings(), { a: elastic, default: elastic });
    const parsed = parseModel(model);
    expect(parsed.ok, JSON.stringify(parsed.ok ? '' : parsed.issues)).toBe(true);
    expect(model.elements.map((e) => e.type)).toEqual(['q4-bbar', 't3', 't3']);
    expect(Object.keys(model.sections).sort()).toEqual(['a', 'default']);
    expect(model.supports).toEqual([{ type: 'fixed', set: 'left', dofs: ['ux', 'uy'] }]);
    const load = model.loads[0]!.name;
    expect(model.segments.map((s) => s.targets[load])).toEqual([0.05, 0.025, undefined]);
    expect(model.segments[2]!.temperature).toBe(60);
    // "At least n increments": no increment may exceed 1/n of its segment.
    expect(model.segments.map((s) => s.increments.max)).toEqual([1 / 4, 1 / 2, 1]);
  });

  it('names the set-up problems: region without material, unknown group, negative radius', () => {
    const issues = meshSettingsIssues(MESH, settings({ regionMaterials: { a: 'm1' }, conditions: [{ group: 'top', kind: 'fixed-y' }] }));
    expect(issues['regionMaterials.default']).toContain('default');
    expect(issues['conditions.0.group']).toContain('"top"');
    const shifted = { ...MESH, nodes: MESH.nodes.map((n) => ({ ...n, x: n.x - 1 })) };
    expect(meshSettingsIssues(shifted, settings({ analysis: 'axisymmetric' })).analysis).toContain('x = -1');
    expect(meshSettingsIssues(MESH, settings())).toEqual({});
  });

  it('refuses zero increments and a negative thickness by field', () => {
    const bad = meshStudySettingsSchema.safeParse({ ...settings(), thickness: -1, history: [{ name: 'up', load: 1, increments: 0 }] });
    expect(bad.success).toBe(false);
    const byPath = Object.fromEntries((bad.error?.issues ?? []).map((i) => [i.path.join('.'), i.message]));
    expect(byPath).toMatchObject({ thickness: 'thickness must be > 0 mm', 'history.0.increments': 'increments must be ≥ 1' });
  });

  it('tells the kind of each group from the sets it produced', () => {
    expect(meshGroups(MESH).map((g) => [g.name, g.kind])).toEqual([['a', 'surface'], ['left', 'curve'], ['right', 'curve']]);
  });
});
