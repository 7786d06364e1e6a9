/**
 * Just enough MIME to read back the mails Phaseloop itself sends (single-part text, RFC 2045
 * quoted-printable or base64, RFC 2047 encoded words in headers); multipart mails show their
 * first text/plain part.
 */

export interface ParsedMail {
  from: string;
  to: string[];
  subject: string;
  text: string;
}

function splitHeadersBody(raw: string): [string, string] {
  const m = /\r?\n\r?\n/.exec(raw);
  if (!m) return [raw, ''];
  return [raw.slice(0, m.index), raw.slice(m.index + m[0].length)];
}

export function parseHeaders(block: string): Map<string, string> {
  const headers = new Map<string, string>();
  // Unfold continuation lines (RFC 5322 §2.2.3) before splitting name from value.
  for (const line of block.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const i = line.indexOf(':');
    if (i > 0) headers.set(line.slice(0, i).trim().toLowerCase(), line.slice(i + 1).trim());
  }
  return headers;
}

export function decodeQuotedPrintable(input: string): string {
  const bytes: number[] = [];
  const text = input.replace(/=\r?\n/g, '');
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    const hex = text.slice(i + 1, i + 3);
    if (c === '=' && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(parseInt(hex, 16));
      i += 2;
    } else {
      for (const b of Buffer.from(c ?? '', 'utf8')) bytes.push(b);
    }
  }
  return Buffer.from(bytes).toString('utf8');
}

export function decodeEncodedWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?([^?]+)\?([QqBb])\?([^?]*)\?=/g, (_m, _charset: string, enc: string, data: string) =>
      enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64').toString('utf8') : decodeQuotedPrintable(data.replace(/_/g, ' ')),
    );
}

function decodeBody(body: string, transferEncoding: string): string {
  const enc = transferEncoding.toLowerCase();
  if (enc === 'quoted-printable') return decodeQuotedPrintable(body);
  if (enc === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  return body;
}

function firstTextPart(headers: Map<string, string>, body: string): string {
  const type = headers.get('content-type') ?? 'text/plain';
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (/^multipart\//i.test(type) && boundary) {
    for (const part of body.split(`--${boundary}`).slice(1)) {
      const [h, b] = splitHeadersBody(part.replace(/^\r?\n/, ''));
      const ph = parseHeaders(h);
      if (/^text\/plain/i.test(ph.get('content-type') ?? 'text/plain')) return decodeBody(b, ph.get('content-transfer-encoding') ?? '7bit');
    }
    return '';
  }
  return decodeBody(body, headers.get('content-transfer-encoding') ?? '7bit');
}

export function parseMail(raw: string): ParsedMail {
  const [head, body] = splitHeadersBody(raw);
  const headers = parseHeaders(head);
  const addresses = (v: string | undefined) =>
    (v ?? '').split(',').map((a) => (/<([^>]+)>/.exec(a)?.[1] ?? a).trim()).filter((a) => a.length > 0);
  return {
    from: addresses(headers.get('from'))[0] ?? '',
    to: addresses(headers.get('to')),
    subject: decodeEncodedWords(headers.get('subject') ?? ''),
    text: firstTextPart(headers, body).replace(/\r\n/g, '\n').trimEnd(),
  };
}
