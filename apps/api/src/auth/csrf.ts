/**
 * CSRF protection for cookie sessions (synchroniser token): the token lives in the session, the
 * web app reads it from GET /api/auth/csrf and sends it back in `x-csrf-token` on every
 * state-changing request. A cross-site page can make the browser send the cookie but cannot read
 * the token. Requests without the session cookie carry no ambient authority and need no token;
 * bearer-token clients are exempt as well.
 */
import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { HttpError } from '../http/errors';
import { SESSION_COOKIE } from './session';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

export const CSRF_HEADER = 'x-csrf-token';
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export function csrfTokenFor(req: Request): string {
  req.session.csrfToken ??= randomBytes(24).toString('base64url');
  return req.session.csrfToken;
}

function carriesSessionCookie(req: Request): boolean {
  const cookie = req.headers.cookie ?? '';
  return cookie.split(';').some((c) => c.trim().startsWith(`${SESSION_COOKIE}=`));
}

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  if (/^Bearer\s/i.test(req.headers.authorization ?? '')) return next();
  if (!carriesSessionCookie(req)) return next();
  const sent = req.headers[CSRF_HEADER];
  const expected = req.session?.csrfToken;
  if (typeof sent !== 'string' || !expected || !sameToken(sent, expected)) {
    return next(new HttpError(403, 'Missing or stale CSRF token; reload the page and try again', 'csrf_failed'));
  }
  next();
};
