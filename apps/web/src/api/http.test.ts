import { describe, expect, it } from 'vitest';
import { ApiError, toApiError } from './http';

// Reference: the API contract — errors are always { error: { code, message, details? } } with the
// codes bad_request, validation_failed, unauthenticated, forbidden, not_found, conflict,
// rate_limited, csrf_failed, internal.
describe('toApiError', () => {
  it('keeps the code, the message and the details of a contract error', () => {
    const details = [{ path: 'email', message: 'Not an e-mail address' }];
    const error = toApiError(422, { error: { code: 'validation_failed', message: 'Some values are not valid', details } });
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(422);
    expect(error.code).toBe('validation_failed');
    expect(error.message).toBe('Some values are not valid');
    expect(error.details).toEqual(details);
  });

  it('falls back to a code from the HTTP status when the body is not the contract shape', () => {
    // RFC 9110 §15: 401 unauthenticated, 403 forbidden, 404 not found, 429 (RFC 6585) too many requests.
    expect(toApiError(401, '<html>').code).toBe('unauthenticated');
    expect(toApiError(403, undefined).code).toBe('forbidden');
    expect(toApiError(404, { message: 'x' }).code).toBe('not_found');
    expect(toApiError(429, null).code).toBe('rate_limited');
    expect(toApiError(502, null).code).toBe('internal');
  });

  it('maps an unknown code by status and never shows an empty message', () => {
    const error = toApiError(403, { error: { code: 'something-else', message: '' } });
    expect(error.code).toBe('forbidden');
    expect(error.message.length).toBeGreaterThan(0);
  });
});
