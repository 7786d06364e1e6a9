/**
 * Mesh upload: Gmsh .msh 2.2 and 4.1 files (fixtures written by hand) become stored meshes whose
 * physical groups are named sets; bad files are refused naming the line, nothing half-stored; size
 * limit; roles. A study built on an uploaded mesh is checked by solving it under uniform tension.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { buildMeshModel, meshStudySettingsSchema, parseModel, type MeshDetail } from '@phaseloop/shared';
import { buildProblem, runAnalysis } from '@phaseloop/fe-core';
import { createTestApp, type TestApp } from '../testing/test-app';
import type { Project } from '../projects/projects.model';
import type { Client } from '../testing/test-app';

const fixture = (name: string) => readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8');
const STRIP_22 = fixture('strip-2.2.msh');
const REGIONS_41 = fixture('two-regions-4.1.msh');
/** Small enough to test the refusal with a few kilobytes; the fixtures are far below it. */
const LIMIT = 8 * 1024;

let t: TestApp;
let project: Project;
let analyst: Client;
beforeAll(async () => {
  t = await createTestApp({ config: { MESH_MAX_BYTES: LIMIT } });
  project = await t.createProject('Meshes');
  analyst = (await t.signIn({ project, role: 'analyst' })).client;
});
afterAll(async () => {
  await t?.close();
});

const upload = (client: Client, projectId: string, text: string | Buffer, fileName: string) =>
  client.post(`/api/projects/${projectId}/meshes`).attach('file', Buffer.isBuffer(text) ? text : Buffer.from(text), fileName);

async function meshCount(): Promise<number> {
  return Number((await t.ctx.pool.query<{ n: string }>('SELECT count(*) AS n FROM meshes WHERE project_id = $1', [project.id])).rows[0]!.n);
}

describe('mesh upload', () => {
  it('reads a 2.2 file: counts, element types, bounding box, physical groups as named sets', async () => {
    const res = await upload(analyst, project.id, STRIP_22, 'strip-2.2.msh').field('name', 'Strip 4 × 1');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    // The fixture is a 4 × 1 mm strip of 4 × 2 quadrilaterals on a 5 × 3 grid of nodes.
    expect(res.body).toMatchObject({
      name: 'Strip 4 × 1', fileName: 'strip-2.2.msh', format: '2.2', nodeCount: 15, elementCount: 8,
      elementTypes: { q4: 8 }, bounds: { minX: 0, maxX: 4, minY: 0, maxY: 1 }, warnings: [],
    });
    expect(res.body.groups).toEqual([
      { name: 'corner', kind: 'point', nodes: 1, edges: 0, elements: 0 },
      { name: 'left', kind: 'curve', nodes: 3, edges: 2, elements: 0 },
      { name: 'right', kind: 'curve', nodes: 3, edges: 2, elements: 0 },
      { name: 'strip', kind: 'surface', nodes: 15, edges: 0, elements: 8 },
    ]);

    const detail = (await analyst.get(`/api/meshes/${res.body.id}`).expect(200)).body as MeshDetail;
    expect(detail.mesh.nodes).toHaveLength(15);
    expect(detail.mesh.nodeSets.left).toEqual([1, 6, 11]);
    expect(new Set(detail.mesh.elements.map((e) => e.material))).toEqual(new Set(['strip']));
    const listed = (await analyst.get(`/api/projects/${project.id}/meshes`).expect(200)).body.items as { id: string; mesh?: unknown }[];
    expect(listed.map((m) => m.id)).toContain(res.body.id);
    expect(listed[0]!.mesh).toBeUndefined();
  });

  it('reads a 4.1 file with two surface groups (two material regions) of triangles', async () => {
    const res = await upload(analyst, project.id, REGIONS_41, 'two-regions-4.1.msh');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ name: 'two-regions-4.1', format: '4.1', nodeCount: 6, elementCount: 4, elementTypes: { t3: 4 }, bounds: { minX: 0, maxX: 2, minY: 0, maxY: 1 } });
    const surfaces = (res.body.groups as { name: string; kind: string; elements: number }[]).filter((g) => g.kind === 'surface');
    expect(surfaces).toEqual([expect.objectContaining({ name: 'core', elements: 2 }), expect.objectContaining({ name: 'skin', elements: 2 })]);
  });

  it('refuses a bad file with 400 naming the line, and stores nothing', async () => {
    const before = await meshCount();
    const lines = STRIP_22.split('\n');
    const at = lines.indexOf('8 2 0.5 0');
    lines[at] = '8 2 0.5';
    const res = await upload(analyst, project.id, lines.join('\n'), 'broken.msh').expect(400);
    expect(res.body.error.code).toBe('bad_request');
    expect(res.body.error.message).toContain(`line ${at + 1}:`);
    expect(res.body.error.message).toContain('broken.msh');
    expect(res.body.error.details).toEqual([expect.objectContaining({ path: 'file', line: at + 1 })]);

    // Binary data where the parser does not look (a section it skips) is refused before the insert.
    const withNul = `${STRIP_22}$Comments\nabc\u0000def\n$EndComments\n`;
    const nul = await upload(analyst, project.id, withNul, 'nul.msh').expect(400);
    expect(nul.body.error.message).toContain(`line ${STRIP_22.split('\n').length + 1}:`);

    const notMesh = await upload(analyst, project.id, 'x,y\n1,2\n', 'points.csv').expect(400);
    expect(notMesh.body.error.message).toContain('.msh');
    const missing = await analyst.post(`/api/projects/${project.id}/meshes`).field('name', 'nothing').expect(422);
    expect(missing.body.error.details).toEqual([{ path: 'file', message: 'required' }]);
    expect(await meshCount()).toBe(before);
  });

  it('refuses a file over the size limit with 413 naming the limit', async () => {
    const before = await meshCount();
    const big = STRIP_22 + `$Comments\n${'x'.repeat(LIMIT)}\n$EndComments\n`;
    const res = await upload(analyst, project.id, big, 'big.msh').expect(413);
    expect(res.body.error.message).toContain('8 KB');
    expect(await meshCount()).toBe(before);
  });

  it('viewers read but may not upload; non-members get 404 everywhere', async () => {
    const viewer = (await t.signIn({ project, role: 'viewer' })).client;
    const outsider = (await t.signIn({ project: await t.createProject('Elsewhere'), role: 'admin' })).client;
    const stored = (await upload(analyst, project.id, STRIP_22, 'strip.msh').expect(201)).body as { id: string };

    const refused = await upload(viewer, project.id, STRIP_22, 'strip.msh').expect(403);
    expect(refused.body.error.code).toBe('forbidden');
    await viewer.get(`/api/meshes/${stored.id}`).expect(200);
    await viewer.get(`/api/projects/${project.id}/meshes`).expect(200);

    await upload(outsider, project.id, STRIP_22, 'strip.msh').expect(404);
    await outsider.get(`/api/meshes/${stored.id}`).expect(404);
    await outsider.get(`/api/projects/${project.id}/meshes`).expect(404);
  });

  it('a study built on the uploaded mesh is saved, and solves to the closed form of uniform tension', async () => {
    const mesh = (await upload(analyst, project.id, STRIP_22, 'strip.msh').expect(201)).body as { id: string };
    const detail = (await analyst.get(`/api/meshes/${mesh.id}`).expect(200)).body as MeshDetail;
    const E = 60_000;
    const material = (await analyst.post(`/api/projects/${project.id}/materials`).send({ name: 'Elastic demo', params: { model: 'linear-elastic', E, nu: 0.3 } }).expect(201)).body;
    const settings = meshStudySettingsSchema.parse({
      meshId: mesh.id, analysis: 'planeStress', thickness: 0.5, quadType: 'q4-eas', regionMaterials: { strip: material.id },
      conditions: [{ group: 'left', kind: 'fixed-x' }, { group: 'corner', kind: 'fixed-y' }, { group: 'right', kind: 'displacement-x', value: 0.04 }],
      initialTemperature: 20, history: [{ name: 'pull', load: 1, increments: 2 }],
    });
    const model = buildMeshModel(detail.mesh, settings, { strip: { materialVersionId: material.latest.id as string } }, 'strip');
    const saved = await analyst.post(`/api/projects/${project.id}/studies`).send({ name: 'Strip on a mesh', definition: { mesh: settings, model } });
    expect(saved.status, JSON.stringify(saved.body)).toBe(201);
    const listed = (await analyst.get(`/api/projects/${project.id}/studies`).expect(200)).body.items as { id: string; template: string }[];
    expect(listed.find((s) => s.id === saved.body.id)?.template).toBe('mesh');

    // The same document with the material inline, solved here: ε = 0.04 / 4, σ = Eε over the
    // 1 mm × 0.5 mm section, so the fixed edge carries F = −E·ε·A (uniform stress, exact for Q4-EAS).
    const parsed = parseModel(buildMeshModel(detail.mesh, settings, { strip: { model: 'linear-elastic', E, nu: 0.3 } }));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    const result = runAnalysis(buildProblem(parsed.model));
    expect(result.status).toBe('succeeded');
    const last = result.frames[result.frames.length - 1]!;
    expect(last.history['left.Fx']).toBeCloseTo(-E * (0.04 / 4) * 1 * 0.5, 6);
  });

  it('refuses mesh settings sent directly with zero increments or a mesh of another project, naming the field', async () => {
    const mesh = (await upload(analyst, project.id, STRIP_22, 'strip.msh').expect(201)).body as { id: string };
    const detail = (await analyst.get(`/api/meshes/${mesh.id}`).expect(200)).body as MeshDetail;
    const material = (await analyst.post(`/api/projects/${project.id}/materials`).send({ name: 'Elastic demo 2', params: { model: 'linear-elastic', E: 60_000, nu: 0.3 } }).expect(201)).body;
    const raw = {
      meshId: mesh.id, analysis: 'planeStress', thickness: 0.5, quadType: 'q4-eas', regionMaterials: { strip: material.id },
      conditions: [{ group: 'left', kind: 'fixed-x' }, { group: 'corner', kind: 'fixed-y' }, { group: 'right', kind: 'displacement-x', value: 0.04 }],
      initialTemperature: 20, history: [{ name: 'pull', load: 1, increments: 2 }],
    };
    const model = buildMeshModel(detail.mesh, meshStudySettingsSchema.parse(raw), { strip: { materialVersionId: material.latest.id as string } }, 'strip');
    const zero = await analyst.post(`/api/projects/${project.id}/studies`)
      .send({ name: 'Zero increments', definition: { mesh: { ...raw, history: [{ name: 'pull', load: 1, increments: 0 }] }, model } });
    expect(zero.status).toBe(422);
    expect(zero.body.error.details).toContainEqual({ path: 'definition.mesh.history.0.increments', message: 'increments must be ≥ 1' });

    const other = await t.createProject('Other meshes');
    const otherAnalyst = (await t.signIn({ project: other, role: 'analyst' })).client;
    const foreign = (await upload(otherAnalyst, other.id, STRIP_22, 'foreign.msh').expect(201)).body as { id: string };
    const wrong = await analyst.post(`/api/projects/${project.id}/studies`).send({ name: 'Foreign mesh', definition: { mesh: { ...raw, meshId: foreign.id }, model } });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.details).toContainEqual({ path: 'definition.mesh.meshId', message: `unknown mesh ${foreign.id}` });
  });
});
