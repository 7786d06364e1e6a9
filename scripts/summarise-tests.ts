/**
 * Sums the JSON reports of every suite `npm test` ran into the one closing line CI reads:
 * `N passed, N failed` (plus skipped). A suite whose report is missing counts as one failure, so
 * a runner that crashed can never look green.
 *
 *   tsx scripts/summarise-tests.ts vitest:FILE playwright:FILE check:NAME=pass|fail ...
 */
import { existsSync, readFileSync } from 'node:fs';

interface Tally {
  passed: number;
  failed: number;
  skipped: number;
}

interface VitestReport {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests: number;
  numFailedTestSuites: number;
  testResults: { status: string; assertionResults: unknown[]; name: string }[];
}

interface PlaywrightReport {
  stats: { expected: number; unexpected: number; flaky: number; skipped: number };
  errors?: unknown[];
}

function vitest(file: string): Tally {
  const r = JSON.parse(readFileSync(file, 'utf8')) as VitestReport;
  // A test file that failed to load has no assertion results; count it as one failure.
  const brokenFiles = r.testResults.filter((f) => f.status === 'failed' && f.assertionResults.length === 0).length;
  return { passed: r.numPassedTests, failed: r.numFailedTests + brokenFiles, skipped: r.numPendingTests + r.numTodoTests };
}

function playwright(file: string): Tally {
  const r = JSON.parse(readFileSync(file, 'utf8')) as PlaywrightReport;
  const globalErrors = r.errors?.length ?? 0;
  // A flaky test passed only on retry: it is reported as failed, never hidden.
  return { passed: r.stats.expected, failed: r.stats.unexpected + r.stats.flaky + (globalErrors > 0 && r.stats.unexpected === 0 ? 1 : 0), skipped: r.stats.skipped };
}

function main(): void {
  const total: Tally = { passed: 0, failed: 0, skipped: 0 };
  for (const arg of process.argv.slice(2)) {
    const [kind, rest] = [arg.slice(0, arg.indexOf(':')), arg.slice(arg.indexOf(':') + 1)];
    let t: Tally;
    let label = rest;
    if (kind === 'check') {
      const [name, result] = rest.split('=');
      label = name ?? rest;
      t = result === 'pass' ? { passed: 1, failed: 0, skipped: 0 } : { passed: 0, failed: 1, skipped: 0 };
    } else if (!existsSync(rest)) {
      console.log(`summary: no report at ${rest} (the ${kind} run did not finish): counted as 1 failed`);
      t = { passed: 0, failed: 1, skipped: 0 };
    } else {
      try {
        t = kind === 'vitest' ? vitest(rest) : playwright(rest);
      } catch (err) {
        console.log(`summary: unreadable ${kind} report ${rest}: ${String(err)}; counted as 1 failed`);
        t = { passed: 0, failed: 1, skipped: 0 };
      }
    }
    console.log(`summary: ${kind} ${label}: ${t.passed} passed, ${t.failed} failed, ${t.skipped} skipped`);
    total.passed += t.passed;
    total.failed += t.failed;
    total.skipped += t.skipped;
  }
  console.log(`${total.passed} passed, ${total.failed} failed, ${total.skipped} skipped`);
  process.exit(total.failed > 0 || total.passed === 0 ? 1 : 0);
}

main();
