import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, type TestApp } from '../testing/test-app';
import { hashPassword, hashToken, newToken, verifyPassword } from './password';
import { SESSION_COOKIE } from './session';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

/** The link in the newest mail to `to` (mail_outbox keeps every mail when no SMTP server is set). */
async function linkTokenFor(to: string): Promise<string> {
  const { rows } = await t.ctx.pool.query<{ body_text: string }>('SELECT body_text FROM mail_outbox WHERE to_address = $1 ORDER BY created_at DESC LIMIT 1', [to]);
  const m = /token=([A-Za-z0-9_-]+)/.exec(rows[0]?.body_text ?? '');
  if (!m?.[1]) throw new Error(`no link mailed to ${to}`);
  return m[1];
}

describe('passwords', () => {
  it('verifies the right password and refuses a wrong one; two hashes of one password differ (salted)', async () => {
    const a = await hashPassword('correct horse battery');
    const b = await hashPassword('correct horse battery');
    expect(a).not.toBe(b);
    expect(await verifyPassword('correct horse battery', a)).toBe(true);
    expect(await verifyPassword('correct horse batterY', a)).toBe(false);
    expect(await verifyPassword('anything', null)).toBe(false);
  });

  it('stores only the SHA-256 of a mailed token (FIPS 180-4 test vector for "abc")', () => {
    expect(hashToken('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    const { token, hash } = newToken();
    expect(hash).toBe(hashToken(token));
    expect(token.length).toBeGreaterThanOrEqual(43); // 32 random bytes in base64url
  });
});

describe('sign-in', () => {
  it('signs in, says who I am with my permissions, and signs out', async () => {
    const { agent, user } = await t.signIn('analyst');
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body).toMatchObject({ id: user.id, role: 'analyst' });
    expect(me.body.permissions).toContain('run:submit');
    expect(me.body.permissions).not.toContain('material:review');
    await agent.post('/api/auth/logout').expect(204);
    await agent.get('/api/auth/me').expect(401);
  });

  it('refuses a wrong password with the same answer as an unknown e-mail', async () => {
    const { user } = await t.signIn('viewer');
    const wrong = await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'not-the-password' }).expect(401);
    const unknown = await request(t.app).post('/api/auth/login').send({ email: 'nobody@example.test', password: 'not-the-password' }).expect(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it('gives a new session id at sign-in (no session fixation) with an HttpOnly, SameSite cookie', async () => {
    const { user, password } = await t.signIn('viewer');
    const agent = request.agent(t.app);
    await agent.post('/api/auth/password-reset').send({ email: 'nobody@example.test' }).expect(202);
    const res = await agent.post('/api/auth/login').send({ email: user.email, password }).expect(200);
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toContain(`${SESSION_COOKIE}=`);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('refuses a write that comes from another site (Origin check against CSRF)', async () => {
    const { agent } = await t.signIn('analyst');
    const res = await agent.post('/api/projects').set('Origin', 'https://evil.example').send({ name: 'x' });
    expect(res.status).toBe(403);
  });

  it('a deactivated user is signed out at once', async () => {
    const admin = await t.signIn('admin');
    const victim = await t.signIn('analyst');
    await victim.agent.get('/api/auth/me').expect(200);
    await admin.agent.patch(`/api/users/${victim.user.id}`).send({ active: false }).expect(200);
    await victim.agent.get('/api/auth/me').expect(401);
    await request(t.app).post('/api/auth/login').send({ email: victim.user.email, password: victim.password }).expect(401);
  });
});

describe('invitations and password reset', () => {
  it('an admin invites; the invitee sets a password through the mailed link, once', async () => {
    const admin = await t.signIn('admin');
    const res = await admin.agent.post('/api/users/invitations').send({ email: 'New.Reviewer@Example.test', name: 'New Reviewer', role: 'reviewer' }).expect(201);
    expect(res.body.user).toMatchObject({ email: 'new.reviewer@example.test', role: 'reviewer', hasPassword: false });
    const token = await linkTokenFor('new.reviewer@example.test');

    const invitee = request.agent(t.app);
    await invitee.post('/api/auth/invitations/accept').send({ token, password: 'short' }).expect(422);
    const accepted = await invitee.post('/api/auth/invitations/accept').send({ token, password: 'a-long-enough-password' }).expect(200);
    expect(accepted.body.role).toBe('reviewer');
    await invitee.get('/api/auth/me').expect(200);
    await request(t.app).post('/api/auth/invitations/accept').send({ token, password: 'another-long-password' }).expect(400);
    await request(t.app).post('/api/auth/login').send({ email: 'new.reviewer@example.test', password: 'a-long-enough-password' }).expect(200);
  });

  it('resets a password through the mailed link and signs out the old sessions', async () => {
    const { agent, user } = await t.signIn('analyst');
    await request(t.app).post('/api/auth/password-reset').send({ email: user.email }).expect(202);
    const token = await linkTokenFor(user.email);
    await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'brand-new-password-1' }).expect(204);
    await agent.get('/api/auth/me').expect(401);
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'brand-new-password-1' }).expect(200);
  });

  it('answers a reset request for an unknown address exactly like a known one (no account probing)', async () => {
    const { user } = await t.signIn('viewer');
    const known = await request(t.app).post('/api/auth/password-reset').send({ email: user.email });
    const unknown = await request(t.app).post('/api/auth/password-reset').send({ email: 'ghost@example.test' });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual(known.body);
  });
});
