/**
 * Only in-app paths may be used as a redirect target after sign-in; anything else (absolute URLs,
 * protocol-relative `//host`, backslash tricks) falls back to the start page.
 */
export const DEFAULT_AFTER_SIGN_IN = '/projects';

export function safeRedirect(target: unknown): string {
  const value = Array.isArray(target) ? target[0] : target;
  if (typeof value !== 'string' || value === '') return DEFAULT_AFTER_SIGN_IN;
  if (!value.startsWith('/') || value.startsWith('//') || value.includes('\\')) return DEFAULT_AFTER_SIGN_IN;
  if (/^\/(sign-in|forgot-password|reset\/|invite\/)/.test(value)) return DEFAULT_AFTER_SIGN_IN;
  return value;
}
