/**
 * Declares a route once: its validation schemas, who may call it, its OpenAPI description and its
 * handler. The handler receives the parsed, typed values, never the raw request body, so an
 * unvalidated field cannot slip through.
 */
import { Router, type Request, type RequestHandler, type Response } from 'express';
import type { OpenAPIRegistry, RouteConfig } from '@asteasolutions/zod-to-openapi';
import { z, type ZodType } from 'zod';
import { HttpError, zodDetails } from './errors';
import type { SessionUser } from '../auth/session-user';

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * `public`: anyone; `user`: any signed-in user (project routes then check the membership role in
 * their service); `site-admin`: users with isAdmin.
 */
export type Access = 'public' | 'user' | 'site-admin';

export interface RouteContext<P, Q, B> {
  params: P;
  query: Q;
  body: B;
  user: SessionUser;
  req: Request;
  res: Response;
}

export interface RouteSpec<P, Q, B, R> {
  method: Method;
  /** Express-style path relative to the router's prefix, e.g. `/studies/:id`. */
  path: string;
  summary: string;
  /** Who may call it beyond the access level (e.g. "project analysts and admins"). */
  description?: string;
  tag: string;
  access: Access;
  params?: ZodType<P>;
  query?: ZodType<Q>;
  body?: ZodType<B>;
  response?: ZodType<R>;
  /** Success status (default 200, or 201 for POST that creates). */
  status?: number;
  /** For downloads and redirects: the handler writes the response itself. */
  raw?: boolean;
  /** Middleware that runs after the access check and before validation (e.g. multer for uploads). */
  before?: RequestHandler[];
  /** Request body media type for the OpenAPI description (default JSON). */
  bodyType?: 'application/json' | 'multipart/form-data';
  handler: (ctx: RouteContext<P, Q, B>) => Promise<R> | R;
}

const emptyObject = z.object({});

const ACCESS_TEXT: Record<Access, string> = {
  public: 'No sign-in needed.',
  user: 'Signed-in users; project data only for members of the project (others get 404).',
  'site-admin': 'Site admins only.',
};

export class ApiRouter {
  readonly router = Router();

  constructor(
    private readonly prefix: string,
    private readonly registry: OpenAPIRegistry,
  ) {}

  add<P = Record<string, never>, Q = Record<string, never>, B = undefined, R = unknown>(spec: RouteSpec<P, Q, B, R>): this {
    this.describe(spec);
    const guard: RequestHandler = (req, _res, next) => {
      authorise(req, spec.access);
      next();
    };
    this.router[spec.method](spec.path, guard, ...(spec.before ?? []), async (req: Request, res: Response) => {
      const user = authorise(req, spec.access);
      const params = parsePart((spec.params ?? emptyObject) as ZodType<P>, req.params, 'path');
      const query = parsePart((spec.query ?? emptyObject) as ZodType<Q>, req.query, 'query');
      const body = spec.body ? parsePart(spec.body, req.body ?? {}, 'body') : undefined;
      const result = await spec.handler({ params: params as P, query: query as Q, body: body as B, user: user as SessionUser, req, res });
      if (spec.raw || res.headersSent) return;
      // A handler may pick another status itself (e.g. 503 from the health check).
      const status = res.statusCode !== 200 ? res.statusCode : (spec.status ?? (spec.method === 'post' ? 201 : 200));
      if (result === undefined) res.status(status === 200 ? 204 : status).end();
      else res.status(status).json(result);
    });
    return this;
  }

  private describe<P, Q, B, R>(spec: RouteSpec<P, Q, B, R>): void {
    const path = (this.prefix + spec.path).replace(/:([A-Za-z0-9_]+)/g, '{$1}');
    const status = spec.status ?? (spec.method === 'post' ? 201 : 200);
    const config: RouteConfig = {
      method: spec.method,
      path,
      summary: spec.summary,
      tags: [spec.tag],
      description: ACCESS_TEXT[spec.access] + (spec.description ? ` ${spec.description}` : ''),
      request: {
        ...(spec.params ? { params: spec.params as unknown as z.ZodObject } : {}),
        ...(spec.query ? { query: spec.query as unknown as z.ZodObject } : {}),
        ...(spec.body ? { body: { content: { [spec.bodyType ?? 'application/json']: { schema: spec.body } } } } : {}),
      },
      responses: {
        [status]: spec.response
          ? { description: 'Success', content: { 'application/json': { schema: spec.response } } }
          : { description: 'Success' },
        default: { description: 'Error: `{ error: { code, message, details? } }`' },
      },
    };
    this.registry.registerPath(config);
  }
}

function authorise(req: Request, access: Access): SessionUser | null {
  if (access === 'public') return (req.user as SessionUser | undefined) ?? null;
  const user = req.user as SessionUser | undefined;
  if (!user) throw new HttpError(401, 'Please sign in');
  if (access === 'site-admin' && !user.isAdmin) throw new HttpError(403, 'Only site admins may do this');
  return user;
}

function parsePart<T>(schema: ZodType<T>, value: unknown, where: string): T {
  const result = schema.safeParse(value);
  if (!result.success) {
    const status = where === 'body' ? 422 : 400;
    throw new HttpError(status, `The request ${where} is not valid`, status === 422 ? 'validation_failed' : 'bad_request', zodDetails(result.error));
  }
  return result.data;
}
