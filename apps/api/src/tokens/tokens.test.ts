/**
 * Personal API tokens: shown once, stored hashed, usable as `Authorization: Bearer` for
 * submitting a study and reading results without a CSRF header, refused once revoked.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import request from 'supertest';
import { createTestApp, type TestApp } from '../testing/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

describe('API tokens', () => {
  it('lets a script submit a study and read the run, until the token is revoked', async () => {
    const project = await t.createProject();
    const { client, user } = await t.signIn({ project, role: 'analyst' });
    const material = await client.post(`/api/projects/${project.id}/materials`).send({ name: 'Script alloy', params: { model: 'linear-elastic', E: 60_000, nu: 0.3 } }).expect(201);
    const study = await client.post(`/api/projects/${project.id}/studies`).send({ name: 'Scripted', definition: { materials: [{ materialVersionId: material.body.latest.id }] } }).expect(201);

    const created = (await client.post('/api/tokens').send({ name: 'nightly sweep' }).expect(201)).body;
    expect(created.token).toMatch(/^plt_[A-Za-z0-9_-]{43}$/);
    // Only the SHA-256 of the secret is stored (FIPS 180-4), never the secret.
    const { rows } = await t.ctx.pool.query<{ token_hash: string }>('SELECT token_hash FROM api_tokens WHERE id = $1', [created.id]);
    expect(rows[0]!.token_hash).toBe(createHash('sha256').update(created.token).digest('hex'));
    const listed = (await client.get('/api/tokens').expect(200)).body;
    expect(listed).toHaveLength(1);
    expect(JSON.stringify(listed)).not.toContain(created.token);

    const bearer = { Authorization: `Bearer ${created.token}` };
    const run = await request(t.app).post(`/api/studies/${study.body.id}/runs`).set(bearer).expect(201);
    expect(run.body.submittedBy).toBe(user.id);
    expect((await request(t.app).get(`/api/runs/${run.body.id}`).set(bearer).expect(200)).body.state).toBe('queued');
    // A token cannot mint more tokens.
    expect((await request(t.app).post('/api/tokens').set(bearer).send({ name: 'more' })).status).toBe(403);

    await client.delete(`/api/tokens/${created.id}`).expect(204);
    const refused = await request(t.app).get(`/api/runs/${run.body.id}`).set(bearer);
    expect(refused.status).toBe(401);
    expect((await request(t.app).get(`/api/runs/${run.body.id}`).set({ Authorization: 'Bearer plt_wrong' })).status).toBe(401);
  });

  it('describes bearer tokens in the OpenAPI document with an example', async () => {
    const doc = (await request(t.app).get('/api/openapi.json').expect(200)).body;
    expect(doc.components.securitySchemes.apiToken).toMatchObject({ type: 'http', scheme: 'bearer' });
    expect(doc.info.description).toContain('Authorization: Bearer $PHASELOOP_TOKEN');
  });
});
