/**
 * bench/results.md is shared by every benchmark: each one owns the text between its two markers
 * and rewrites only that, so running one benchmark keeps the others' sections.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const RESULTS_FILE = resolve(dirname(fileURLToPath(import.meta.url)), '..', 'results.md');

const HEADER = '# Benchmark results\n\nWritten by `npm run bench` (scripts/bench.sh); each section is rewritten only by its own benchmark.\n';

/** Replaces (or appends) the section `name` of results.md with `body`. */
export function writeSection(name: string, body: string, file = RESULTS_FILE): void {
  const start = `<!-- bench:${name}:start -->`;
  const end = `<!-- bench:${name}:end -->`;
  const block = `${start}\n${body.trim()}\n${end}`;
  let text = existsSync(file) ? readFileSync(file, 'utf8') : HEADER;
  const i = text.indexOf(start);
  const j = text.indexOf(end);
  if (i >= 0 && j > i) text = text.slice(0, i) + block + text.slice(j + end.length);
  else text = `${text.trimEnd()}\n\n${block}\n`;
  writeFileSync(file, text.endsWith('\n') ? text : `${text}\n`);
}

/** Markdown table from a header row and data rows. */
export function markdownTable(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]): string => `| ${cells.join(' | ')} |`;
  return [line(header), line(header.map(() => '---')), ...rows.map(line)].join('\n');
}
