/**
 * SMA integration-point updates per second: fe-core (TypeScript) against a plain C version of the
 * same updates (bench/c/sma_update.c, compiled here with the system cc -O2 in the same run).
 * Two models × two regimes: elastic (trial state admissible) and transforming (return map from
 * austenite into the transformation). Each update also forms the 6×6 consistent tangent.
 *
 * Run: npx tsx bench/material.bench.ts (scripts/bench.sh runs every bench/*.bench.ts).
 * Both sides time CPU seconds of the process (C: CLOCK_PROCESS_CPUTIME_ID) and keep the best of
 * five repetitions, so other work on the machine does not enter the ratio.
 * A second, TypeScript-only table sets the Souza–Auricchio model with tension–compression
 * asymmetry (tc_ratio, lode_shape: demo values) beside the symmetric one on the same workload, in
 * µs per update; bench/c has no version of the asymmetric model, so there is no C column.
 * Writes its section of bench/results.md between <!-- material --> and <!-- /material -->.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { createLagoudas2012 } from '../packages/fe-core/src/material/lagoudas2012';
import { createSouzaAuricchio } from '../packages/fe-core/src/material/souzaAuricchio';
import { createMaterialPointOutput, type Material } from '../packages/fe-core/src/material/types';

const here = dirname(fileURLToPath(import.meta.url));
const COUNT = Number(process.env.MATERIAL_BENCH_COUNT ?? 200_000);
const REPEATS = 5;
/** Workload shared with the C driver (keep the two in step). */
const DIR = [1, -0.35, -0.4, 0.3, 0.1, 0.25];
const T = 37;

type Model = 'lagoudas2012' | 'souza-auricchio';
type Regime = 'elastic' | 'transforming';

function material(model: Model): Material<unknown> {
  if (model === 'lagoudas2012') {
    return createLagoudas2012({
      E_A: 60000, E_M: 45000, nu: 0.33, alpha_A: 1.1e-5, alpha_M: 6.6e-6, T_ref: 20, Ms0: 10, Mf0: -5, As0: 15, Af0: 30,
      C_M: 7, C_A: 7, sigma_star: 300, H_min: 0.02, H_sat: 0.05, k_t: 0.01, n1: 1, n2: 1, n3: 1, n4: 1,
    }) as Material<unknown>;
  }
  return createSouzaAuricchio(SOUZA) as Material<unknown>;
}

const SOUZA = { E: 50000, nu: 0.3, alpha: 0, T_ref: 20, h: 1500, beta: 6, T0: 0, R: 55, eps_L: 0.05 };
/** Demo asymmetry: compression needs 1.3× the stress to start and transforms 1/1.3 of the strain. */
const ASYMMETRY = { tc_ratio: 1.3, lode_shape: 0.8 };

function amplitude(model: Model, regime: Regime): number {
  if (model === 'lagoudas2012') return regime === 'transforming' ? 0.02 : 0.001;
  return regime === 'transforming' ? 0.025 : 0.002;
}

interface Timing {
  perSecond: number;
  reference: number;
}

function runTs(model: Model, regime: Regime, count: number): Timing {
  return timeUpdates(material(model), amplitude(model, regime), count);
}

function timeUpdates(m: Material<unknown>, amp: number, count: number): Timing {
  const stateOld = new Float64Array(m.stateSize);
  const state = new Float64Array(m.stateSize);
  const out = createMaterialPointOutput();
  const strain = new Float64Array(6);
  const input = { strain, strainOld: new Float64Array(6), temperature: T, temperatureOld: T };
  let sink = 0;
  const loop = (n: number) => {
    for (let k = 0; k < n; k++) {
      const f = amp * (1 + 1e-3 * (k % 7));
      for (let i = 0; i < 6; i++) strain[i] = DIR[i] * f;
      m.update(input, stateOld, 0, state, 0, out);
      if (!out.ok) throw new Error(out.message);
      sink += out.stress[0] + out.tangent[7];
    }
  };
  loop(1);
  const reference = out.stress[0];
  loop(Math.min(count, 50_000)); // warm-up for the JIT
  // CPU time (not wall time), best of REPEATS: the machine is shared with other work.
  let best = 0;
  for (let r = 0; r < REPEATS; r++) {
    const c0 = process.cpuUsage();
    loop(count);
    const c = process.cpuUsage(c0);
    const seconds = (c.user + c.system) * 1e-6;
    best = Math.max(best, count / seconds);
  }
  if (!Number.isFinite(sink)) throw new Error('non-finite result');
  return { perSecond: best, reference };
}

function compileC(): string {
  const exe = join(mkdtempSync(join(tmpdir(), 'sma-bench-')), 'sma_update');
  execFileSync('cc', ['-O2', '-o', exe, join(here, 'c', 'sma_update.c'), '-lm']);
  return exe;
}

function runC(exe: string, model: Model, regime: Regime, count: number): Timing {
  let best = 0;
  let reference = NaN;
  for (let r = 0; r < REPEATS; r++) {
    const [rate, ref] = execFileSync(exe, [model, regime, String(count)], { encoding: 'utf8' }).trim().split(/\s+/).map(Number);
    best = Math.max(best, rate);
    reference = ref;
  }
  return { perSecond: best, reference };
}

function fmt(x: number): string {
  return x >= 1e6 ? `${(x / 1e6).toFixed(2)} M` : `${(x / 1e3).toFixed(0)} k`;
}

function writeSection(text: string): void {
  const file = resolve(here, 'results.md');
  const open = '<!-- material -->';
  const close = '<!-- /material -->';
  const block = `${open}\n${text}\n${close}`;
  let doc = existsSync(file) ? readFileSync(file, 'utf8') : '# Benchmark results\n';
  const a = doc.indexOf(open);
  const b = doc.indexOf(close);
  if (a >= 0 && b > a) doc = doc.slice(0, a) + block + doc.slice(b + close.length);
  else doc = `${doc.trimEnd()}\n\n${block}\n`;
  writeFileSync(file, doc);
}

/** Symmetric against asymmetric Souza–Auricchio, TypeScript only (no C version of the latter). */
function asymmetryTable(): string[] {
  // A quarter of the updates: an asymmetric transforming update costs tens of µs.
  const count = Math.max(1, Math.round(COUNT / 4));
  const lines = [
    `### Souza–Auricchio: symmetric vs tension–compression asymmetry (TypeScript only)`,
    '',
    `Same workload as above, ${count.toLocaleString('en')} updates per case; asymmetry tc_ratio ${ASYMMETRY.tc_ratio}, lode_shape ${ASYMMETRY.lode_shape} (demo values). ` +
      'There is no C reference for the asymmetric model.',
    '',
    '| regime | symmetric (µs/update) | asymmetric (µs/update) | asymmetric / symmetric |',
    '|---|---|---|---|',
  ];
  const symmetric = createSouzaAuricchio(SOUZA) as Material<unknown>;
  const asymmetric = createSouzaAuricchio({ ...SOUZA, ...ASYMMETRY }) as Material<unknown>;
  for (const regime of ['elastic', 'transforming'] as const) {
    const amp = amplitude('souza-auricchio', regime);
    const us = (t: Timing): number => 1e6 / t.perSecond;
    const a = us(timeUpdates(symmetric, amp, count));
    const b = us(timeUpdates(asymmetric, amp, count));
    lines.push(`| ${regime} | ${a.toFixed(3)} | ${b.toFixed(3)} | ${(b / a).toFixed(1)}× |`);
  }
  return lines;
}

function main(): void {
  const exe = compileC();
  const lines = [
    '## SMA integration-point updates (stress + 6×6 consistent tangent)',
    '',
    `${COUNT.toLocaleString('en')} updates per case, CPU time, best of ${REPEATS} repetitions, same workload in both languages (bench/c/sma_update.c, cc -O2); ` +
      `${new Date().toISOString().slice(0, 10)}, Node ${process.version}.`,
    '',
    '| model | regime | TypeScript (updates/s) | C (updates/s) | C / TS | same σ11 as C |',
    '|---|---|---|---|---|---|',
  ];
  let worst = 0;
  for (const model of ['lagoudas2012', 'souza-auricchio'] as const) {
    for (const regime of ['elastic', 'transforming'] as const) {
      const ts = runTs(model, regime, COUNT);
      const c = runC(exe, model, regime, COUNT);
      const ratio = c.perSecond / ts.perSecond;
      worst = Math.max(worst, ratio);
      const same = Math.abs(ts.reference - c.reference) <= 1e-9 * Math.abs(c.reference);
      lines.push(`| ${model} | ${regime} | ${fmt(ts.perSecond)} | ${fmt(c.perSecond)} | ${ratio.toFixed(2)}× | ${same ? 'yes' : `NO (${ts.reference} vs ${c.reference})`} |`);
    }
  }
  lines.push('', `Target: within 3× of C — worst case ${worst.toFixed(2)}× (${worst <= 3 ? 'met' : 'not met'}).`);
  lines.push('', ...asymmetryTable());
  const text = lines.join('\n');
  console.log(text);
  writeSection(text);
}

main();
