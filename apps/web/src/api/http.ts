/**
 * The one HTTP client of the web app. It keeps the session cookie (same origin), fetches the CSRF
 * token before the first state-changing request, and turns every non-2xx answer into an ApiError.
 */

import { API_ERROR_CODES } from '@phaseloop/shared/errors';

export { API_ERROR_CODES };

/** Contract codes, plus two of our own for answers that never reached or never came from the API. */
export type ApiErrorCode = (typeof API_ERROR_CODES)[number] | 'network' | 'unexpected_response' | 'gone';

export class ApiError extends Error {
  readonly status: number;
  readonly code: ApiErrorCode;
  readonly details: unknown;

  constructor(status: number, code: ApiErrorCode, message: string, details?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

export function isApiError(value: unknown): value is ApiError {
  return value instanceof ApiError;
}

/** Fallback when the status has no body we understand (proxy errors, HTML error pages). */
function codeForStatus(status: number): ApiErrorCode {
  switch (status) {
    case 400: return 'bad_request';
    case 401: return 'unauthenticated';
    case 403: return 'forbidden';
    case 404: return 'not_found';
    case 409: return 'conflict';
    case 410: return 'gone';
    case 422: return 'validation_failed';
    case 429: return 'rate_limited';
    default: return status >= 500 ? 'internal' : 'unexpected_response';
  }
}

const FALLBACK_MESSAGES: Record<ApiErrorCode, string> = {
  bad_request: 'The request was not accepted.',
  validation_failed: 'Some values are not valid.',
  unauthenticated: 'Please sign in.',
  forbidden: 'Your role does not allow this.',
  not_found: 'Not found, or you are not a member of its project.',
  conflict: 'This conflicts with existing data.',
  rate_limited: 'Too many attempts. Wait a minute and try again.',
  csrf_failed: 'Your session changed. Reload the page and try again.',
  internal: 'The server ran into a problem. Try again later.',
  network: 'The server could not be reached. Check your connection.',
  unexpected_response: 'The server sent an answer we did not expect.',
  gone: 'This link has expired or was already used.',
};

function isKnownCode(code: unknown): code is ApiErrorCode {
  return typeof code === 'string' && (API_ERROR_CODES as readonly string[]).includes(code);
}

/** Reads the contract's `{ error: { code, message, details } }` shape from any JSON body. */
export function toApiError(status: number, body: unknown): ApiError {
  const error = typeof body === 'object' && body !== null ? (body as { error?: unknown }).error : undefined;
  if (typeof error === 'object' && error !== null) {
    const { code, message, details } = error as { code?: unknown; message?: unknown; details?: unknown };
    const knownCode = isKnownCode(code) ? code : codeForStatus(status);
    const text = typeof message === 'string' && message.trim() !== '' ? message : FALLBACK_MESSAGES[knownCode];
    return new ApiError(status, knownCode, text, details);
  }
  const code = codeForStatus(status);
  return new ApiError(status, code, FALLBACK_MESSAGES[code]);
}

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

const STATE_CHANGING: ReadonlySet<HttpMethod> = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** Paths whose 401 is an answer in itself (who am I? / wrong password), not a lost session. */
const SESSION_PROBES = ['/api/auth/me', '/api/auth/login', '/api/invitations/', '/api/auth/password-reset/'];

let onSessionLost: (() => void) | null = null;

/** Called when a signed-in request answers 401: the session expired or was ended elsewhere. */
export function setSessionLostHandler(handler: (() => void) | null): void {
  onSessionLost = handler;
}

let csrfToken: string | null = null;
let csrfRequest: Promise<string> | null = null;

/** The session changes on sign-in and sign-out; its CSRF token goes with it. */
export function forgetCsrfToken(): void {
  csrfToken = null;
  csrfRequest = null;
}

async function fetchCsrfToken(): Promise<string> {
  const body = await send<{ token: string }>('GET', '/api/auth/csrf');
  if (typeof body?.token !== 'string') throw new ApiError(200, 'unexpected_response', FALLBACK_MESSAGES.unexpected_response);
  return body.token;
}

async function currentCsrfToken(): Promise<string> {
  if (csrfToken) return csrfToken;
  // Parallel requests share one token fetch instead of racing for several.
  csrfRequest ??= fetchCsrfToken().finally(() => { csrfRequest = null; });
  csrfToken = await csrfRequest;
  return csrfToken;
}

async function readBody(response: Response): Promise<unknown> {
  if (response.status === 204) return undefined;
  const text = await response.text();
  if (text === '') return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return text;
  }
}

async function send<T>(method: HttpMethod, path: string, body?: unknown, token?: string): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (body !== undefined) headers['content-type'] = 'application/json';
  if (token) headers['x-csrf-token'] = token;
  let response: Response;
  try {
    response = await fetch(path, {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, 'network', FALLBACK_MESSAGES.network);
  }
  const parsed = await readBody(response);
  if (!response.ok) {
    const error = toApiError(response.status, parsed);
    if (error.code === 'unauthenticated' && !SESSION_PROBES.some((p) => path.startsWith(p))) onSessionLost?.();
    throw error;
  }
  return parsed as T;
}

/**
 * Sends one request. State-changing requests carry the CSRF token; when the server refuses the
 * token (the session was renewed in another tab, or expired), we fetch a new one and retry once.
 */
export async function request<T>(method: HttpMethod, path: string, body?: unknown): Promise<T> {
  if (!STATE_CHANGING.has(method)) return send<T>(method, path, body);
  try {
    return await send<T>(method, path, body, await currentCsrfToken());
  } catch (error) {
    if (!(isApiError(error) && error.code === 'csrf_failed')) throw error;
    forgetCsrfToken();
    return send<T>(method, path, body, await currentCsrfToken());
  }
}

export const http = {
  get: <T>(path: string) => request<T>('GET', path),
  post: <T>(path: string, body?: unknown) => request<T>('POST', path, body ?? {}),
  put: <T>(path: string, body?: unknown) => request<T>('PUT', path, body ?? {}),
  patch: <T>(path: string, body?: unknown) => request<T>('PATCH', path, body ?? {}),
  delete: <T = void>(path: string) => request<T>('DELETE', path),
};

/** Encodes one path segment (ids and tokens come from URLs and must not add path parts). */
export function seg(value: string | number): string {
  return encodeURIComponent(String(value));
}
