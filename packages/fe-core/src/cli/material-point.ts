/**
 * `npm run material-point -- DRIVER.json --out CURVE.csv`
 *
 * Runs one integration point in uniaxial stress along the driver's path and writes a CSV with a
 * header and one row per converged increment (time, strain, stress, temperature, xi, …).
 * Exit codes: 0 done; 1 the path could not be followed (non-convergence, the rows so far are
 * written); 2 bad driver (unreadable JSON, unknown model, missing/out-of-range/non-numeric field,
 * or measured properties the calibration rejects) — the message names the field.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { describeDriverIssues, materialPointDriverSchema } from '@phaseloop/shared';
import { createMaterial } from '../material/index';
import { materialPointCsv, runMaterialPoint } from '../material/materialPoint';

const USAGE = 'usage: npm run material-point -- DRIVER.json [--out CURVE.csv]';

/** Thrown to end the run with an exit code; main() turns it into process.exit. */
class Exit extends Error {
  constructor(
    readonly code: number,
    readonly lines: string[],
  ) {
    super(lines.join('\n'));
  }
}

function fail(code: number, lines: string[]): never {
  throw new Exit(code, lines);
}

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

function parseArgs(argv: string[]): { driver: string; out: string | undefined } {
  let driver: string | undefined;
  let out: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--out' || a === '-o') {
      out = argv[++i];
      if (!out) fail(2, ['--out needs a file name', USAGE]);
    } else if (a.startsWith('--out=')) out = a.slice(6);
    else if (a === '--help' || a === '-h') fail(0, [USAGE]);
    else if (!driver) driver = a;
    else fail(2, [`unexpected argument "${a}"`, USAGE]);
  }
  if (!driver) fail(2, ['missing DRIVER.json', USAGE]);
  return { driver, out };
}

/** The whole command without touching process state (testable in-process). */
export function materialPointCli(argv: string[]): CliResult {
  const io = { stdout: '', stderr: '' };
  try {
    run(argv, io);
    return { code: 0, ...io };
  } catch (e) {
    if (e instanceof Exit) return { code: e.code, stdout: io.stdout, stderr: io.stderr + e.lines.map((l) => `${l}\n`).join('') };
    throw e;
  }
}

function run(argv: string[], io: { stdout: string; stderr: string }): void {
  const args = parseArgs(argv);
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(args.driver, 'utf8'));
  } catch (e) {
    fail(2, [`cannot read ${args.driver}: ${(e as Error).message}`]);
  }
  const parsed = materialPointDriverSchema.safeParse(raw);
  if (!parsed.success) fail(2, [`invalid driver ${args.driver}:`, ...describeDriverIssues(parsed.error, raw).map((l) => `  ${l}`)]);
  const driver = parsed.data;
  let material;
  try {
    material = createMaterial(driver.material);
  } catch (e) {
    fail(2, [`invalid driver ${args.driver}:`, `  material.${(e as Error).message}`]);
  }
  const result = runMaterialPoint(material, driver);
  const csv = materialPointCsv(result.rows);
  if (args.out) writeFileSync(args.out, csv);
  else io.stdout += csv;
  const summary = `${result.rows.length} rows, ${result.subIncrements} sub-increments, ${result.cutBacks} increments cut back`;
  if (!result.ok) fail(1, [`stopped: ${result.message}`, summary]);
  if (args.out) io.stderr += `wrote ${args.out}: ${summary}\n`;
}

function main(): void {
  const r = materialPointCli(process.argv.slice(2));
  process.stdout.write(r.stdout);
  process.stderr.write(r.stderr);
  process.exitCode = r.code;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
