import { describe, expect, it } from 'vitest';
import { splitLinks } from './linkify';

// Reference: RFC 3986 §2 — a URI has no spaces, quotes or angle brackets; sentence punctuation after
// a link in prose is not part of it (the common reading of RFC 3986 Appendix C, "delimiting a URI").
describe('splitLinks', () => {
  it('keeps the text around a link and the link itself, in order', () => {
    const parts = splitLinks('Accept here: http://127.0.0.1:4199/invite/Ab_c-9 and welcome.');
    expect(parts).toEqual([
      { kind: 'text', text: 'Accept here: ' },
      { kind: 'link', text: 'http://127.0.0.1:4199/invite/Ab_c-9' },
      { kind: 'text', text: ' and welcome.' },
    ]);
  });

  it('leaves the full stop of a sentence outside the link', () => {
    const parts = splitLinks('Open https://phaseloop.example/reset/xyz.');
    expect(parts[1]).toEqual({ kind: 'link', text: 'https://phaseloop.example/reset/xyz' });
    expect(parts[2]).toEqual({ kind: 'text', text: '.' });
  });

  it('links only http and https, so a mail cannot smuggle a script link', () => {
    const parts = splitLinks('javascript:alert(1) ftp://host/file');
    expect(parts.every((p) => p.kind === 'text')).toBe(true);
    expect(parts.map((p) => p.text).join('')).toBe('javascript:alert(1) ftp://host/file');
  });
});
