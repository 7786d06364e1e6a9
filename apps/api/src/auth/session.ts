/**
 * Cookie sessions stored in PostgreSQL (so any API instance can serve any request) and passport's
 * local strategy. The session holds only the user id; the user row is re-read per request so that
 * a role change or deactivation takes effect at once.
 */
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type pg from 'pg';
import type { RequestHandler } from 'express';
import { User } from '../users/users.model';
import { hashPassword, verifyPassword } from './password';
import type { SessionUser } from './session-user';

export const SESSION_COOKIE = 'phaseloop.sid';

export function toSessionUser(u: User): SessionUser {
  return { id: u.id, email: u.email, name: u.name, isAdmin: u.isAdmin };
}

export function createSessionMiddleware(pool: pg.Pool, secret: string, secureCookie: boolean, idleMinutes: number): RequestHandler {
  const PgStore = connectPgSimple(session);
  return session({
    name: SESSION_COOKIE,
    secret,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    store: new PgStore({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 }),
    cookie: { httpOnly: true, sameSite: 'lax', secure: secureCookie, maxAge: idleMinutes * 60_000 },
  });
}

// Checking a password for an unknown e-mail takes as long as for a known one (no timing probe).
let dummyHash: Promise<string> | null = null;

/** A passport instance per app (not the global one), so tests can build several apps. */
export type PassportInstance = InstanceType<typeof passport.Authenticator>;

export function createPassport(): PassportInstance {
  const pp = new passport.Authenticator();
  pp.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      void (async () => {
        const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
        if (!user) {
          dummyHash ??= hashPassword('not-a-real-password');
          await verifyPassword(password, await dummyHash);
        }
        // Same message for unknown e-mail and wrong password: do not reveal who has an account.
        if (!user || user.disabled || !(await verifyPassword(password, user.passwordHash))) {
          return done(null, false);
        }
        return done(null, toSessionUser(user));
      })().catch(done);
    }),
  );
  pp.serializeUser((user, done) => done(null, (user as SessionUser).id));
  pp.deserializeUser((id: string, done) => {
    User.findByPk(id)
      .then((u) => done(null, u && !u.disabled ? toSessionUser(u) : false))
      .catch(done);
  });
  return pp;
}
