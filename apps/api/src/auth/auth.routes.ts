import { z } from 'zod';
import type { Request } from 'express';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { HttpError } from '../http/errors';
import { ROLES } from './permissions';
import { MIN_PASSWORD_LENGTH } from './password';
import { toSessionUser, type PassportInstance } from './session';
import type { SessionUser } from './session-user';
import { csrfTokenFor } from './csrf';
import { User } from '../users/users.model';
import { acceptInvitation, membershipsOf, previewInvitation, requestPasswordReset, resetPassword, toUserDto } from '../users/users.service';
import { audit } from '../audit/audit.service';

export const userDto = z.object({
  id: z.string(), email: z.string(), name: z.string(), isAdmin: z.boolean(), disabled: z.boolean(),
  createdAt: z.string(), lastLoginAt: z.string().nullable(),
  /** Quotas set by admins: runs solved at once, model size in nodes. */
  maxActiveRuns: z.number().int().optional(), maxNodes: z.number().int().optional(),
});
export const membershipDto = z.object({ projectId: z.string(), projectName: z.string(), role: z.enum(ROLES) });
export const password = z.string().min(MIN_PASSWORD_LENGTH, { error: `Use at least ${MIN_PASSWORD_LENGTH} characters` }).max(200);
const token = z.string().min(10).max(200);

function logIn(req: Request, user: SessionUser): Promise<void> {
  // A new session id at sign-in, so a cookie planted before cannot ride along (session fixation).
  return new Promise((resolve, reject) => {
    req.session.regenerate((err) => {
      if (err) return reject(err);
      req.logIn(user, (err2) => (err2 ? reject(err2) : resolve()));
    });
  });
}

function authenticateLocal(passport: PassportInstance, req: Request): Promise<SessionUser> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', (err: unknown, user: SessionUser | false) => {
      if (err) return reject(err);
      // One message whether the account exists or not.
      if (!user) return reject(new HttpError(401, 'E-mail or password is wrong', 'unauthenticated'));
      resolve(user);
    })(req, req.res!, () => undefined);
  });
}

async function signedInUser(id: string): Promise<z.infer<typeof userDto>> {
  const user = await User.findByPk(id);
  if (!user) throw new HttpError(401, 'Please sign in');
  return toUserDto(user);
}

export function registerAuthRoutes(api: ApiRouter, ctx: AppContext, passport: PassportInstance): void {
  const tag = 'Sign-in';
  const mail = { sequelize: ctx.sequelize, mailer: ctx.mailer, appUrl: ctx.config.APP_URL };
  api
    .add({
      method: 'get', path: '/auth/csrf', tag, access: 'public', summary: 'The CSRF token to send as x-csrf-token on writes',
      response: z.object({ token: z.string() }),
      handler: ({ req }) => ({ token: csrfTokenFor(req) }),
    })
    .add({
      method: 'post', path: '/auth/login', tag, access: 'public', summary: 'Sign in (sets the session cookie)', status: 200,
      body: z.object({ email: z.string().min(1).max(320), password: z.string().min(1).max(200) }), response: z.object({ user: userDto }),
      handler: async ({ req }) => {
        const user = await authenticateLocal(passport, req);
        await logIn(req, user);
        await User.update({ lastLoginAt: new Date() }, { where: { id: user.id } });
        await audit(ctx.sequelize, { userId: user.id, action: 'user.login', targetType: 'user', targetId: user.id });
        return { user: await signedInUser(user.id) };
      },
    })
    .add({
      method: 'post', path: '/auth/logout', tag, access: 'public', summary: 'Sign out', status: 204,
      handler: async ({ req, res }) => {
        await new Promise<void>((resolve, reject) => req.logOut((err) => (err ? reject(err) : resolve())));
        await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
        res.clearCookie('phaseloop.sid');
      },
    })
    .add({
      method: 'get', path: '/auth/me', tag, access: 'user', summary: 'Who am I, and my project roles',
      response: z.object({ user: userDto, memberships: z.array(membershipDto) }),
      handler: async ({ user }) => ({
        user: await signedInUser(user.id),
        memberships: (await membershipsOf(ctx.sequelize, [user.id])).get(user.id) ?? [],
      }),
    })
    .add({
      method: 'post', path: '/auth/password-reset/request', tag, access: 'public', summary: 'Mail a reset link (always 202)', status: 202,
      body: z.object({ email: z.string().min(1).max(320) }), response: z.object({ ok: z.literal(true) }),
      handler: async ({ body }) => {
        await requestPasswordReset(mail, body.email);
        return { ok: true as const };
      },
    })
    .add({
      method: 'post', path: '/auth/password-reset/confirm', tag, access: 'public', summary: 'Set a new password with a mailed link', status: 204,
      body: z.object({ token, password }),
      handler: async ({ body }) => {
        await resetPassword(ctx.sequelize, body.token, body.password);
      },
    })
    .add({
      method: 'get', path: '/invitations/:token', tag, access: 'public', summary: 'What an invitation link is for',
      params: z.object({ token }),
      response: z.object({ email: z.string(), projectName: z.string(), role: z.enum(ROLES), expiresAt: z.string() }),
      handler: ({ params }) => previewInvitation(params.token),
    })
    .add({
      method: 'post', path: '/invitations/:token/accept', tag, access: 'public', summary: 'Create my account from an invitation and sign in',
      params: z.object({ token }), body: z.object({ name: z.string().trim().min(1).max(200), password }), response: z.object({ user: userDto }),
      handler: async ({ req, params, body }) => {
        const user = await acceptInvitation(ctx.sequelize, params.token, body);
        await logIn(req, toSessionUser(user));
        return { user: toUserDto(user) };
      },
    });
}
