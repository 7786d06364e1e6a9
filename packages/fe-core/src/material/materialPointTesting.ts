/**
 * Test helpers for the SMA models (not used by the engine): reading transformation start/finish
 * points off material-point curves, and recording + asserting closed-form checks.
 */
import { expect } from 'vitest';
import { recordCheck, type SourceTag } from '@phaseloop/tests/support/verification';
import type { MaterialPointRow } from './materialPoint';

export interface ClosedCheck {
  suite: string;
  name: string;
  computed: number;
  target: number;
  unit: string;
  tolerance: number;
  absolute?: boolean;
  source: string;
  tag?: SourceTag;
}

/** Records the check for docs/verification.md and asserts it. */
export function assertCheck(c: ClosedCheck): void {
  const { pass, error } = recordCheck({ ...c, tag: c.tag ?? 'closed' });
  expect(Number.isFinite(c.computed), `${c.name}: computed value is not finite`).toBe(true);
  expect(pass, `${c.name}: computed ${c.computed}, target ${c.target}, error ${error} > ${c.tolerance}`).toBe(true);
}

type Key = keyof MaterialPointRow;

/**
 * Where a monotone stretch of `y` crosses `level`, expressed in `x`: the two consecutive rows on
 * the strictly-transforming side nearest the crossing define a line (exact where y is linear in
 * x, as for n = 1 hardening), which is extrapolated to the level.
 *
 * `rows` must be one monotone leg; `inside(y)` selects rows strictly inside the transformation.
 */
export function extrapolateTo(rows: readonly MaterialPointRow[], x: Key, y: Key, level: number, inside: (v: number) => boolean): number {
  const sel = rows.filter((r) => inside(r[y]));
  if (sel.length < 2) throw new Error(`fewer than two transforming rows for ${String(y)}`);
  // nearest two to the level
  sel.sort((a, b) => Math.abs(a[y] - level) - Math.abs(b[y] - level));
  let a = sel[0];
  let b = sel[1];
  for (let k = 1; k < sel.length && Math.abs(b[y] - a[y]) < 1e-9; k++) b = sel[k];
  const slope = (b[x] - a[x]) / (b[y] - a[y]);
  return a[x] + (level - a[y]) * slope;
}

/** Rows of leg k (time in [k−1, k]); leg numbers start at 1. */
export function legRows(rows: readonly MaterialPointRow[], k: number): MaterialPointRow[] {
  return rows.filter((r) => r.time >= k - 1 - 1e-12 && r.time <= k + 1e-12);
}

/** Value of column `y` at x = target by linear interpolation within a monotone leg. */
export function interpolateAt(rows: readonly MaterialPointRow[], x: Key, y: Key, target: number): number {
  for (let i = 1; i < rows.length; i++) {
    const a = rows[i - 1];
    const b = rows[i];
    if ((a[x] - target) * (b[x] - target) <= 0 && a[x] !== b[x]) {
      const f = (target - a[x]) / (b[x] - a[x]);
      return a[y] + f * (b[y] - a[y]);
    }
  }
  throw new Error(`${String(x)} = ${target} is not reached`);
}
