/**
 * Plain helpers of the printed run report: tables out of the run's frozen snapshot and the
 * result's frame list. No I/O, so each is tested on its own (reportData.test.ts).
 */
import { templates } from '@phaseloop/fe-core/templates/index';
import type { FrameMeta } from '../../utils/resultFile';
import { formFields } from '../../utils/schemaForm';
import { isTemplateName, type HistoryCurve } from '../../utils/templateCurves';
import { flattenParams, materialFields, unitOf } from '../material/materialFields';

/** One labelled value with its unit ("" when the value has none), as the report's tables show it. */
export interface ValueRow {
  label: string;
  value: string;
  unit: string;
}

/** Numbers as engineers read them in a table: 4 significant digits, exponents only when needed. */
export function formatNumber(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const a = Math.abs(v);
  if (a === 0) return '0';
  return a < 1e-3 || a >= 1e5 ? v.toExponential(3) : String(Number(v.toPrecision(4)));
}

function formatParam(value: unknown): string {
  if (typeof value === 'number') return formatNumber(value);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') return value;
  return '—';
}

/**
 * Unit of a history column. Keys are "time", "<point>.<quantity>" and "<sum>.<Fx|Fy|Mz>"
 * (fe-core output/history.ts); an unknown suffix gets no unit rather than a guessed one.
 */
const HISTORY_UNITS: Record<string, string> = {
  time: 's', ux: 'mm', uy: 'mm', rz: 'rad', temperature: '°C', vonMises: 'MPa', sxx: 'MPa', syy: 'MPa', sxy: 'MPa', xi: '–',
  Fx: 'N', Fy: 'N', Mz: 'N·mm',
};
export function historyUnit(key: string): string {
  return HISTORY_UNITS[key.split('.').pop() ?? key] ?? '';
}

/** Template parameters in the study builder's order, with the units its schema states. */
export function templateParamRows(template: unknown, params: Record<string, unknown> | undefined): ValueRow[] {
  if (!isTemplateName(template) || !params) return [];
  return formFields(templates[template].paramsSchema)
    .filter((f) => params[f.key] !== undefined)
    .map((f) => ({ label: f.key, value: formatParam(params[f.key]), unit: f.unit === '–' ? '' : f.unit }));
}

/**
 * A material version's parameters in the form's order with units; keys the form does not know
 * (older parameter sets) follow, so nothing frozen into the run is left out of the report.
 */
export function materialParamRows(model: string, params: Record<string, unknown>): ValueRow[] {
  const flat = flattenParams(params);
  const known = materialFields(model).map((f) => f.key);
  const keys = [...known.filter((k) => flat[k] !== undefined), ...Object.keys(flat).filter((k) => !known.includes(k))];
  return keys.map((key) => ({ label: key, value: formatNumber(flat[key]), unit: unitOf(key) }));
}

/** One segment of the solved history as the report lists it. */
export interface SegmentRow {
  name: string;
  duration: number;
  /** "load = 0.4 mm" style end values: the segment's load targets and its end temperature. */
  endValues: string;
  /** Increment control: the first step as a fraction of the segment, and the smallest allowed. */
  increments: string;
}

interface ModelSegmentLike {
  name?: unknown;
  duration?: unknown;
  targets?: unknown;
  temperature?: unknown;
  /** Template segments (older definitions without a model) give the driving quantity as `load`. */
  load?: unknown;
  increments?: unknown;
}

function endValuesOf(s: ModelSegmentLike): string {
  const parts: string[] = [];
  if (typeof s.targets === 'object' && s.targets !== null) {
    for (const [name, v] of Object.entries(s.targets as Record<string, unknown>)) if (typeof v === 'number') parts.push(`${name} = ${formatNumber(v)}`);
  }
  if (typeof s.load === 'number') parts.push(`load = ${formatNumber(s.load)}`);
  if (typeof s.temperature === 'number') parts.push(`T = ${formatNumber(s.temperature)} °C`);
  return parts.length > 0 ? parts.join(', ') : 'unchanged';
}

function incrementsOf(value: unknown): string {
  if (typeof value === 'number') return `≥ ${value}`;
  const c = value as { initial?: unknown; min?: unknown; max?: unknown } | null;
  if (!c || typeof c !== 'object') return '—';
  const f = (x: unknown) => (typeof x === 'number' ? formatNumber(x) : '—');
  return `first ${f(c.initial)}, min ${f(c.min)}, max ${f(c.max)} of the segment`;
}

/** The model's segments (the history the solver followed) from the frozen definition. */
export function segmentRows(segments: unknown): SegmentRow[] {
  if (!Array.isArray(segments)) return [];
  return (segments as ModelSegmentLike[]).map((s, i) => ({
    name: typeof s.name === 'string' ? s.name : `segment ${i + 1}`,
    duration: typeof s.duration === 'number' ? s.duration : 1,
    endValues: endValuesOf(s),
    increments: incrementsOf(s.increments),
  }));
}

/** The last frame of each segment: the state the segment ends in. */
export interface SegmentEndRow {
  segment: number;
  segmentName: string;
  frame: number;
  time: number;
  values: Record<string, number>;
}

export function segmentEndRows(frames: readonly FrameMeta[]): SegmentEndRow[] {
  const last = new Map<number, FrameMeta>();
  for (const f of frames) {
    const seen = last.get(f.segment);
    if (!seen || f.time >= seen.time) last.set(f.segment, f);
  }
  return [...last.values()]
    .sort((a, b) => a.segment - b.segment)
    .map((f) => ({ segment: f.segment, segmentName: f.segmentName, frame: f.index, time: f.time, values: f.history }));
}

/**
 * Columns of the end-of-segment table: the keys the curves use first (they are what the study is
 * about), then the rest, at most `limit`, so the table still fits an A4 page width.
 */
export function historyColumns(keys: readonly string[], preferred: readonly string[], limit = 6): string[] {
  const candidates = [...preferred, ...keys].filter((k) => k !== 'time' && keys.includes(k));
  return [...new Set(candidates)].slice(0, limit);
}

/** The largest value of one field over every frame, and where it was reached. */
export interface PeakValue {
  field: string;
  label: string;
  unit: string;
  value: number;
  frame: number;
  time: number;
}

const PEAK_FIELDS: { field: string; label: string; unit: string }[] = [
  { field: 'vonMises', label: 'von Mises stress', unit: 'MPa' },
  { field: 'martensiteFraction', label: 'martensite fraction ξ', unit: '–' },
];

/**
 * Peaks over all frames from the per-frame ranges the split result files carry. Frames without
 * ranges (results stored as one RESULT.json) give no peak instead of a partial one.
 */
export function peakValues(frames: readonly FrameMeta[]): PeakValue[] {
  if (frames.length === 0 || frames.some((f) => !f.ranges)) return [];
  const out: PeakValue[] = [];
  for (const spec of PEAK_FIELDS) {
    let best: PeakValue | null = null;
    for (const f of frames) {
      const hi = f.ranges?.[spec.field]?.[0]?.[1];
      if (typeof hi !== 'number' || !Number.isFinite(hi)) continue;
      if (!best || hi > best.value) best = { ...spec, value: hi, frame: f.index, time: f.time };
    }
    if (best) out.push(best);
  }
  return out;
}

/** Solver statistics stored with the result, in a fixed order with words and units. */
const STAT_LABELS: { key: string; label: string; unit: string }[] = [
  { key: 'increments', label: 'Increments', unit: '' },
  { key: 'iterations', label: 'Iterations', unit: '' },
  { key: 'cutBacks', label: 'Cut-backs', unit: '' },
  { key: 'factorisations', label: 'Factorisations', unit: '' },
  { key: 'unknowns', label: 'Unknowns', unit: '' },
  { key: 'wallSeconds', label: 'Wall time', unit: 's' },
];

export function runStatisticRows(stats: unknown, frameCount: number): ValueRow[] {
  const rows: ValueRow[] = [{ label: 'Frames', value: String(frameCount), unit: '' }];
  if (typeof stats !== 'object' || stats === null) return rows;
  const s = stats as Record<string, unknown>;
  for (const { key, label, unit } of STAT_LABELS) {
    const v = s[key];
    if (typeof v === 'number' && Number.isFinite(v)) rows.push({ label, value: formatNumber(v), unit });
  }
  return rows;
}

/** A column that never changes (a held temperature, a rotation of a plane model) says nothing as a curve. */
function varies(values: readonly number[]): boolean {
  const finite = values.filter((v) => Number.isFinite(v));
  return finite.some((v) => v !== finite[0]);
}

/**
 * Curves for a study without a template (uploaded mesh or model document): each history column
 * that changes, against time, at most `limit`, so the report still shows how the run went.
 */
export function historyTimeCurves(history: Record<string, number[]> | undefined, limit = 4): HistoryCurve[] {
  const time = history?.time;
  if (!history || !time) return [];
  return Object.keys(history)
    .filter((k) => k !== 'time' && varies(history[k]!))
    .slice(0, limit)
    .map((key) => {
      const ys = history[key]!;
      const unit = historyUnit(key);
      return {
        title: `${key} against time`,
        xLabel: 'time (s)',
        yLabel: unit ? `${key} (${unit})` : key,
        points: time.map((t, k) => [t, ys[k]!] as [number, number]).filter((p) => Number.isFinite(p[1])),
      };
    });
}

/** Element types and their counts, e.g. "q4-eas × 32". */
export function elementTypeSummary(elements: readonly { type: string }[]): string {
  const counts = new Map<string, number>();
  for (const e of elements) counts.set(e.type, (counts.get(e.type) ?? 0) + 1);
  return [...counts.entries()].map(([t, n]) => `${t} × ${n}`).join(', ') || '—';
}
