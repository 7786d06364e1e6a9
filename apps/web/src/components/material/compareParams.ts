/**
 * The parameter table of a side-by-side comparison: every parameter of either version with both
 * values and its unit, and whether they differ. Versions of different models are compared too
 * (a parameter only one of them has shows "—" on the other side and counts as different).
 */
import { flattenParams, materialFields, unitOf } from './materialFields';

export interface CompareRow {
  key: string;
  unit: string;
  a: number | string | undefined;
  b: number | string | undefined;
  differs: boolean;
}

function flatten(params: Record<string, unknown>): Record<string, number | string> {
  const out: Record<string, number | string> = {};
  for (const [key, value] of Object.entries(flattenParams(params))) if (value !== undefined) out[key] = value;
  for (const [key, value] of Object.entries(params)) if (typeof value === 'string') out[key] = value;
  return out;
}

/** Keys in the order the schema lists them for A's model, then B's, then anything else either has. */
function orderedKeys(a: Record<string, unknown>, b: Record<string, unknown>, flatA: object, flatB: object): string[] {
  const keys = ['model'];
  for (const params of [a, b]) for (const f of materialFields(String(params.model ?? ''))) keys.push(f.key);
  keys.push(...Object.keys(flatA), ...Object.keys(flatB));
  const present = new Set([...Object.keys(flatA), ...Object.keys(flatB)]);
  return [...new Set(keys)].filter((k) => present.has(k));
}

export function compareParams(a: Record<string, unknown>, b: Record<string, unknown>): CompareRow[] {
  const flatA = flatten(a);
  const flatB = flatten(b);
  return orderedKeys(a, b, flatA, flatB).map((key) => ({
    key,
    unit: key === 'model' ? '' : unitOf(key),
    a: flatA[key],
    b: flatB[key],
    // Values are stored exactly as entered, so plain equality is the right test (no tolerance hides a change).
    differs: flatA[key] !== flatB[key],
  }));
}

/** How many parameters differ, for the summary line above the table. */
export function countDifferences(rows: readonly CompareRow[]): number {
  return rows.filter((r) => r.differs).length;
}
