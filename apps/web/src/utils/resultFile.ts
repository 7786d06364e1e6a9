/**
 * RESULT.json (format phaseloop-result/1, docs/model-format.md) as the results viewer reads it,
 * and the scalar quantities a contour can show, with their units.
 */

export interface ResultElement { id: number; type: string; nodes: number[]; material?: string }

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
}

export interface ResultDocument {
  format: string;
  title: string;
  status: string;
  message: string;
  stats?: Record<string, number>;
  nodes: number[];
  coordinates: [number, number][];
  elements: ResultElement[];
  fields: Record<string, string[]>;
  history: Record<string, number[]>;
  frames: ResultFrame[];
}

export function isResultDocument(value: unknown): value is ResultDocument {
  const v = value as Partial<ResultDocument> | null;
  return !!v && typeof v === 'object' && Array.isArray(v.nodes) && Array.isArray(v.coordinates) && Array.isArray(v.elements) && Array.isArray(v.frames);
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

export function scalarQuantities(doc: ResultDocument): ScalarQuantity[] {
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
export function nodalValues(frame: ResultFrame, q: ScalarQuantity, out: Float32Array): Float32Array {
  const rows = frame.nodal[q.field];
  for (let i = 0; i < out.length; i++) {
    const row = rows?.[i];
    if (!row) { out[i] = Number.NaN; continue; }
    out[i] = q.component === -1 ? Math.hypot(row[0] ?? 0, row[1] ?? 0) : (row[q.component] ?? Number.NaN);
  }
  return out;
}

export function finiteRange(values: Float32Array): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) { if (Number.isFinite(v)) { if (v < lo) lo = v; if (v > hi) hi = v; } }
  if (!Number.isFinite(lo)) return [0, 1];
  if (hi - lo < 1e-12 * Math.max(1, Math.abs(hi))) return [lo - 0.5 * Math.max(1e-9, Math.abs(lo) * 1e-3), hi + 0.5 * Math.max(1e-9, Math.abs(hi) * 1e-3)];
  return [lo, hi];
}
