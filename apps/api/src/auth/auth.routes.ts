import { z } from 'zod';
import type { Request } from 'express';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { HttpError } from '../http/errors';
import { ROLES, PERMISSIONS, permissionsOf } from './permissions';
import { MIN_PASSWORD_LENGTH } from './password';
import { toSessionUser, type PassportInstance } from './session';
import type { SessionUser } from './session-user';
import { acceptInvitation, requestPasswordReset, resetPassword } from '../users/users.service';
import { audit } from '../audit/audit.service';

const meDto = z.object({
  id: z.string(), email: z.string(), name: z.string(), role: z.enum(ROLES), permissions: z.array(z.enum(PERMISSIONS)),
});
const password = z.string().min(MIN_PASSWORD_LENGTH, { error: `Use at least ${MIN_PASSWORD_LENGTH} characters` }).max(200);

function me(user: SessionUser): z.infer<typeof meDto> {
  return { ...user, permissions: permissionsOf(user.role) };
}

function logIn(req: Request, user: SessionUser): Promise<void> {
  // Regenerate the session id at sign-in so a planted cookie cannot be reused (session fixation).
  return new Promise((resolve, reject) => {
    req.session.regenerate((err) => {
      if (err) return reject(err);
      req.logIn(user, (err2) => (err2 ? reject(err2) : resolve()));
    });
  });
}

function authenticateLocal(passport: PassportInstance, req: Request): Promise<SessionUser> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', (err: unknown, user: SessionUser | false, info?: { message?: string }) => {
      if (err) return reject(err);
      if (!user) return reject(new HttpError(401, info?.message ?? 'E-mail or password is wrong', 'bad-credentials'));
      resolve(user);
    })(req, req.res!, () => undefined);
  });
}

export function registerAuthRoutes(api: ApiRouter, ctx: AppContext, passport: PassportInstance): void {
  const tag = 'Sign-in';
  api
    .add({
      method: 'post', path: '/auth/login', tag, access: 'public', summary: 'Sign in (sets the session cookie)', status: 200,
      body: z.object({ email: z.string().min(1), password: z.string().min(1) }), response: meDto,
      handler: async ({ req }) => {
        const user = await authenticateLocal(passport, req);
        await logIn(req, user);
        await audit(ctx.sequelize, { userId: user.id, action: 'user.login', targetType: 'user', targetId: user.id });
        return me(user);
      },
    })
    .add({
      method: 'post', path: '/auth/logout', tag, access: 'public', summary: 'Sign out', status: 204,
      handler: async ({ req }) => {
        await new Promise<void>((resolve, reject) => req.logOut((err) => (err ? reject(err) : resolve())));
        await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
      },
    })
    .add({
      method: 'get', path: '/auth/me', tag, access: 'user', summary: 'Who am I, and what may I do',
      response: meDto, handler: ({ user }) => me(user),
    })
    .add({
      method: 'post', path: '/auth/invitations/accept', tag, access: 'public', summary: 'Accept an invitation: set a password and sign in', status: 200,
      body: z.object({ token: z.string().min(10), password }), response: meDto,
      handler: async ({ req, body }) => {
        const user = toSessionUser(await acceptInvitation(ctx.sequelize, body.token, body.password));
        await logIn(req, user);
        return me(user);
      },
    })
    .add({
      method: 'post', path: '/auth/password-reset', tag, access: 'public', summary: 'Mail a password-reset link (always answers 202)', status: 202,
      body: z.object({ email: z.string().min(1) }), response: z.object({ ok: z.literal(true) }),
      handler: async ({ body }) => {
        await requestPasswordReset({ sequelize: ctx.sequelize, mailer: ctx.mailer, publicUrl: ctx.config.PUBLIC_URL }, body.email);
        return { ok: true as const };
      },
    })
    .add({
      method: 'post', path: '/auth/password-reset/confirm', tag, access: 'public', summary: 'Set a new password with a reset link', status: 204,
      body: z.object({ token: z.string().min(10), password }),
      handler: async ({ body }) => {
        await resetPassword(ctx.sequelize, body.token, body.password);
      },
    });
}
