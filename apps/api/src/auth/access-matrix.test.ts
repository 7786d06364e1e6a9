/**
 * Role × route matrix over EVERY route of the OpenAPI description (a new route without a row here
 * fails the first test). Expected cells follow product.md's role table and the API contract:
 * anonymous → 401 on anything not public; site-admin routes → 403 for everyone else; project
 * routes → 404 for non-members (ids of other teams' projects cannot be probed), 403 for members
 * whose role lacks the permission, allowed for the rest (site admins act as project admins).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, Client, type TestApp } from '../testing/test-app';
import { can, type Permission, type Role } from './permissions';
import { newToken } from './password';
import { User, Invitation, PasswordReset } from '../users/users.model';
import { Project, ProjectMember } from '../projects/projects.model';
import { Material, MaterialVersion } from '../materials/materials.model';
import { Study } from '../studies/studies.model';
import { Run } from '../runs/runs.model';
import { Mesh } from '../meshes/meshes.model';
import { hashPassword } from './password';
import { materialParamsSchema } from '@phaseloop/shared';

type Actor = 'anonymous' | 'outsider' | 'viewer' | 'reviewer' | 'analyst' | 'projectAdmin' | 'siteAdmin';
const ACTORS: Actor[] = ['anonymous', 'outsider', 'viewer', 'reviewer', 'analyst', 'projectAdmin', 'siteAdmin'];
const MEMBER_ROLE: Partial<Record<Actor, Role>> = { viewer: 'viewer', reviewer: 'reviewer', analyst: 'analyst', projectAdmin: 'admin' };

type Access = { kind: 'public' } | { kind: 'user' } | { kind: 'site-admin' } | { kind: 'project'; permission: Permission };

interface Cell {
  path: string;
  body?: Record<string, unknown>;
  upload?: boolean;
}

interface RouteRow {
  access: Access;
  /** Builds a fresh target for one cell (so destructive calls of earlier cells do not interfere). */
  prepare: () => Promise<Cell>;
  /** The call ends the actor's session (sign-out, sign-in, accept): sign them in again afterwards. */
  resetsSession?: boolean;
}

let t: TestApp;
let project: Project;
let other: Project;
const clients = new Map<Actor, Client>();
const users = new Map<Actor, { email: string; password: string; id: string }>();
let counter = 0;

const params = materialParamsSchema.parse({ model: 'linear-elastic', E: 60_000, nu: 0.3 });

async function spareUser(memberOf?: Project, role: Role = 'viewer'): Promise<User> {
  counter += 1;
  const u = await User.create({ email: `spare${counter}@example.test`, name: `Spare ${counter}`, passwordHash: 'x' });
  if (memberOf) await ProjectMember.create({ projectId: memberOf.id, userId: u.id, role });
  return u;
}

async function draftVersion(): Promise<{ material: Material; version: MaterialVersion }> {
  counter += 1;
  const material = await Material.create({ projectId: project.id, name: `M${counter}`, createdBy: null });
  const version = await MaterialVersion.create({ materialId: material.id, version: 1, params, createdBy: null });
  return { material, version };
}

async function study(): Promise<Study> {
  const { version } = await draftVersion();
  counter += 1;
  return Study.create({ projectId: project.id, name: `S${counter}`, definition: { materials: [{ region: 'all', materialVersionId: version.id }] }, createdBy: null });
}

async function run(state: 'queued' | 'succeeded'): Promise<Run> {
  const s = await study();
  return Run.create({
    projectId: project.id, studyId: s.id, sweepId: null, number: 1, state, solverVersion: 'test', submittedBy: null,
    queuedAt: new Date(), snapshot: { study: { id: s.id, name: s.name, revision: 1, definition: s.definition }, materials: [], solverVersion: 'test', submittedAt: new Date().toISOString() },
  });
}

const P = () => `/api/projects/${project.id}`;
const member: Access = { kind: 'project', permission: 'project:read' };
const perm = (permission: Permission): Access => ({ kind: 'project', permission });
const fixed = (path: string | (() => string), body?: Record<string, unknown>) => async (): Promise<Cell> => ({ path: typeof path === 'string' ? path : path(), body });

const ROUTES: Record<string, RouteRow> = {
  'GET /api/health': { access: { kind: 'public' }, prepare: fixed('/api/health') },
  'GET /api/auth/csrf': { access: { kind: 'public' }, prepare: fixed('/api/auth/csrf') },
  'POST /api/auth/login': {
    access: { kind: 'public' }, resetsSession: true,
    prepare: async () => {
      counter += 1;
      const u = await User.create({ email: `login${counter}@example.test`, name: 'Login', passwordHash: await hashPassword('login-password-long') });
      return { path: '/api/auth/login', body: { email: u.email, password: 'login-password-long' } };
    },
  },
  'POST /api/auth/logout': { access: { kind: 'public' }, resetsSession: true, prepare: fixed('/api/auth/logout') },
  'GET /api/auth/me': { access: { kind: 'user' }, prepare: fixed('/api/auth/me') },
  'POST /api/auth/password-reset/request': { access: { kind: 'public' }, prepare: fixed('/api/auth/password-reset/request', { email: 'nobody@example.test' }) },
  'POST /api/auth/password-reset/confirm': {
    access: { kind: 'public' },
    prepare: async () => {
      const u = await spareUser();
      const { token, hash } = newToken();
      await PasswordReset.create({ userId: u.id, tokenHash: hash, expiresAt: new Date(Date.now() + 3600_000) });
      return { path: '/api/auth/password-reset/confirm', body: { token, password: 'a-long-enough-password' } };
    },
  },
  'GET /api/invitations/{token}': {
    access: { kind: 'public' },
    prepare: async () => {
      const { token, hash } = newToken();
      counter += 1;
      await Invitation.create({ email: `inv${counter}@example.test`, projectId: project.id, role: 'viewer', tokenHash: hash, expiresAt: new Date(Date.now() + 3600_000), invitedBy: null });
      return { path: `/api/invitations/${token}` };
    },
  },
  'POST /api/invitations/{token}/accept': {
    access: { kind: 'public' }, resetsSession: true,
    prepare: async () => {
      const { token, hash } = newToken();
      counter += 1;
      await Invitation.create({ email: `acc${counter}@example.test`, projectId: project.id, role: 'viewer', tokenHash: hash, expiresAt: new Date(Date.now() + 3600_000), invitedBy: null });
      return { path: `/api/invitations/${token}/accept`, body: { name: 'New person', password: 'a-long-enough-password' } };
    },
  },
  'GET /api/admin/users': { access: { kind: 'site-admin' }, prepare: fixed('/api/admin/users') },
  'PATCH /api/admin/users/{id}': { access: { kind: 'site-admin' }, prepare: async () => ({ path: `/api/admin/users/${(await spareUser()).id}`, body: { name: 'Renamed' } }) },
  'GET /api/admin/invitations': { access: { kind: 'site-admin' }, prepare: fixed('/api/admin/invitations') },
  'POST /api/admin/invitations': {
    access: { kind: 'site-admin' },
    prepare: async () => {
      counter += 1;
      return { path: '/api/admin/invitations', body: { email: `new${counter}@example.test`, projectId: project.id, role: 'viewer' } };
    },
  },
  'DELETE /api/admin/invitations/{id}': {
    access: { kind: 'site-admin' },
    prepare: async () => {
      counter += 1;
      const inv = await Invitation.create({ email: `del${counter}@example.test`, projectId: project.id, role: 'viewer', tokenHash: newToken().hash, expiresAt: new Date(Date.now() + 3600_000), invitedBy: null });
      return { path: `/api/admin/invitations/${inv.id}` };
    },
  },
  'GET /api/admin/mail': { access: { kind: 'site-admin' }, prepare: fixed('/api/admin/mail') },
  'GET /api/admin/audit': { access: { kind: 'site-admin' }, prepare: fixed('/api/admin/audit') },
  'GET /api/projects': { access: { kind: 'user' }, prepare: fixed('/api/projects') },
  'POST /api/projects': { access: { kind: 'site-admin' }, prepare: async () => ({ path: '/api/projects', body: { name: `New project ${++counter}`, description: '' } }) },
  'GET /api/projects/{projectId}': { access: member, prepare: fixed(P) },
  'PATCH /api/projects/{projectId}': { access: perm('project:manage'), prepare: async () => ({ path: P(), body: { description: `Edited ${++counter}` } }) },
  'GET /api/projects/{projectId}/members': { access: member, prepare: fixed(() => `${P()}/members`) },
  'PUT /api/projects/{projectId}/members/{userId}': { access: perm('project:manage'), prepare: async () => ({ path: `${P()}/members/${(await spareUser()).id}`, body: { role: 'viewer' } }) },
  'DELETE /api/projects/{projectId}/members/{userId}': { access: perm('project:manage'), prepare: async () => ({ path: `${P()}/members/${(await spareUser(project)).id}` }) },
  'GET /api/projects/{projectId}/materials': { access: member, prepare: fixed(() => `${P()}/materials`) },
  'POST /api/projects/{projectId}/materials': { access: perm('material:write'), prepare: async () => ({ path: `${P()}/materials`, body: { name: `Mat ${++counter}`, params } }) },
  'GET /api/materials/{id}': { access: member, prepare: async () => ({ path: `/api/materials/${(await draftVersion()).material.id}` }) },
  'POST /api/materials/{id}/versions': { access: perm('material:write'), prepare: async () => ({ path: `/api/materials/${(await draftVersion()).material.id}/versions`, body: { params } }) },
  'GET /api/material-versions/{id}': { access: member, prepare: async () => ({ path: `/api/material-versions/${(await draftVersion()).version.id}` }) },
  'PATCH /api/material-versions/{id}': { access: perm('material:write'), prepare: async () => ({ path: `/api/material-versions/${(await draftVersion()).version.id}`, body: { notes: 'edited' } }) },
  'POST /api/material-versions/{id}/review': { access: perm('material:review'), prepare: async () => ({ path: `/api/material-versions/${(await draftVersion()).version.id}/review`, body: { decision: 'approve' } }) },
  'GET /api/projects/{projectId}/test-data': { access: member, prepare: fixed(() => `${P()}/test-data`) },
  'POST /api/projects/{projectId}/test-data': { access: perm('testdata:write'), prepare: async () => ({ path: `${P()}/test-data`, upload: true }) },
  'GET /api/test-data/{id}/content': {
    access: member,
    prepare: async () => {
      const [row] = (await t.ctx.pool.query<{ id: string }>(
        `INSERT INTO test_data (project_id, name, kind, file_name, content_type, size, content) VALUES ($1, 'x', 'other', 'x.csv', 'text/csv', 1, 'a') RETURNING id`,
        [project.id],
      )).rows;
      return { path: `/api/test-data/${row!.id}/content` };
    },
  },
  'GET /api/projects/{projectId}/meshes': { access: member, prepare: fixed(() => `${P()}/meshes`) },
  'POST /api/projects/{projectId}/meshes': { access: perm('study:write'), prepare: async () => ({ path: `${P()}/meshes`, upload: true }) },
  'GET /api/meshes/{id}': {
    access: member,
    prepare: async () => {
      const mesh = { nodes: [{ id: 1, x: 0, y: 0 }], elements: [], nodeSets: {}, edgeSets: {}, elementSets: {} };
      const m = await Mesh.create({ projectId: project.id, name: 'm', fileName: 'm.msh', format: '2.2', size: 1, nodeCount: 1, elementCount: 0, summary: { elementTypes: {}, bounds: { minX: 0, maxX: 0, minY: 0, maxY: 0 }, groups: [], warnings: [] }, mesh, content: '', uploadedBy: null });
      return { path: `/api/meshes/${m.id}` };
    },
  },
  'GET /api/projects/{projectId}/studies': { access: member, prepare: fixed(() => `${P()}/studies`) },
  'POST /api/projects/{projectId}/studies': {
    access: perm('study:write'),
    prepare: async () => ({ path: `${P()}/studies`, body: { name: `Study ${++counter}`, definition: { materials: [{ materialVersionId: (await draftVersion()).version.id }] } } }),
  },
  'GET /api/studies/{id}': { access: member, prepare: async () => ({ path: `/api/studies/${(await study()).id}` }) },
  'PATCH /api/studies/{id}': { access: perm('study:write'), prepare: async () => ({ path: `/api/studies/${(await study()).id}`, body: { description: 'edited', revision: 1 } }) },
  'GET /api/projects/{projectId}/runs': { access: member, prepare: fixed(() => `${P()}/runs`) },
  'POST /api/studies/{id}/runs': { access: perm('run:submit'), prepare: async () => ({ path: `/api/studies/${(await study()).id}/runs` }) },
  'GET /api/studies/{id}/runs': { access: member, prepare: async () => ({ path: `/api/studies/${(await study()).id}/runs` }) },
  'GET /api/runs/{id}': { access: member, prepare: async () => ({ path: `/api/runs/${(await run('queued')).id}` }) },
  'POST /api/runs/{id}/cancel': { access: perm('run:cancel'), prepare: async () => ({ path: `/api/runs/${(await run('queued')).id}/cancel` }) },
  'POST /api/runs/{id}/rerun': { access: perm('run:submit'), prepare: async () => ({ path: `/api/runs/${(await run('succeeded')).id}/rerun` }) },
  'POST /api/runs/{id}/request-review': { access: perm('run:submit'), prepare: async () => ({ path: `/api/runs/${(await run('succeeded')).id}/request-review` }) },
  'POST /api/runs/{id}/review': { access: perm('run:review'), prepare: async () => ({ path: `/api/runs/${(await run('succeeded')).id}/review`, body: { decision: 'reject', reason: 'matrix test' } }) },
  'GET /api/runs/{id}/iterations': { access: member, prepare: async () => ({ path: `/api/runs/${(await run('queued')).id}/iterations` }) },
  'GET /api/runs/{id}/logs': { access: member, prepare: async () => ({ path: `/api/runs/${(await run('queued')).id}/logs` }) },
  'GET /api/runs/{id}/frames': { access: member, prepare: async () => ({ path: `/api/runs/${(await run('queued')).id}/frames` }) },
  'GET /api/runs/{id}/files': { access: member, prepare: async () => ({ path: `/api/runs/${(await run('queued')).id}/files` }) },
  'GET /api/runs/{id}/files/{name}': {
    access: member,
    prepare: async () => {
      const r = await run('succeeded');
      const { rows } = await t.ctx.pool.query<{ id: string }>(`INSERT INTO run_artifacts (run_id, name, content_type, size, complete) VALUES ($1, 'a.csv', 'text/csv', 1, true) RETURNING id`, [r.id]);
      await t.ctx.pool.query(`INSERT INTO run_artifact_chunks (artifact_id, seq, bytes) VALUES ($1, 0, 'a')`, [rows[0]!.id]);
      return { path: `/api/runs/${r.id}/files/a.csv` };
    },
  },
  'GET /api/runs/{id}/results/{name}': {
    access: member,
    prepare: async () => {
      const r = await run('succeeded');
      const { rows } = await t.ctx.pool.query<{ id: string }>(`INSERT INTO run_artifacts (run_id, name, content_type, size, complete) VALUES ($1, 'history.csv', 'text/csv', 1, true) RETURNING id`, [r.id]);
      await t.ctx.pool.query(`INSERT INTO run_artifact_chunks (artifact_id, seq, bytes) VALUES ($1, 0, 'a')`, [rows[0]!.id]);
      return { path: `/api/runs/${r.id}/results/history.csv` };
    },
  },
  'POST /api/runs/{id}/priority': { access: { kind: 'site-admin' }, prepare: async () => ({ path: `/api/runs/${(await run('queued')).id}/priority`, body: { priority: 5 } }) },
  'DELETE /api/runs/{id}': { access: perm('run:submit'), prepare: async () => ({ path: `/api/runs/${(await run('succeeded')).id}` }) },
  'POST /api/studies/{id}/duplicate': { access: perm('study:write'), prepare: async () => ({ path: `/api/studies/${(await study()).id}/duplicate`, body: {} }) },
  'DELETE /api/studies/{id}': { access: perm('study:write'), prepare: async () => ({ path: `/api/studies/${(await study()).id}` }) },
  'GET /api/queue': { access: { kind: 'user' }, prepare: fixed('/api/queue') },
  'GET /api/tokens': { access: { kind: 'user' }, prepare: fixed('/api/tokens') },
  'POST /api/tokens': { access: { kind: 'user' }, prepare: fixed('/api/tokens', { name: 'matrix script' }) },
  'DELETE /api/tokens/{id}': { access: { kind: 'user' }, prepare: fixed('/api/tokens/00000000-0000-4000-8000-000000000000') },
  'GET /api/notifications': { access: { kind: 'user' }, prepare: fixed('/api/notifications') },
  'POST /api/notifications/read': { access: { kind: 'user' }, prepare: fixed('/api/notifications/read', {}) },
  'GET /api/notifications/settings': { access: { kind: 'user' }, prepare: fixed('/api/notifications/settings') },
  'PUT /api/notifications/settings': { access: { kind: 'user' }, prepare: fixed('/api/notifications/settings', { emailOnRunEnd: true }) },
  'GET /api/comments': { access: member, prepare: async () => ({ path: `/api/comments?targetType=study&targetId=${(await study()).id}` }) },
  'POST /api/comments': { access: perm('comment:write'), prepare: async () => ({ path: '/api/comments', body: { targetType: 'study', targetId: (await study()).id, body: 'A comment' } }) },
};

/** 'allowed' or the exact refusal status. */
function expected(access: Access, actor: Actor): 'allowed' | 401 | 403 | 404 {
  if (access.kind === 'public') return 'allowed';
  if (actor === 'anonymous') return 401;
  if (access.kind === 'user') return 'allowed';
  if (access.kind === 'site-admin') return actor === 'siteAdmin' ? 'allowed' : 403;
  if (actor === 'siteAdmin') return 'allowed';
  const role = MEMBER_ROLE[actor];
  if (!role) return 404;
  return can(role, access.permission) ? 'allowed' : 403;
}

async function signInActor(actor: Actor): Promise<void> {
  if (actor === 'anonymous') {
    clients.set(actor, await Client.start(t.app));
    return;
  }
  const u = users.get(actor)!;
  const c = await Client.start(t.app);
  const res = await c.signIn(u.email, u.password);
  if (res.status !== 200) throw new Error(`sign-in of ${actor} failed`);
  clients.set(actor, c);
}

beforeAll(async () => {
  t = await createTestApp();
  project = await t.createProject('Matrix project');
  other = await t.createProject('Other team');
  const password = 'matrix-password-long';
  const hash = await hashPassword(password);
  for (const actor of ACTORS) {
    if (actor === 'anonymous') continue;
    const u = await User.create({ email: `${actor.toLowerCase()}@matrix.test`, name: actor, passwordHash: hash, isAdmin: actor === 'siteAdmin', maxActiveRuns: 50 });
    users.set(actor, { email: u.email, password, id: u.id });
    const role = MEMBER_ROLE[actor];
    if (role) await ProjectMember.create({ projectId: project.id, userId: u.id, role });
    // The outsider belongs to another project only.
    if (actor === 'outsider') await ProjectMember.create({ projectId: other.id, userId: u.id, role: 'admin' });
  }
  for (const actor of ACTORS) await signInActor(actor);
});
afterAll(async () => {
  await t?.close();
});

describe('role × route matrix', () => {
  it('has a row for every route the API describes', async () => {
    const doc = (await request(t.app).get('/api/openapi.json').expect(200)).body as { paths: Record<string, Record<string, unknown>> };
    const described = Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${path}`)).sort();
    expect(described).toEqual(Object.keys(ROUTES).sort());
  });

  for (const [route, row] of Object.entries(ROUTES)) {
    it(route, async () => {
      const method = route.split(' ')[0]!.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
      // Refused actors first, so that allowed destructive calls cannot hide a missing check.
      const order = [...ACTORS].sort((a, b) => Number(expected(row.access, a) === 'allowed') - Number(expected(row.access, b) === 'allowed'));
      const seen: string[] = [];
      for (const actor of order) {
        const cell = await row.prepare();
        const client = clients.get(actor)!;
        let req = client.request(method, cell.path);
        if (cell.upload) req = req.field('name', 'upload').field('kind', 'dsc').attach('file', Buffer.from('T,Q\n1,2\n'), 'trace.csv');
        else if (cell.body) req = req.send(cell.body);
        const res = await req;
        const want = expected(row.access, actor);
        const ok = want === 'allowed' ? ![401, 403, 404].includes(res.status) && res.status < 500 : res.status === want;
        seen.push(`${actor}: ${res.status}${ok ? '' : ` (expected ${want}) ${JSON.stringify(res.body)}`}`);
        if (row.resetsSession) await signInActor(actor);
      }
      expect(seen.filter((s) => s.includes('expected')), seen.join('\n')).toEqual([]);
    });
  }

  it("answers another project's ids with 404 for a non-member, the same as an id that does not exist", async () => {
    const outsider = clients.get('outsider')!;
    const s = await study();
    const real = await outsider.get(`/api/studies/${s.id}`);
    const missing = await outsider.get('/api/studies/00000000-0000-4000-8000-000000000000');
    expect(real.status).toBe(404);
    expect(missing.status).toBe(404);
    expect(real.body.error.code).toBe('not_found');
    expect(real.body.error.message).toBe(missing.body.error.message);
  });
});
