/**
 * One error type for everything the API refuses on purpose, and one middleware that turns errors
 * into the contract's JSON shape `{ error: { code, message, details? } }`. Unexpected errors are
 * logged and answered with a generic message so internals (SQL, stack traces) never leak.
 */
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { Logger } from 'pino';
import type { ApiErrorCodeName as ErrorCode } from '@phaseloop/shared/errors';

export { API_ERROR_CODES as ERROR_CODES } from '@phaseloop/shared/errors';
export type { ApiErrorCodeName as ErrorCode } from '@phaseloop/shared/errors';

export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly code: ErrorCode = codeForStatus(status),
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export function codeForStatus(status: number): ErrorCode {
  switch (status) {
    case 401: return 'unauthenticated';
    case 403: return 'forbidden';
    case 404: return 'not_found';
    case 409: return 'conflict';
    case 422: return 'validation_failed';
    case 429: return 'rate_limited';
    default: return status >= 500 ? 'internal' : 'bad_request';
  }
}

export const notFound = (what: string): HttpError => new HttpError(404, `${what} not found`);

export interface ErrorBody {
  error: { code: ErrorCode; message: string; details?: unknown };
}

export function errorBody(code: ErrorCode, message: string, details?: unknown): ErrorBody {
  return { error: details === undefined ? { code, message } : { code, message, details } };
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
      body = errorBody(err.code, err.message, err.details);
    } else if (err instanceof ZodError) {
      status = 422;
      body = errorBody('validation_failed', 'The request is not valid', zodDetails(err));
    } else if (isBodyParserError(err)) {
      // Malformed JSON, too large a body, wrong charset: the client's fault, said plainly.
      status = err.status;
      const message = err.type === 'entity.parse.failed' ? 'The request body is not valid JSON' : err.message;
      body = errorBody(status === 413 ? 'bad_request' : codeForStatus(status), message);
    } else {
      logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
      body = errorBody('internal', 'Something went wrong on the server; it has been logged');
    }
    if (res.headersSent) return;
    res.status(status).json(body);
  };
}

function isBodyParserError(err: unknown): err is { status: number; message: string; type: string } {
  if (typeof err !== 'object' || err === null) return false;
  const e = err as { status?: unknown; type?: unknown };
  return typeof e.status === 'number' && e.status >= 400 && e.status < 500 && typeof e.type === 'string';
}
