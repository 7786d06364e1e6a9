/**
 * Material library over the API: the project list carries each material's latest version (number,
 * id, status, who changed it last), drafts get reviewed by someone other than their author, and
 * refusals name the field at fault.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../testing/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

const elastic = { model: 'linear-elastic', E: 60_000, nu: 0.3 };

describe('material library', () => {
  it('lists each material with its latest version id, status and who changed it last', async () => {
    const project = await t.createProject();
    const analyst = await t.signIn({ project, role: 'analyst', name: 'Ann Lyst' });
    const reviewer = await t.signIn({ project, role: 'reviewer', name: 'Rev Iewer' });
    const created = (await analyst.client.post(`/api/projects/${project.id}/materials`).send({ name: 'Wire alloy', params: elastic }).expect(201)).body;
    await analyst.client.post(`/api/projects/${project.id}/materials`).send({ name: 'Another alloy', params: { ...elastic, E: 40_000 } }).expect(201);

    let items = (await reviewer.client.get(`/api/projects/${project.id}/materials`).expect(200)).body.items;
    expect(items.map((m: { name: string }) => m.name)).toEqual(['Another alloy', 'Wire alloy']);
    expect(items[1]).toMatchObject({ id: created.id, version: 1, latestVersionId: created.latest.id, status: 'draft', model: 'linear-elastic', updatedByName: 'Ann Lyst' });

    const v2 = (await analyst.client.post(`/api/materials/${created.id}/versions`).send({ params: { ...elastic, E: 65_000 }, notes: 'stiffer' }).expect(201)).body;
    expect(v2).toMatchObject({ version: 2, status: 'draft', createdByName: 'Ann Lyst', reviewedByName: null });
    const approved = (await reviewer.client.post(`/api/material-versions/${v2.id}/review`).send({ decision: 'approve' }).expect(200)).body;
    expect(approved).toMatchObject({ status: 'approved', reviewedBy: reviewer.user.id, reviewedByName: 'Rev Iewer' });

    items = (await analyst.client.get(`/api/projects/${project.id}/materials`).expect(200)).body.items;
    expect(items[1]).toMatchObject({ version: 2, latestVersionId: v2.id, status: 'approved', updatedByName: 'Rev Iewer' });
    const detail = (await analyst.client.get(`/api/materials/${created.id}`).expect(200)).body;
    expect(detail.versions.map((v: { version: number; status: string }) => [v.version, v.status])).toEqual([[2, 'approved'], [1, 'draft']]);
    expect(detail.versions[0]).toMatchObject({ createdByName: 'Ann Lyst', reviewedByName: 'Rev Iewer' });
  });

  it('lets reviewers and admins decide on a draft, and refuses analysts, viewers and reasonless rejections', async () => {
    const project = await t.createProject();
    const analyst = await t.signIn({ project, role: 'analyst' });
    const reviewer = await t.signIn({ project, role: 'reviewer' });
    const viewer = await t.signIn({ project, role: 'viewer' });
    const material = (await analyst.client.post(`/api/projects/${project.id}/materials`).send({ name: 'Draft alloy', params: elastic }).expect(201)).body;
    const versionId = material.latest.id as string;
    const review = `/api/material-versions/${versionId}/review`;

    expect((await analyst.client.post(review).send({ decision: 'approve' })).status).toBe(403);
    expect((await viewer.client.post(review).send({ decision: 'approve' })).status).toBe(403);
    const noReason = await reviewer.client.post(review).send({ decision: 'reject', reason: '  ' });
    expect(noReason.status).toBe(422);
    expect(noReason.body.error.details).toEqual([expect.objectContaining({ path: 'reason' })]);

    const rejected = (await reviewer.client.post(review).send({ decision: 'reject', reason: 'E is far above the tensile curves' }).expect(200)).body;
    expect(rejected).toMatchObject({ status: 'rejected', reviewReason: 'E is far above the tensile curves' });
    // A decided version stays decided.
    expect((await reviewer.client.post(review).send({ decision: 'approve' })).status).toBe(409);
  });

  it('names the parameter at fault when a draft has an invalid value', async () => {
    const project = await t.createProject();
    const analyst = await t.signIn({ project, role: 'analyst' });
    const material = (await analyst.client.post(`/api/projects/${project.id}/materials`).send({ name: 'Checked alloy', params: elastic }).expect(201)).body;
    const answer = await analyst.client.post(`/api/materials/${material.id}/versions`).send({ params: { ...elastic, E: -5, nu: 0.7 } });
    expect(answer.status).toBe(422);
    const paths = (answer.body.error.details as { path: string; message: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['params.E', 'params.nu']));
  });
});
