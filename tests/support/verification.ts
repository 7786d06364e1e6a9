/**
 * Records one verification check (computed vs target, with its outside source) so that the test
 * run can write docs/verification.md. Each call appends a JSON line to the log named by
 * PHASELOOP_VERIFICATION_LOG (scripts/test.sh sets it and renders the table afterwards).
 * The caller still asserts the tolerance itself: recording never replaces an assertion.
 */
import { appendFileSync, mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';

export type SourceTag = 'pub' | 'closed' | 'mem' | 'practice';

export interface VerificationCheck {
  /** Group heading, e.g. "Elements", "SMA: Lagoudas 2012". */
  suite: string;
  /** Case name, e.g. "NAFEMS LE1, Q8 mesh 8×4: σ_yy at D". */
  name: string;
  computed: number;
  target: number;
  unit: string;
  /** Allowed relative error (e.g. 0.02) or, with `absolute: true`, allowed absolute error. */
  tolerance: number;
  absolute?: boolean;
  /** Named outside source, e.g. "NAFEMS TNSB Rev. 3 (1990), LE1". */
  source: string;
  tag: SourceTag;
}

export function verificationError(c: Pick<VerificationCheck, 'computed' | 'target' | 'absolute'>): number {
  const diff = Math.abs(c.computed - c.target);
  return c.absolute ? diff : diff / Math.max(Math.abs(c.target), 1e-300);
}

export function recordCheck(check: VerificationCheck): { error: number; pass: boolean } {
  const error = verificationError(check);
  const pass = Number.isFinite(check.computed) && error <= check.tolerance;
  const file = process.env.PHASELOOP_VERIFICATION_LOG ?? resolve(process.cwd(), '.phaseloop/verification.jsonl');
  mkdirSync(dirname(file), { recursive: true });
  appendFileSync(file, JSON.stringify({ ...check, error, pass }) + '\n');
  return { error, pass };
}
