/**
 * Sign-in, sessions, CSRF, invitations and password resets, against a real PostgreSQL and the
 * local fake SMTP server. Expected behaviour comes from the API contract (docs) and issue 2's
 * acceptance list; HTTP semantics from RFC 9110; session handling from the OWASP Session
 * Management and CSRF Prevention cheat sheets.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, Client, type TestApp } from '../testing/test-app';
import { hashPassword, hashToken, newToken, verifyPassword } from './password';
import { SESSION_COOKIE } from './session';
import { PasswordReset } from '../users/users.model';
import { ERROR_CODES } from '../http/errors';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

function tokenIn(text: string, route: 'invite' | 'reset'): string {
  const m = new RegExp(`/${route}/([A-Za-z0-9_-]+)`).exec(text);
  if (!m?.[1]) throw new Error(`no /${route}/ link in:\n${text}`);
  return m[1];
}

function expectErrorShape(body: unknown, code: (typeof ERROR_CODES)[number]): void {
  expect(body).toMatchObject({ error: { code, message: expect.any(String) } });
}

describe('passwords', () => {
  it('verifies the right password and refuses a wrong one; two hashes of one password differ (salted)', async () => {
    const a = await hashPassword('correct horse battery');
    const b = await hashPassword('correct horse battery');
    expect(a).not.toBe(b);
    expect(a.startsWith('scrypt$16384$8$1$')).toBe(true); // RFC 7914 parameters N=2^14, r=8, p=1
    expect(await verifyPassword('correct horse battery', a)).toBe(true);
    expect(await verifyPassword('correct horse batterY', a)).toBe(false);
  });

  it('stores only the SHA-256 of a mailed token (FIPS 180-4 example: SHA-256("abc"))', () => {
    expect(hashToken('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    const { token, hash } = newToken();
    expect(hash).toBe(hashToken(token));
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/); // 32 random bytes in unpadded base64url (RFC 4648 §5)
  });
});

describe('sign-in and sessions', () => {
  it('signs in, says who I am with my project roles, and signs out', async () => {
    const project = await t.createProject();
    const { client, user } = await t.signIn({ project, role: 'analyst' });
    const me = await client.get('/api/auth/me').expect(200);
    expect(me.body.user).toMatchObject({ id: user.id, email: user.email, isAdmin: false });
    expect(me.body.memberships).toEqual([{ projectId: project.id, projectName: project.name, role: 'analyst' }]);
    await client.post('/api/auth/logout').expect(204);
    const after = await client.get('/api/auth/me').expect(401);
    expectErrorShape(after.body, 'unauthenticated');
  });

  it('answers a wrong password exactly like an unknown account (401, same message)', async () => {
    const { user } = await t.signIn();
    const wrong = await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'not-the-password' }).expect(401);
    const unknown = await request(t.app).post('/api/auth/login').send({ email: 'nobody@example.test', password: 'not-the-password' }).expect(401);
    expect(wrong.body).toEqual(unknown.body);
    expectErrorShape(wrong.body, 'unauthenticated');
  });

  it('issues a new session id at sign-in (no fixation) in an HttpOnly, SameSite=Lax cookie', async () => {
    const { user, password } = await t.signIn();
    const client = await Client.start(t.app);
    const before = String(client.agent.jar.getCookie(SESSION_COOKIE, { domain: '127.0.0.1', path: '/', script: false, secure: false })?.value);
    const res = await client.signIn(user.email, password);
    expect(res.status).toBe(200);
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toContain(`${SESSION_COOKIE}=`);
    expect(cookie).not.toContain(before);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('refuses a write with the session cookie but without the CSRF token (403 csrf_failed)', async () => {
    const { client } = await t.signIn({ isAdmin: true });
    const bare = await client.agent.post('/api/projects').send({ name: 'No token', description: '' });
    expect(bare.status).toBe(403);
    expectErrorShape(bare.body, 'csrf_failed');
    const forged = await client.agent.post('/api/projects').set('x-csrf-token', 'forged-token-value').send({ name: 'Forged', description: '' });
    expectErrorShape(forged.body, 'csrf_failed');
    await client.post('/api/projects').send({ name: 'With token', description: '' }).expect(201);
  });

  it('signs a disabled user out at once and refuses their password afterwards', async () => {
    const admin = await t.signIn({ isAdmin: true });
    const victim = await t.signIn();
    await victim.client.get('/api/auth/me').expect(200);
    await admin.client.patch(`/api/admin/users/${victim.user.id}`).send({ disabled: true }).expect(200);
    await victim.client.get('/api/auth/me').expect(401);
    await request(t.app).post('/api/auth/login').send({ email: victim.user.email, password: victim.password }).expect(401);
  });

  it('answers malformed JSON with 400 and an unknown API route with 404, both in the error shape', async () => {
    const bad = await request(t.app).post('/api/auth/login').set('Content-Type', 'application/json').send('{"email": ');
    expect(bad.status).toBe(400);
    expectErrorShape(bad.body, 'bad_request');
    const missing = await request(t.app).get('/api/no-such-route');
    expect(missing.status).toBe(404);
    expectErrorShape(missing.body, 'not_found');
  });

  it('sets helmet security headers', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});

describe('invitations', () => {
  it('a site admin invites into a project; the mailed link shows the invitation, creates the account once, and signs in', async () => {
    const project = await t.createProject('Invite target');
    const admin = await t.signIn({ isAdmin: true });
    const created = await admin.client.post('/api/admin/invitations').send({ email: 'New.Reviewer@Example.test', projectId: project.id, role: 'reviewer' }).expect(201);
    expect(created.body).toMatchObject({ email: 'new.reviewer@example.test', projectName: 'Invite target', role: 'reviewer', acceptedAt: null });

    const mail = await t.mailTo('new.reviewer@example.test');
    expect(mail.subject).toContain('Invite target');
    const token = tokenIn(mail.text, 'invite');
    expect(mail.text).toContain(`${t.config.APP_URL}/invite/${token}`);

    const preview = await request(t.app).get(`/api/invitations/${token}`).expect(200);
    expect(preview.body).toMatchObject({ email: 'new.reviewer@example.test', projectName: 'Invite target', role: 'reviewer' });

    const invitee = await Client.start(t.app);
    await invitee.post(`/api/invitations/${token}/accept`).send({ name: 'Nia New', password: 'short' }).expect(422);
    const accepted = await invitee.post(`/api/invitations/${token}/accept`).send({ name: 'Nia New', password: 'a-long-enough-password' }).expect(201);
    expect(accepted.body.user).toMatchObject({ email: 'new.reviewer@example.test', name: 'Nia New', isAdmin: false });
    const me = await invitee.get('/api/auth/me').expect(200);
    expect(me.body.memberships).toEqual([{ projectId: project.id, projectName: 'Invite target', role: 'reviewer' }]);

    const again = await request(t.app).post(`/api/invitations/${token}/accept`).send({ name: 'X', password: 'another-long-password' });
    expect(again.status).toBe(410);
    expect(again.body.error.message).toMatch(/already been used/);
    await request(t.app).get('/api/invitations/not-a-real-token-value').expect(404);

    const list = await admin.client.get('/api/admin/invitations').expect(200);
    expect(list.body.items.find((i: { email: string }) => i.email === 'new.reviewer@example.test').acceptedAt).not.toBeNull();
    const mails = await admin.client.get('/api/admin/mail').expect(200);
    expect(mails.body.items[0]).toMatchObject({ to: ['new.reviewer@example.test'], subject: mail.subject });
  });

  it('a withdrawn invitation no longer works', async () => {
    const project = await t.createProject();
    const admin = await t.signIn({ isAdmin: true });
    const inv = await admin.client.post('/api/admin/invitations').send({ email: 'withdrawn@example.test', projectId: project.id, role: 'viewer' }).expect(201);
    const token = tokenIn((await t.mailTo('withdrawn@example.test')).text, 'invite');
    await admin.client.delete(`/api/admin/invitations/${inv.body.id}`).expect(204);
    const res = await request(t.app).get(`/api/invitations/${token}`);
    expect(res.status).toBe(410);
    expect(res.body.error.message).toMatch(/withdrawn/);
  });
});

describe('password reset', () => {
  it('resets through the mailed one-time link, ends old sessions, and refuses the link a second time', async () => {
    const { client, user } = await t.signIn();
    await request(t.app).post('/api/auth/password-reset/request').send({ email: user.email }).expect(202);
    const token = tokenIn((await t.mailTo(user.email)).text, 'reset');
    await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'brand-new-password-1' }).expect(204);
    await client.get('/api/auth/me').expect(401);
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'brand-new-password-1' }).expect(200);
    const reused = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'brand-new-password-2' }).expect(400);
    expect(reused.body.error.message).toMatch(/already been used/);
  });

  it('refuses an expired link with a clear message', async () => {
    const { user } = await t.signIn();
    const { token, hash } = newToken();
    await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() - 1000) });
    const res = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'brand-new-password-3' }).expect(400);
    expect(res.body.error.message).toMatch(/expired/);
  });

  it('answers a request for an unknown address exactly like a known one, and mails only the known one', async () => {
    const { user } = await t.signIn();
    const known = await request(t.app).post('/api/auth/password-reset/request').send({ email: user.email });
    const unknown = await request(t.app).post('/api/auth/password-reset/request').send({ email: 'ghost@example.test' });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual(known.body);
    await t.mailTo(user.email);
    const { rows } = await t.ctx.pool.query("SELECT 1 FROM captured_mail WHERE 'ghost@example.test' = ANY(to_addresses)");
    expect(rows).toHaveLength(0);
  });
});

describe('login rate limit', () => {
  it('answers the 11th failed sign-in within a minute with 429 rate_limited', async () => {
    // Its own app instance: the limiter counts per address across the whole app.
    const own = await createTestApp();
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 11; i++) {
        statuses.push((await request(own.app).post('/api/auth/login').send({ email: 'x@example.test', password: 'wrong-password' })).status);
      }
      expect(statuses.slice(0, 10)).toEqual(Array(10).fill(401));
      expect(statuses[10]).toBe(429);
      const last = await request(own.app).post('/api/auth/login').send({ email: 'x@example.test', password: 'wrong-password' });
      expectErrorShape(last.body, 'rate_limited');
    } finally {
      await own.close();
    }
  });
});
