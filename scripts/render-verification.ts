/**
 * Renders docs/verification.md from the JSON lines that verification tests append through
 * tests/support/verification.ts. Run by scripts/test.sh after the test suites:
 *   tsx scripts/render-verification.ts LOG.jsonl docs/verification.md
 * The table is produced by the test run, never typed by hand.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { execSync } from 'node:child_process';
import os from 'node:os';

interface Row {
  suite: string;
  name: string;
  computed: number;
  target: number;
  unit: string;
  tolerance: number;
  absolute?: boolean;
  source: string;
  tag: string;
  error: number;
  pass: boolean;
}

const TAGS: Record<string, string> = {
  pub: 'published benchmark or standard',
  closed: 'closed-form solution',
  mem: 'from memory, to be confirmed',
  practice: 'common practice',
};

function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a !== 0 && (a < 1e-3 || a >= 1e6)) return x.toExponential(4);
  return Number(x.toPrecision(6)).toString();
}

function fmtError(r: Row): string {
  return r.absolute ? `${fmt(r.error)} ${r.unit} (abs)` : `${(r.error * 100).toFixed(3)} %`;
}

function fmtTolerance(r: Row): string {
  return r.absolute ? `${fmt(r.tolerance)} ${r.unit}` : `${(r.tolerance * 100).toFixed(2)} %`;
}

function escape(s: string): string {
  return s.replace(/\|/g, '\\|').replace(/\n/g, ' ');
}

function commit(): string {
  try {
    return execSync('git rev-parse --short HEAD', { encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] }).trim();
  } catch {
    return 'unknown';
  }
}

function render(rows: Row[]): string {
  // Last record wins per (suite, name): a re-run test must not list a case twice.
  const byKey = new Map<string, Row>();
  for (const r of rows) byKey.set(`${r.suite}\u0000${r.name}`, r);
  const unique = [...byKey.values()];
  const suites = [...new Set(unique.map((r) => r.suite))].sort();
  const passed = unique.filter((r) => r.pass).length;
  const lines: string[] = [
    '# Verification table',
    '',
    `Written by \`npm test\` on ${new Date().toISOString().slice(0, 10)} (commit ${commit()}, ${os.cpus().length} CPU, Node ${process.version}).`,
    'Do not edit by hand: every row comes from an asserted test that recorded its computed value.',
    '',
    `${unique.length} cases, ${passed} within tolerance, ${unique.length - passed} outside.`,
    '',
    'Source tags: ' + Object.entries(TAGS).map(([k, v]) => `[${k}] ${v}`).join('; ') + '.',
    '',
    'Phaseloop is an engineering aid: these checks support, and never replace, physical testing, the applicable',
    'standards and regulations, and the judgement of qualified engineers.',
  ];
  for (const suite of suites) {
    lines.push('', `## ${suite}`, '', '| case | computed | target | error | tolerance | result | source |', '|---|---|---|---|---|---|---|');
    for (const r of unique.filter((x) => x.suite === suite)) {
      lines.push(
        `| ${escape(r.name)} | ${fmt(r.computed)} ${r.unit} | ${fmt(r.target)} ${r.unit} | ${fmtError(r)} | ${fmtTolerance(r)} | ${r.pass ? 'pass' : '**FAIL**'} | ${escape(r.source)} [${r.tag}] |`,
      );
    }
  }
  return lines.join('\n') + '\n';
}

function main(): void {
  const [log, out] = process.argv.slice(2);
  if (!log || !out) {
    console.error('usage: tsx scripts/render-verification.ts LOG.jsonl OUT.md');
    process.exit(2);
  }
  if (!existsSync(log)) {
    console.error(`render-verification: no verification log at ${log}; nothing recorded`);
    process.exit(1);
  }
  const rows = readFileSync(log, 'utf8')
    .split('\n')
    .filter((l) => l.trim())
    .map((l) => JSON.parse(l) as Row);
  writeFileSync(out, render(rows));
  console.log(`verification: ${rows.length} records → ${out}`);
}

main();
