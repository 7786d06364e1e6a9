/**
 * Personal API tokens. The secret is 32 random bytes shown once; the database keeps its SHA-256
 * (a fast hash suffices for a high-entropy secret, unlike a password), so a database leak does not
 * leak usable tokens. `Authorization: Bearer <token>` then stands for the user on the API.
 */
import { createHash, randomBytes } from 'node:crypto';
import type pg from 'pg';
import type { RequestHandler } from 'express';
import { API_TOKEN_PREFIX, type ApiTokenDto, type CreatedApiTokenDto } from '@phaseloop/shared';
import { HttpError } from '../http/errors';
import type { SessionUser } from '../auth/session-user';

const hashToken = (token: string): string => createHash('sha256').update(token).digest('hex');

interface TokenRow { id: string; name: string; prefix: string; created_at: Date; last_used_at: Date | null; revoked_at: Date | null }

const iso = (d: Date | null): string | null => (d ? new Date(d).toISOString() : null);
function toDto(r: TokenRow): ApiTokenDto {
  return { id: r.id, name: r.name, prefix: r.prefix, createdAt: new Date(r.created_at).toISOString(), lastUsedAt: iso(r.last_used_at), revokedAt: iso(r.revoked_at) };
}

export async function createToken(pool: pg.Pool, userId: string, name: string): Promise<CreatedApiTokenDto> {
  const token = API_TOKEN_PREFIX + randomBytes(32).toString('base64url');
  const { rows } = await pool.query<TokenRow>(
    `INSERT INTO api_tokens (user_id, name, token_hash, prefix) VALUES ($1, $2, $3, $4)
     RETURNING id, name, prefix, created_at, last_used_at, revoked_at`,
    [userId, name, hashToken(token), token.slice(0, API_TOKEN_PREFIX.length + 6)],
  );
  return { ...toDto(rows[0]!), token };
}

export async function listTokens(pool: pg.Pool, userId: string): Promise<ApiTokenDto[]> {
  const { rows } = await pool.query<TokenRow>(
    'SELECT id, name, prefix, created_at, last_used_at, revoked_at FROM api_tokens WHERE user_id = $1 ORDER BY created_at DESC',
    [userId],
  );
  return rows.map(toDto);
}

/** Revokes one of the user's own tokens; ids of other users' tokens change nothing. */
export async function revokeToken(pool: pg.Pool, userId: string, id: string): Promise<void> {
  await pool.query('UPDATE api_tokens SET revoked_at = now() WHERE id = $1 AND user_id = $2 AND revoked_at IS NULL', [id, userId]);
}

/** Paths a token may not use: managing tokens and sessions needs the signed-in person. */
const SESSION_ONLY = /^\/api\/(tokens|auth)(\/|$)/;

/**
 * Signs the request in as the token's owner. Runs after the session middleware, so a bearer token
 * decides the user even if a cookie came along; a wrong or revoked token is a 401, never a
 * silent fall-back to the session.
 */
export function bearerTokenAuth(pool: pg.Pool): RequestHandler {
  return (req, _res, next) => {
    const header = req.headers.authorization ?? '';
    const match = /^Bearer\s+(\S+)$/i.exec(header);
    if (!match) return next();
    if (SESSION_ONLY.test(req.originalUrl.split('?')[0]!)) return next(new HttpError(403, 'API tokens cannot manage tokens or sessions; sign in instead'));
    pool.query<SessionUser & { token_id: string }>(
      `SELECT u.id, u.email, u.name, u.is_admin AS "isAdmin", t.id AS token_id FROM api_tokens t JOIN users u ON u.id = t.user_id
        WHERE t.token_hash = $1 AND t.revoked_at IS NULL AND NOT u.disabled`,
      [hashToken(match[1]!)],
    ).then(({ rows }) => {
      const row = rows[0];
      if (!row) return next(new HttpError(401, 'The API token is not valid (revoked or mistyped)'));
      req.user = { id: row.id, email: row.email, name: row.name, isAdmin: row.isAdmin };
      void pool.query('UPDATE api_tokens SET last_used_at = now() WHERE id = $1', [row.token_id]).catch(() => undefined);
      next();
    }, next);
  };
}
