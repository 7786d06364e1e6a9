/**
 * One error type for everything the API refuses on purpose, and one middleware that turns errors
 * into JSON. Unexpected errors are logged and answered with a generic message so internals
 * (SQL, stack traces) never reach the browser.
 */
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { Logger } from 'pino';

export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    /** Machine-readable reason, e.g. 'quota-exceeded'. */
    readonly code: string = codeForStatus(status),
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

function codeForStatus(status: number): string {
  switch (status) {
    case 400: return 'bad-request';
    case 401: return 'not-signed-in';
    case 403: return 'forbidden';
    case 404: return 'not-found';
    case 409: return 'conflict';
    case 413: return 'too-large';
    case 422: return 'invalid';
    case 429: return 'too-many-requests';
    default: return status >= 500 ? 'server-error' : 'error';
  }
}

export const notFound = (what: string): HttpError => new HttpError(404, `${what} not found`);
export const forbidden = (why = 'Your role does not allow this'): HttpError => new HttpError(403, why);

export interface ErrorBody {
  error: { code: string; message: string; details?: unknown };
}

/** Zod issues as `path: message` pairs a form can show beside its fields. */
export function zodDetails(err: ZodError): { path: string; message: string }[] {
  return err.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, `No route for ${req.method} ${req.path}`));
};

export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err: unknown, req, res, _next) => {
    let status = 500;
    let body: ErrorBody;
    if (err instanceof HttpError) {
      status = err.status;
      body = { error: { code: err.code, message: err.message, details: err.details } };
    } else if (err instanceof ZodError) {
      status = 422;
      body = { error: { code: 'invalid', message: 'The request is not valid', details: zodDetails(err) } };
    } else if (isBodyParserError(err)) {
      status = err.status;
      body = { error: { code: codeForStatus(status), message: err.message } };
    } else {
      logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
      body = { error: { code: 'server-error', message: 'Something went wrong on the server; it has been logged' } };
    }
    if (res.headersSent) return;
    res.status(status).json(body);
  };
}

function isBodyParserError(err: unknown): err is { status: number; message: string } {
  if (typeof err !== 'object' || err === null) return false;
  const e = err as { status?: unknown; type?: unknown };
  return typeof e.status === 'number' && e.status >= 400 && e.status < 500 && typeof e.type === 'string';
}
