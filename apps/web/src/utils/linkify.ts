/**
 * Splits plain text into text and http(s) link parts, so templates can render links as elements
 * without ever injecting HTML.
 */
export interface TextPart {
  kind: 'text' | 'link';
  text: string;
}

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;
/** Sentence punctuation that ends a link written at the end of a sentence. */
const TRAILING = /[.,;:!?)\]]+$/;

export function splitLinks(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index ?? 0;
    const url = match[0].replace(TRAILING, '');
    if (start > last) parts.push({ kind: 'text', text: text.slice(last, start) });
    parts.push({ kind: 'link', text: url });
    last = start + url.length;
  }
  if (last < text.length) parts.push({ kind: 'text', text: text.slice(last) });
  return parts;
}
