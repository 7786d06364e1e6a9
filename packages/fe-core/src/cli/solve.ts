/**
 * Command line: solve a model document and write RESULT.json (and optionally VTU/PVD and CSV).
 *
 *   npm run solve -- MODEL.json --out RESULT.json [--vtu DIR] [--csv DIR] [--quiet]
 *
 * Progress goes to stderr. Bad input (unreadable file, schema or reference errors, an
 * unconstrained model) exits with 2, a solve that fails to converge with 1 (RESULT.json is
 * still written with the converged frames and the reason). Errors are printed as sentences,
 * never as stack traces.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';
import { parseModel } from '@phaseloop/shared';
import { buildProblem, ModelError } from '../assembly/problem';
import { runAnalysis, type AnalysisResult } from '../solve/nonlinear/driver';
import { defaultSolverFactory } from '../solve/nonlinear/solverChoice';
import { buildResultDocument } from '../output/result';
import { frameToVtu, framesToPvd, vtuFileName } from '../output/vtu';
import { historyCsv, nodalCsv } from '../output/csv';

export const EXIT_OK = 0;
export const EXIT_SOLVE_FAILED = 1;
export const EXIT_BAD_INPUT = 2;

interface Args {
  model: string;
  out: string;
  vtu?: string;
  csv?: string;
  quiet: boolean;
}

const USAGE = 'usage: npm run solve -- MODEL.json --out RESULT.json [--vtu DIR] [--csv DIR] [--quiet]';

class UsageError extends Error {}

export function parseArgs(argv: readonly string[]): Args {
  const args: Partial<Args> = { quiet: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = () => {
      const v = argv[++i];
      if (v === undefined || v.startsWith('--')) throw new UsageError(`${a} needs a value`);
      return v;
    };
    if (a === '--out') args.out = value();
    else if (a === '--vtu') args.vtu = value();
    else if (a === '--csv') args.csv = value();
    else if (a === '--quiet') args.quiet = true;
    else if (a === '--help' || a === '-h') throw new UsageError('');
    else if (a.startsWith('--')) throw new UsageError(`unknown option ${a}`);
    else if (args.model === undefined) args.model = a;
    else throw new UsageError(`unexpected argument ${a}`);
  }
  if (!args.model) throw new UsageError('the model file is missing');
  if (!args.out) throw new UsageError('--out RESULT.json is missing');
  return args as Args;
}

/** Everything the CLI does, with its streams injected (the tests call this directly). */
export function runCli(argv: readonly string[], log: (line: string) => void = (l) => process.stderr.write(l + '\n')): number {
  let args: Args;
  try {
    args = parseArgs(argv);
  } catch (err) {
    if (err instanceof UsageError) {
      if (err.message) log(`error: ${err.message}`);
      log(USAGE);
      return EXIT_BAD_INPUT;
    }
    throw err;
  }

  let text: string;
  try {
    text = readFileSync(args.model, 'utf8');
  } catch (err) {
    log(`error: cannot read ${args.model}: ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`);
    return EXIT_BAD_INPUT;
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    log(`error: ${args.model} is not valid JSON: ${(err as Error).message}`);
    return EXIT_BAD_INPUT;
  }
  const parsed = parseModel(json);
  if (!parsed.ok) {
    log(`error: ${args.model} is not a valid model (${parsed.issues.length} problem${parsed.issues.length > 1 ? 's' : ''}):`);
    for (const issue of parsed.issues.slice(0, 50)) log(`  at ${issue.path}: ${issue.message}`);
    if (parsed.issues.length > 50) log(`  … and ${parsed.issues.length - 50} more`);
    return EXIT_BAD_INPUT;
  }
  const model = parsed.model;

  let problem;
  try {
    problem = buildProblem(model);
  } catch (err) {
    if (err instanceof ModelError) {
      log(`error: ${err.path ? `at ${err.path}: ` : ''}${err.message}`);
      return EXIT_BAD_INPUT;
    }
    throw err;
  }

  const say = args.quiet ? () => {} : log;
  say(`model "${model.title || basename(args.model)}": ${problem.nodeCount} nodes, ${problem.elements.length} elements, ${problem.nDof} dofs`);
  const started = performance.now();
  const result: AnalysisResult = runAnalysis(problem, {
    createSolver: defaultSolverFactory(problem),
    onIteration: (i) =>
      say(
        `  segment ${i.segment + 1} "${i.segmentName}" increment ${i.increment} iteration ${i.iteration}: ` +
          `t = ${i.time.toPrecision(4)} s, residual ${i.residualNorm.toExponential(2)}` +
          (Number.isFinite(i.correctionNorm) ? `, correction ${i.correctionNorm.toExponential(2)}` : ''),
      ),
    onCutBack: (c) => say(`  cut back in segment "${c.segmentName}" at t = ${c.time.toPrecision(4)} s (${c.reason}); new step ${c.newStep.toPrecision(3)} of the segment`),
    onFrame: (f) => say(`frame ${f.index}: segment "${f.segmentName}", t = ${f.time.toPrecision(4)} s`),
  });
  const wall = (performance.now() - started) / 1000;

  const doc = buildResultDocument(problem, result, wall);
  writeFileSync(args.out, JSON.stringify(doc));
  say(`wrote ${args.out}`);
  if (args.vtu) {
    const dir = resolve(args.vtu);
    mkdirSync(dir, { recursive: true });
    const entries = result.frames.map((f, k) => {
      const file = vtuFileName(k);
      writeFileSync(join(dir, file), frameToVtu(problem, f, model.output.fields));
      return { time: f.time, file };
    });
    writeFileSync(join(dir, 'frames.pvd'), framesToPvd(entries));
    say(`wrote ${entries.length} VTU frames and frames.pvd to ${dir}`);
  }
  if (args.csv) {
    const dir = resolve(args.csv);
    mkdirSync(dir, { recursive: true });
    writeFileSync(join(dir, 'history.csv'), historyCsv(result.frames));
    const last = result.frames.at(-1);
    if (last) writeFileSync(join(dir, 'nodes_last_frame.csv'), nodalCsv(problem, last, model.output.fields));
    say(`wrote history.csv and nodes_last_frame.csv to ${dir}`);
  }

  if (result.status === 'succeeded') {
    say(`done: ${result.stats.increments} increments, ${result.stats.iterations} iterations, ${result.stats.cutBacks} cut-backs, ${wall.toFixed(2)} s`);
    return EXIT_OK;
  }
  const failure = result.failure!;
  log(`error: ${failure.message}`);
  return failure.kind === 'unconstrained' || failure.kind === 'bad-model' ? EXIT_BAD_INPUT : EXIT_SOLVE_FAILED;
}

// Run only when executed as a script (tsx packages/fe-core/src/cli/solve.ts …), not when imported.
const invoked = process.argv[1] ? resolve(process.argv[1]) : '';
if (invoked.endsWith(join('cli', 'solve.ts')) || invoked.endsWith(join('cli', 'solve.js'))) {
  try {
    process.exitCode = runCli(process.argv.slice(2));
  } catch (err) {
    process.stderr.write(`internal error: ${(err as Error).message}\nPlease report this with the model file.\n`);
    process.exitCode = EXIT_SOLVE_FAILED;
  }
}
