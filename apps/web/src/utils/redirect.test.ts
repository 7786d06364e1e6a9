import { describe, expect, it } from 'vitest';
import { DEFAULT_AFTER_SIGN_IN, safeRedirect } from './redirect';

// Reference: OWASP Unvalidated Redirects and Forwards Cheat Sheet — only allow local paths, and
// treat "//host" and "\\host" (which browsers read as another host) as external.
describe('safeRedirect', () => {
  it('keeps in-app paths with their query', () => {
    expect(safeRedirect('/materials')).toBe('/materials');
    expect(safeRedirect('/admin?tab=mailbox')).toBe('/admin?tab=mailbox');
  });

  it('refuses absolute and protocol-relative URLs', () => {
    expect(safeRedirect('https://evil.example/')).toBe(DEFAULT_AFTER_SIGN_IN);
    expect(safeRedirect('//evil.example/path')).toBe(DEFAULT_AFTER_SIGN_IN);
    expect(safeRedirect('/\\evil.example')).toBe(DEFAULT_AFTER_SIGN_IN);
    expect(safeRedirect('javascript:alert(1)')).toBe(DEFAULT_AFTER_SIGN_IN);
  });

  it('never sends a user back to the sign-in or token pages', () => {
    expect(safeRedirect('/sign-in')).toBe(DEFAULT_AFTER_SIGN_IN);
    expect(safeRedirect('/invite/abc')).toBe(DEFAULT_AFTER_SIGN_IN);
    expect(safeRedirect('/reset/abc')).toBe(DEFAULT_AFTER_SIGN_IN);
  });

  it('reads the first value of a repeated query parameter and ignores non-strings', () => {
    expect(safeRedirect(['/runs', '/studies'])).toBe('/runs');
    expect(safeRedirect(undefined)).toBe(DEFAULT_AFTER_SIGN_IN);
    expect(safeRedirect(42)).toBe(DEFAULT_AFTER_SIGN_IN);
  });
});
