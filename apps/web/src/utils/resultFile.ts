/**
 * Results as the viewer reads them, from either source:
 * - the split files (result-mesh.json once, then result-frame-<k>.json per frame shown), which
 *   large runs need, or
 * - the whole RESULT.json (phaseloop-result/1), for runs stored before the split existed.
 * Both become one `ResultMeta` (everything but nodal values) and `FrameValues` per frame (flat
 * typed arrays, NaN where RESULT.json has null), so the rest of the viewer does not care which.
 */

export interface ResultElement { id: number; type: string; nodes: number[]; material?: string; section?: string }

export interface ResultFrame {
  index: number;
  segment: number;
  segmentName: string;
  increment: number;
  time: number;
  iterations?: number;
  history: Record<string, number>;
  /** Field name → node-major component arrays; null where no element contributes. */
  nodal: Record<string, (number[] | null)[]>;
  /** Bars and beams: field name → rows per element of `lineElements` (optional key). */
  lineElements?: Record<string, ((number | null)[] | null)[]>;
}

/** What both sources share: everything but the frames. */
interface ResultHeader {
  format: string;
  title: string;
  status: string;
  message: string;
  stats?: Record<string, number>;
  nodes: number[];
  coordinates: [number, number][];
  elements: ResultElement[];
  /** Section specs by name (optional key; older documents lack it). */
  sections?: Record<string, unknown>;
  fields: Record<string, string[]>;
  /** Ids of the bar and beam elements that frames carry `lineElements` rows for (optional key). */
  lineElements?: number[];
  history: Record<string, number[]>;
}

export interface ResultDocument extends ResultHeader {
  frames: ResultFrame[];
}

export type ValueRange = [number | null, number | null];

/** A frame without its nodal values: what the slider, the plots and the legend need. */
export interface FrameMeta {
  index: number;
  segment: number;
  segmentName: string;
  increment: number;
  time: number;
  iterations?: number;
  history: Record<string, number>;
  /** Stored file with the frame's nodal values (split files only). */
  file?: string;
  /** Per field, each component's range over the nodes (split files only). */
  ranges?: Record<string, ValueRange[]>;
  displacementMagnitude?: ValueRange;
}

export interface ResultMeta extends ResultHeader {
  frames: FrameMeta[];
}

/** Nodal values of one frame: field name → node-major flat array (width = number of components). */
export interface FrameValues {
  index: number;
  nodal: Record<string, Float32Array>;
  /** Bars and beams, per element of `ResultMeta.lineElements`, in the same flat layout. */
  lines?: Record<string, Float32Array>;
}

export const RESULT_MESH_FILE = 'result-mesh.json';
export const RESULT_MESH_FORMAT = 'phaseloop-result-mesh/1';
export const RESULT_FRAME_FORMAT = 'phaseloop-result-frame/1';

export function isResultDocument(value: unknown): value is ResultDocument {
  const v = value as Partial<ResultDocument> | null;
  return !!v && typeof v === 'object' && Array.isArray(v.nodes) && Array.isArray(v.coordinates) && Array.isArray(v.elements) && Array.isArray(v.frames);
}

export function isResultMesh(value: unknown): value is ResultMeta {
  const v = value as Partial<ResultMeta> | null;
  return !!v && typeof v === 'object' && v.format === RESULT_MESH_FORMAT && Array.isArray(v.nodes) && Array.isArray(v.coordinates)
    && Array.isArray(v.elements) && Array.isArray(v.frames) && v.frames.every((f) => typeof f?.file === 'string');
}

/** The document's frames without their nodal values (the document itself keeps them). */
export function metaOfDocument(doc: ResultDocument): ResultMeta {
  return { ...doc, frames: doc.frames.map(({ nodal: _nodal, lineElements: _lines, ...meta }) => meta) };
}

function widthOf(fields: Record<string, string[]>, name: string, fallback: number): number {
  return fields[name]?.length ?? fallback;
}

/** One RESULT.json frame as flat arrays. */
export function frameValuesOfDocument(doc: ResultDocument, position: number): FrameValues {
  const frame = doc.frames[position];
  if (!frame) throw new RangeError(`frame ${position} is not in the result`);
  const n = doc.nodes.length;
  const nodal: Record<string, Float32Array> = {};
  for (const [name, rows] of Object.entries(frame.nodal)) {
    const width = widthOf(doc.fields, name, rows.find((r) => r)?.length ?? 1);
    const out = new Float32Array(n * width).fill(Number.NaN);
    for (let i = 0; i < n; i++) {
      const r = rows[i];
      if (!r) continue;
      for (let c = 0; c < width; c++) { const v = r[c]; out[i * width + c] = typeof v === 'number' ? v : Number.NaN; }
    }
    nodal[name] = out;
  }
  if (!frame.lineElements) return { index: frame.index, nodal };
  const lines: Record<string, Float32Array> = {};
  for (const [name, rows] of Object.entries(frame.lineElements)) {
    const width = widthOf(doc.fields, name, 1);
    const out = new Float32Array(rows.length * width).fill(Number.NaN);
    rows.forEach((r, i) => { for (let c = 0; c < width; c++) { const v = r?.[c]; if (typeof v === 'number') out[i * width + c] = v; } });
    lines[name] = out;
  }
  return { index: frame.index, nodal, lines };
}

/**
 * A result-frame file checked against the mesh it belongs to. A file of another frame or with
 * arrays of the wrong length is refused rather than drawn on the wrong nodes.
 */
export function parseFrameFile(value: unknown, meta: ResultMeta, expectedIndex: number): FrameValues {
  const v = value as { format?: unknown; index?: unknown; nodal?: unknown } | null;
  if (!v || typeof v !== 'object' || v.format !== RESULT_FRAME_FORMAT) throw new Error(`frame ${expectedIndex} is not a Phaseloop result frame (${RESULT_FRAME_FORMAT})`);
  if (v.index !== expectedIndex) throw new Error(`frame file holds frame ${String(v.index)}, expected ${expectedIndex}`);
  if (!v.nodal || typeof v.nodal !== 'object') throw new Error(`frame ${expectedIndex} has no nodal values`);
  const nodal = flatArrays(v.nodal as Record<string, unknown>, meta.nodes.length, meta.fields, `frame ${expectedIndex}`);
  const rawLines = (v as { lineElements?: unknown }).lineElements;
  if (!rawLines || typeof rawLines !== 'object') return { index: expectedIndex, nodal };
  const lines = flatArrays(rawLines as Record<string, unknown>, meta.lineElements?.length ?? 0, meta.fields, `frame ${expectedIndex} (bars and beams)`);
  return { index: expectedIndex, nodal, lines };
}

function flatArrays(raw: Record<string, unknown>, rows: number, fields: Record<string, string[]>, where: string): Record<string, Float32Array> {
  const out: Record<string, Float32Array> = {};
  for (const [name, flat] of Object.entries(raw)) {
    const width = widthOf(fields, name, 1);
    if (!Array.isArray(flat) || flat.length !== rows * width) throw new Error(`${where}: field ${name} has ${Array.isArray(flat) ? flat.length : 0} values, expected ${rows * width}`);
    const values = new Float32Array(flat.length);
    for (let k = 0; k < flat.length; k++) { const x: unknown = flat[k]; values[k] = typeof x === 'number' ? x : Number.NaN; }
    out[name] = values;
  }
  return out;
}

/** A scalar per node: one component of a field, or the magnitude of the displacement. */
export interface ScalarQuantity {
  key: string;
  label: string;
  unit: string;
  field: string;
  /** Component index, or -1 for the in-plane displacement magnitude. */
  component: number;
  /** Signed quantities are shown on the diverging map around zero. */
  signed: boolean;
  /** Fixed range (martensite fraction is 0…1 by definition). */
  range?: [number, number];
}

const FIELD_INFO: Record<string, { label: string; unit: string; signed: boolean }> = {
  vonMises: { label: 'von Mises stress', unit: 'MPa', signed: false },
  martensiteFraction: { label: 'martensite fraction ξ', unit: '–', signed: false },
  temperature: { label: 'temperature', unit: '°C', signed: false },
  principalStrain: { label: 'principal strain', unit: '–', signed: true },
  principalStress: { label: 'principal stress', unit: 'MPa', signed: true },
  transformationStrain: { label: 'transformation strain', unit: '–', signed: true },
  strain: { label: 'strain', unit: '–', signed: true },
  stress: { label: 'stress', unit: 'MPa', signed: true },
  eqPlasticStrain: { label: 'equivalent plastic strain', unit: '–', signed: false },
  displacement: { label: 'displacement', unit: 'mm', signed: true },
  reaction: { label: 'reaction', unit: 'N', signed: true },
};

/** The order of the contour menu: the quantities an SMA analyst looks at first come first. */
const PREFERRED = ['vonMises', 'martensiteFraction', 'principalStrain', 'transformationStrain', 'temperature', 'principalStress', 'strain', 'stress', 'eqPlasticStrain', 'displacement', 'reaction'];

export function scalarQuantities(doc: Pick<ResultMeta, 'fields'>): ScalarQuantity[] {
  const out: ScalarQuantity[] = [];
  const names = Object.keys(doc.fields).sort((a, b) => rank(a) - rank(b));
  for (const field of names) {
    const info = FIELD_INFO[field] ?? { label: field, unit: '', signed: true };
    const components = doc.fields[field] ?? [];
    if (field === 'displacement') {
      out.push({ key: 'displacement:mag', label: 'displacement magnitude', unit: 'mm', field, component: -1, signed: false });
    }
    if (components.length <= 1) {
      out.push({ key: field, label: info.label, unit: info.unit, field, component: 0, signed: info.signed && field !== 'temperature', range: field === 'martensiteFraction' ? [0, 1] : undefined });
      continue;
    }
    components.forEach((c, i) => {
      if (field === 'displacement' && c === 'rz') return;
      out.push({ key: `${field}:${c}`, label: `${info.label} ${c}`, unit: info.unit, field, component: i, signed: info.signed });
    });
  }
  return out;
}

function rank(field: string): number {
  const i = PREFERRED.indexOf(field);
  return i === -1 ? PREFERRED.length : i;
}

/** Values of a quantity at every node of a frame (NaN where the field has no value). */
export function nodalValues(frame: FrameValues, q: ScalarQuantity, fields: Record<string, string[]>, out: Float32Array): Float32Array {
  const flat = frame.nodal[q.field];
  if (!flat) return out.fill(Number.NaN);
  const width = widthOf(fields, q.field, 1);
  for (let i = 0; i < out.length; i++) {
    const o = i * width;
    out[i] = q.component === -1 ? Math.hypot(flat[o] ?? Number.NaN, flat[o + 1] ?? Number.NaN) : (flat[o + q.component] ?? Number.NaN);
  }
  return out;
}

/**
 * Values of a quantity per bar or beam element (its governing point), placed at the element's
 * position in `elementPosition` order; NaN where the frame has none (nodal fields, old results).
 */
export function lineValues(frame: FrameValues, q: ScalarQuantity, meta: Pick<ResultMeta, 'fields' | 'lineElements'>, elementPosition: ReadonlyMap<number, number>, out: Float32Array): Float32Array {
  out.fill(Number.NaN);
  const flat = frame.lines?.[q.field];
  const ids = meta.lineElements;
  if (!flat || !ids || q.component < 0) return out;
  const width = widthOf(meta.fields, q.field, 1);
  ids.forEach((id, k) => {
    const e = elementPosition.get(id);
    if (e !== undefined && e < out.length) out[e] = flat[k * width + q.component] ?? Number.NaN;
  });
  return out;
}

/** The value of every quantity's field at one node (for the probe's history without keeping frames). */
export function nodeRow(frame: FrameValues, node: number, fields: Record<string, string[]>): Record<string, number[]> {
  const out: Record<string, number[]> = {};
  for (const [name, flat] of Object.entries(frame.nodal)) {
    const width = widthOf(fields, name, 1);
    out[name] = Array.from(flat.subarray(node * width, (node + 1) * width));
  }
  return out;
}

/** Every field of one bar or beam element (its position in `lineElements`) in a frame, as `nodeRow` gives a node's. */
export function lineRow(frame: FrameValues, line: number, fields: Record<string, string[]>): Record<string, number[]> | undefined {
  if (!frame.lines) return undefined;
  const out: Record<string, number[]> = {};
  for (const [name, flat] of Object.entries(frame.lines)) {
    const width = widthOf(fields, name, 1);
    out[name] = Array.from(flat.subarray(line * width, (line + 1) * width));
  }
  return out;
}

/** A quantity's value from a node row (see `nodeRow`). */
export function rowValue(row: Record<string, number[]> | undefined, q: ScalarQuantity): number {
  const r = row?.[q.field];
  if (!r) return Number.NaN;
  return q.component === -1 ? Math.hypot(r[0] ?? Number.NaN, r[1] ?? Number.NaN) : (r[q.component] ?? Number.NaN);
}

/**
 * One quantity against another at a point, frame by frame (stress against strain, ξ against
 * temperature …): pairs where either value is missing are left out rather than drawn as zero.
 */
export function pairHistory(rows: readonly (Record<string, number[]> | undefined)[], x: ScalarQuantity, y: ScalarQuantity): [number, number][] {
  const out: [number, number][] = [];
  for (const row of rows) {
    const a = rowValue(row, x);
    const b = rowValue(row, y);
    if (Number.isFinite(a) && Number.isFinite(b)) out.push([a, b]);
  }
  return out;
}

/** The pair a stress–strain plot at a point starts with: the first stress and strain components. */
export function defaultPair(quantities: readonly ScalarQuantity[]): { x: string; y: string } {
  const x = quantities.find((q) => q.field === 'strain') ?? quantities.find((q) => q.field === 'principalStrain') ?? quantities[0];
  const y = quantities.find((q) => q.field === 'stress') ?? quantities.find((q) => q.field === 'vonMises') ?? quantities[1] ?? quantities[0];
  return { x: x?.key ?? '', y: y?.key ?? '' };
}

/**
 * Range of a quantity over all frames from the ranges the split mesh file carries, without
 * reading a frame; null when a frame lacks them (then the caller scans the frames).
 */
export function rangeFromMeta(meta: ResultMeta, q: ScalarQuantity): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const f of meta.frames) {
    const r = q.component === -1 ? f.displacementMagnitude : f.ranges?.[q.field]?.[q.component];
    if (!r) return null;
    if (r[0] !== null && r[0] < lo) lo = r[0];
    if (r[1] !== null && r[1] > hi) hi = r[1];
  }
  return Number.isFinite(lo) ? widen(lo, hi) : [0, 1];
}

export function finiteRange(values: Float32Array): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) { if (Number.isFinite(v)) { if (v < lo) lo = v; if (v > hi) hi = v; } }
  if (!Number.isFinite(lo)) return [0, 1];
  return widen(lo, hi);
}

/** A range with no width gets a small one, so a uniform field still maps to one colour. */
function widen(lo: number, hi: number): [number, number] {
  if (hi - lo < 1e-12 * Math.max(1, Math.abs(hi))) return [lo - 0.5 * Math.max(1e-9, Math.abs(lo) * 1e-3), hi + 0.5 * Math.max(1e-9, Math.abs(hi) * 1e-3)];
  return [lo, hi];
}
