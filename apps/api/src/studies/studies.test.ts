/**
 * Studies as fe-core models with library material references: validation with JSON paths before
 * anything is saved, duplicate, soft delete, list filters; and the admin's queue priority.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { templateParamsSchema } from '@phaseloop/shared';
import { createTestApp, RecordingQueue, type TestApp } from '../testing/test-app';

const strip = JSON.parse(readFileSync(new URL('../../../../examples/superelastic-strip.json', import.meta.url), 'utf8')) as { materials: Record<string, unknown> } & Record<string, unknown>;
const [materialName, params] = Object.entries(strip.materials)[0]!;

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

async function setUp() {
  const project = await t.createProject();
  const { client, user } = await t.signIn({ project, role: 'analyst' });
  const material = (await client.post(`/api/projects/${project.id}/materials`).send({ name: 'Demo NiTi', params }).expect(201)).body;
  const model = { ...strip, materials: { [materialName]: { materialVersionId: material.latest.id } } };
  return { project, client, user, model, versionId: material.latest.id as string };
}

describe('studies', () => {
  it('validates the model with library materials resolved, pointing at fields', async () => {
    const { project, client, model } = await setUp();
    const ok = await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Strip', definition: { model } });
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);

    const unknownVersion = { ...model, materials: { [materialName]: { materialVersionId: '00000000-0000-4000-8000-000000000000' } } };
    const bad = await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Strip 2', definition: { model: unknownVersion } }).expect(422);
    expect(bad.body.error.details[0].path).toBe(`definition.model.materials.${materialName}.materialVersionId`);

    const noSegments = { ...model, segments: [] };
    const bad2 = await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Strip 3', definition: { model: noSegments } }).expect(422);
    expect(bad2.body.error.details).toContainEqual({ path: 'definition.model.segments', message: 'a model needs at least one segment' });
  });

  it('refuses invalid template parameters sent directly, naming the field (negative width, zero increments)', async () => {
    const { project, client, model } = await setUp();
    const defaults = templateParamsSchema.parse({ template: 'stent-strut' });
    const good = await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Strut', definition: { model, params: defaults } });
    expect(good.status, JSON.stringify(good.body)).toBe(201);

    const negativeWidth = { ...defaults, strutWidth: -0.1 };
    const bad = await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Strut 2', definition: { model, params: negativeWidth } }).expect(422);
    expect(bad.body.error.details).toContainEqual({ path: 'definition.params.strutWidth', message: expect.stringContaining('strutWidth') });

    const zeroIncrements = { ...defaults, history: defaults.history.map((seg, i) => (i === 0 ? { ...seg, increments: 0 } : seg)) };
    const bad2 = await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Strut 3', definition: { model, params: zeroIncrements } }).expect(422);
    expect(bad2.body.error.details).toContainEqual({ path: 'definition.params.history.0.increments', message: expect.stringContaining('increments') });
  });

  it('duplicates, soft-deletes and filters', async () => {
    const { project, client, model } = await setUp();
    const a = (await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Coupon pull', description: 'tensile', definition: { model } }).expect(201)).body;
    const copy = (await client.post(`/api/studies/${a.id}/duplicate`).send({}).expect(201)).body;
    expect(copy).toMatchObject({ name: 'Coupon pull (copy)', revision: 1, definition: a.definition });
    const copy2 = (await client.post(`/api/studies/${a.id}/duplicate`).send({}).expect(201)).body;
    expect(copy2.name).toBe('Coupon pull (copy 2)');

    const found = (await client.get(`/api/projects/${project.id}/studies?q=copy`).expect(200)).body.items.map((s: { id: string }) => s.id);
    expect(found.sort()).toEqual([copy.id, copy2.id].sort());

    await client.delete(`/api/studies/${copy.id}`).expect(204);
    expect((await client.get(`/api/studies/${copy.id}`)).status).toBe(404);
    expect((await client.post(`/api/studies/${copy.id}/runs`)).status).toBe(404);
    const listed = (await client.get(`/api/projects/${project.id}/studies`).expect(200)).body.items.map((s: { id: string }) => s.id);
    expect(listed).not.toContain(copy.id);
    const withDeleted = (await client.get(`/api/projects/${project.id}/studies?includeDeleted=true`).expect(200)).body.items.map((s: { id: string }) => s.id);
    expect(withDeleted).toContain(copy.id);
  });

  it('freezes solver and materials in the snapshot; an admin moves a queued run to the front', async () => {
    const { project, client, model } = await setUp();
    const study = (await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Queue', definition: { model } }).expect(201)).body;
    const runs: { id: string; snapshot?: unknown }[] = [];
    for (let i = 0; i < 3; i++) runs.push((await client.post(`/api/studies/${study.id}/runs`).expect(201)).body);
    expect(runs[0].snapshot).toBeUndefined();
    const full = (await client.get(`/api/runs/${runs[0].id}`).expect(200)).body;
    expect(full.snapshot.solver).toMatchObject({ name: 'fe-core' });
    expect(full.snapshot.materials[0].params).toMatchObject(params as Record<string, unknown>);

    const before = await Promise.all(runs.map(async (r) => (await client.get(`/api/runs/${r.id}`)).body.queuePosition as number));
    expect(before[1]! - before[0]!).toBe(1);
    expect(before[2]! - before[1]!).toBe(1);
    const queue = t.ctx.queue as RecordingQueue;
    const cancelledBefore = queue.cancelled.length;
    const admin = await t.signIn({ isAdmin: true });
    const moved = (await admin.client.post(`/api/runs/${runs[2].id}/priority`).send({ priority: 10 }).expect(200)).body;
    expect(moved.priority).toBe(10);
    const after = await Promise.all(runs.map(async (r) => (await client.get(`/api/runs/${r.id}`)).body.queuePosition as number));
    expect(after[2]).toBeLessThan(after[0]!);
    expect(after[0]! - before[0]!).toBe(1);
    // pg-boss cannot re-prioritise a waiting job: the old one is cancelled and the run sent again.
    expect(queue.cancelled.length).toBe(cancelledBefore + 1);
    expect(queue.sent.filter((id) => id === runs[2].id)).toHaveLength(2);
    expect((await client.post(`/api/runs/${runs[0].id}/priority`).send({ priority: 1 })).status).toBe(403);
  });

  it('an admin sets the model-size quota; a study over it answers 429 naming the limit', async () => {
    const { project, client, user, model } = await setUp();
    const study = (await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Big', definition: { model } }).expect(201)).body;
    const admin = await t.signIn({ isAdmin: true });
    const patched = (await admin.client.patch(`/api/admin/users/${user.id}`).send({ maxNodes: 20 }).expect(200)).body;
    expect(patched.maxNodes).toBe(20);
    const refused = await client.post(`/api/studies/${study.id}/runs`).expect(429);
    // examples/superelastic-strip.json has 33 nodes.
    expect(refused.body.error.message).toContain('33 nodes');
    expect(refused.body.error.details).toMatchObject({ limit: 'maxNodes', value: 33, max: 20 });
  });
});
