/**
 * Pieces every template shares: turning template segments into model segments, the demo
 * materials used when the caller assigns none, size estimates, and the description of the
 * curves a template's results are plotted with.
 */
import type { MaterialParams, Model, SegmentSpec, TemplateSegment } from '@phaseloop/shared';
import { formatPath, MODEL_FORMAT } from '@phaseloop/shared';

/** What a template's `load` means in its history (shown beside the history editor). */
export interface LoadQuantity {
  label: string;
  unit: string;
  /** Value of the quantity before the first segment. */
  initial: number;
}

/** Nodes, elements and nodal unknowns (before supports) of the model a template will build. */
export interface MeshSize {
  nodes: number;
  elements: number;
  dofs: number;
}

/** Mesh size plus the least number of increments the history asks for (for run-time estimates). */
export interface SizeEstimate extends MeshSize {
  increments: number;
}

/**
 * One axis of a results curve: a history value of RESULT.json (`key`, e.g. "grip.Fx") times
 * `scale` (e.g. 2 for a quarter model's force, 100/L for a strain in %) plus `offset`.
 */
export interface CurveAxis {
  key: string;
  scale: number;
  /** Added after scaling (e.g. the stress-free ring diameter). */
  offset?: number;
  label: string;
  unit: string;
}
export interface CurveSpec {
  title: string;
  x: CurveAxis;
  y: CurveAxis;
}

/** Fraction of a segment the driver may give up to when cutting back an increment. */
const CUT_BACK_DEPTH = 256;

/**
 * Model segments from template segments: `toTarget` maps the template's driving quantity to the
 * magnitude of the model load `loadName`; `increments` n gives at most 1/n of the segment per
 * increment so that at least n frames are computed.
 */
export function toModelSegments(history: readonly TemplateSegment[], loadName: string, toTarget: (load: number) => number): SegmentSpec[] {
  return history.map((s) => {
    const step = 1 / s.increments;
    const segment: SegmentSpec = {
      name: s.name,
      duration: s.duration,
      targets: s.load === undefined ? {} : { [loadName]: toTarget(s.load) },
      increments: { initial: step, min: step / CUT_BACK_DEPTH, max: step, maxIterations: 20 },
      frames: 'every',
    };
    if (s.temperature !== undefined) segment.temperature = s.temperature;
    return segment;
  });
}

/** Temperature at the start of a history: the first segment's temperature if it only heats/cools from the given start. */
export function firstTemperature(history: readonly TemplateSegment[], fallback: number): number {
  return history.find((s) => s.temperature !== undefined)?.temperature ?? fallback;
}

/** The model document with the blocks every template fills in the same way. */
export function modelShell(parts: Omit<Model, 'format' | 'solver' | 'units'> & { solver?: Model['solver'] }): Model {
  return {
    format: MODEL_FORMAT,
    units: { length: 'mm', force: 'N', stress: 'MPa', time: 's', temperature: '°C' },
    solver: { forceTolerance: 1e-6, displacementTolerance: 1e-6, lineSearch: false },
    ...parts,
  };
}

export const SMA_FIELDS: Model['output']['fields'] = ['displacement', 'reaction', 'temperature', 'stress', 'strain', 'vonMises', 'martensiteFraction', 'transformationStrain'];

/**
 * Demo superelastic NiTi (demo values, not a real alloy's data): Af0 = 22 °C, so the material
 * is austenitic at body temperature. Lagoudas 2012 inputs as a lab measures them.
 */
export const DEMO_SUPERELASTIC: MaterialParams = {
  model: 'lagoudas2012',
  E_A: 60000,
  E_M: 40000,
  nu: 0.33,
  alpha_A: 0,
  alpha_M: 0,
  T_ref: 20,
  Ms0: -5,
  Mf0: -20,
  As0: 5,
  Af0: 22,
  C_M: 6.5,
  C_A: 7,
  sigma_star: 300,
  H_min: 0.04,
  H_sat: 0.045,
  k_t: 0.01,
  n1: 0.5,
  n2: 0.5,
  n3: 0.5,
  n4: 0.5,
};

/** Demo actuator NiTi (demo values): Af0 = 80 °C, martensitic at room temperature. */
export const DEMO_ACTUATOR: MaterialParams = {
  ...DEMO_SUPERELASTIC,
  model: 'lagoudas2012',
  Ms0: 55,
  Mf0: 40,
  As0: 65,
  Af0: 80,
  C_M: 7,
  C_A: 8,
  sigma_star: 150,
};

/** Cross-section area of a wire (circle) or tube. */
export function circleArea(diameter: number, wallThickness?: number): number {
  const outer = (Math.PI * diameter * diameter) / 4;
  if (wallThickness === undefined) return outer;
  const inner = diameter - 2 * wallThickness;
  return outer - (Math.PI * inner * inner) / 4;
}

export const deg = (a: number) => (a * Math.PI) / 180;

/** Quadrilateral structured block of nx × ny cells: node count for linear (q4) or serendipity (q8) elements. */
export function blockNodes(nx: number, ny: number, type: 'q4' | 'q4-eas' | 'q4-bbar' | 'q8' | 't3' | 't6'): number {
  if (type === 'q8') return (2 * nx + 1) * (2 * ny + 1) - nx * ny;
  if (type === 't6') return (2 * nx + 1) * (2 * ny + 1);
  return (nx + 1) * (ny + 1);
}

/** Nodes on one side of a block with n cells. */
export function sideNodes(n: number, type: string): number {
  return type === 'q8' || type === 't6' ? 2 * n + 1 : n + 1;
}

export function cellsPerQuad(type: string): number {
  return type === 't3' || type === 't6' ? 2 : 1;
}

export interface TemplateIssue {
  path: string;
  message: string;
}

/** Parameters that a template's schema refuses; `issues` name the fields. */
export class TemplateParamsError extends Error {
  constructor(readonly issues: TemplateIssue[]) {
    super(issues.map((i) => `${i.path}: ${i.message}`).join('; '));
    this.name = 'TemplateParamsError';
  }
}

/** Validates and fills defaults, or throws a TemplateParamsError naming every bad field. */
export function parseParams<T>(schema: { safeParse(input: unknown): { success: true; data: T } | { success: false; error: { issues: { path: PropertyKey[]; message: string }[] } } }, input: unknown): T {
  const parsed = schema.safeParse(input);
  if (parsed.success) return parsed.data;
  throw new TemplateParamsError(parsed.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message })));
}
