/**
 * The model format: defaults, cross-reference messages with JSON paths, and the committed JSON
 * Schema (docs/model.schema.json) kept in step with the zod schema.
 */
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { modelJsonSchema, parseModel, type ModelInput } from './model';

function base(): ModelInput {
  return {
    format: 'phaseloop-model/1',
    nodes: [
      { id: 1, x: 0, y: 0 },
      { id: 2, x: 1, y: 0 },
      { id: 3, x: 1, y: 1 },
      { id: 4, x: 0, y: 1 },
    ],
    elements: [{ id: 10, type: 'q4', nodes: [1, 2, 3, 4], section: 'plate', material: 'steel' }],
    sections: { plate: { kind: 'continuum', analysis: 'planeStress', thickness: 2 } },
    materials: { steel: { model: 'linear-elastic', E: 200000, nu: 0.3 } },
    nodeSets: { left: [1, 4], right: [2, 3] },
    edgeSets: { right: [{ element: 10, edge: 2 }] },
    supports: [{ type: 'fixed', set: 'left' }],
    loads: [{ type: 'traction', name: 'pull', edgeSet: 'right', direction: [1, 0] }],
    segments: [{ name: 'load', targets: { pull: 10 } }],
  };
}

function issues(m: unknown): string[] {
  const r = parseModel(m);
  return r.ok ? [] : r.issues.map((i) => `${i.path}: ${i.message}`);
}

describe('model format', () => {
  it('accepts a minimal model and fills the defaults', () => {
    const r = parseModel(base());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.model.initialTemperature).toBe(20);
    expect(r.model.segments[0]).toMatchObject({ duration: 1, frames: 'every', increments: { initial: 0.1, min: 1e-4, max: 1, maxIterations: 15 } });
    expect(r.model.output.fields).toContain('displacement');
    expect(r.model.solver.forceTolerance).toBe(1e-6);
  });

  it('reports schema problems with their JSON path', () => {
    const m = base() as Record<string, unknown>;
    (m.elements as { type: string }[])[0].type = 'hex20';
    (m.nodes as { x: unknown }[])[2].x = 'one';
    const found = issues(m);
    expect(found).toContain('elements[0].type: element type must be one of bar2, beam2, t3, q4, q4-eas, q4-bbar, t6, q8');
    expect(found.some((s) => s.startsWith('nodes[2].x: '))).toBe(true);
  });

  it('reports cross-reference problems with their JSON path', () => {
    const m = base();
    m.elements[0].nodes = [1, 2, 3, 12];
    m.elements[0].material = 'titanium';
    m.supports = [{ type: 'fixed', set: 'bottom' }];
    m.segments[0].targets = { push: 1 };
    m.edgeSets = { right: [{ element: 11, edge: 2 }] };
    expect(issues(m)).toEqual(
      expect.arrayContaining([
        'elements[0].nodes[3]: element 10 refers to node 12, which does not exist',
        'elements[0].material: element 10 refers to material "titanium", which is not defined in materials',
        'edgeSets.right[0].element: edge set "right" refers to element 11, which does not exist',
        'supports[0].set: node set "bottom" is not defined in nodeSets',
        'segments[0].targets.push: segment "load" sets a target for load "push", which is not defined in loads',
      ]),
    );
  });

  it('checks node counts, duplicate ids, section kinds and increment bounds', () => {
    const m = base();
    m.elements.push({ id: 10, type: 't6', nodes: [1, 2, 3], section: 'plate', material: 'steel' });
    m.elements.push({ id: 12, type: 'beam2', nodes: [1, 2], section: 'plate', material: 'steel' });
    m.segments[0].increments = { initial: 0.5, min: 0.6, max: 1, maxIterations: 10 };
    const found = issues(m);
    expect(found.some((s) => s.includes('min ≤ initial ≤ max'))).toBe(true);
    const m2 = base();
    m2.elements.push({ id: 10, type: 't6', nodes: [1, 2, 3], section: 'plate', material: 'steel' });
    m2.elements.push({ id: 12, type: 'beam2', nodes: [1, 2], section: 'plate', material: 'steel' });
    expect(issues(m2)).toEqual(
      expect.arrayContaining([
        'elements[1].id: element id 10 is used twice',
        'elements[1].nodes: element 10 (t6) needs 6 nodes, has 3',
        'elements[2].section: element 12 (beam2) needs a beam section, got a continuum section',
      ]),
    );
  });

  it('docs/model.schema.json is the current JSON Schema (regenerate: npx tsx packages/fe-core/src/cli/write-model-schema.ts)', () => {
    const file = resolve(dirname(fileURLToPath(import.meta.url)), '../../../docs/model.schema.json');
    const committed = JSON.parse(readFileSync(file, 'utf8'));
    expect(committed).toEqual(JSON.parse(JSON.stringify(modelJsonSchema())));
  });
});
