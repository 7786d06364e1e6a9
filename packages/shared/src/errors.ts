/**
 * The error codes of the API's one error shape `{ error: { code, message, details? } }`,
 * shared so that the server that sends them and the client that reads them cannot drift apart.
 */
export const API_ERROR_CODES = [
  'bad_request',
  'validation_failed',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'rate_limited',
  'csrf_failed',
  'internal',
] as const;

export type ApiErrorCodeName = (typeof API_ERROR_CODES)[number];
