/**
 * CSV writers: the history table (one row per frame: time, point outputs, reaction sums) and the
 * nodal table of one frame (one row per node: id, x, y, then every requested field component).
 * Comma separated, a header row, numbers in JavaScript's shortest round-trip form.
 */
import type { FieldName } from '@phaseloop/shared';
import type { Problem } from '../assembly/problem';
import type { Frame } from './frame';
import { nodalField } from './fields';

function cell(v: string | number): string {
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  return /[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

export function historyCsv(frames: readonly Frame[]): string {
  const keys: string[] = [];
  for (const f of frames) for (const k of Object.keys(f.history)) if (k !== 'time' && !keys.includes(k)) keys.push(k);
  const rows = [['frame', 'segment', 'segmentName', 'increment', 'time', ...keys].join(',')];
  for (const f of frames) {
    rows.push([f.index, f.segment, cell(f.segmentName), f.increment, f.time, ...keys.map((k) => cell(f.history[k] ?? Number.NaN))].join(','));
  }
  return rows.join('\n') + '\n';
}

export function nodalCsv(problem: Problem, frame: Frame, fields: readonly FieldName[]): string {
  const data = fields.map((name) => nodalField(problem, frame, name));
  const header = ['node', 'x', 'y'];
  for (const f of data) for (const c of f.components) header.push(`${f.name}.${c}`);
  const rows = [header.join(',')];
  for (let n = 0; n < problem.nodeCount; n++) {
    const row: (string | number)[] = [problem.nodeIds[n], problem.coords[2 * n], problem.coords[2 * n + 1]];
    for (const f of data) for (let c = 0; c < f.components.length; c++) row.push(cell(f.values[n * f.components.length + c]));
    rows.push(row.join(','));
  }
  return rows.join('\n') + '\n';
}
