/**
 * The fake SMTP server reads back what nodemailer writes. Decoding rules from RFC 2045 §6.7
 * (quoted-printable, soft line breaks) and RFC 2047 §4 (encoded words); the round trip uses
 * nodemailer's own stream transport as the writer.
 */
import { describe, expect, it } from 'vitest';
import nodemailer from 'nodemailer';
import { decodeEncodedWords, decodeQuotedPrintable, parseMail } from './mime';

describe('mail parsing', () => {
  it('decodes quoted-printable escapes and soft line breaks (RFC 2045 §6.7)', () => {
    expect(decodeQuotedPrintable('caf=C3=A9 =3D ok')).toBe('café = ok');
    expect(decodeQuotedPrintable('a long li=\r\nne')).toBe('a long line');
  });

  it('decodes RFC 2047 encoded words in both encodings', () => {
    expect(decodeEncodedWords('=?UTF-8?Q?Caf=C3=A9_au_lait?=')).toBe('Café au lait');
    expect(decodeEncodedWords('=?UTF-8?B?Q2Fmw6k=?=')).toBe('Café');
  });

  it('reads back a mail nodemailer wrote, with a long link and non-ASCII text intact', async () => {
    const link = `http://127.0.0.1:4100/invite/${'x'.repeat(43)}`;
    const text = `Grüße from Phaseloop.\nChoose your password here:\n${link}\n`;
    const transport = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
    const info = await transport.sendMail({ from: 'Phaseloop <no-reply@phaseloop.invalid>', to: 'Ana <ana@example.test>', subject: 'Einladung für Ana', text });
    const parsed = parseMail((info.message as Buffer).toString('utf8'));
    expect(parsed).toEqual({ from: 'no-reply@phaseloop.invalid', to: ['ana@example.test'], subject: 'Einladung für Ana', text: text.trimEnd() });
  });
});
