/**
 * RESULT.json: the document the CLI writes and docs/model-format.md describes. Nodal fields are
 * node-major arrays of component arrays (in the order of `nodes`); NaN (no contributing element)
 * is written as null. Integration-point fields are included only when the model asks for them.
 */
import type { FieldName, SectionSpec } from '@phaseloop/shared';
import type { Problem } from '../assembly/problem';
import type { AnalysisResult } from '../solve/nonlinear/driver';
import { nodalField, pointField } from './fields';
import { vonMises, type Frame } from './frame';

export const RESULT_FORMAT = 'phaseloop-result/1';
export const SOLVER_NAME = 'phaseloop fe-core';
export const SOLVER_VERSION = '0.1.0';

function rows(values: ArrayLike<number>, width: number): (number | null)[][] {
  const out: (number | null)[][] = [];
  for (let i = 0; i < values.length; i += width) {
    const r: (number | null)[] = [];
    for (let c = 0; c < width; c++) r.push(Number.isFinite(values[i + c]) ? values[i + c] : null);
    out.push(r);
  }
  return out;
}

/** One frame of RESULT.json. */
export interface ResultFrameEntry {
  index: number;
  segment: number;
  segmentName: string;
  increment: number;
  time: number;
  iterations: number;
  history: Record<string, number>;
  /** Field name → node-major rows of components; null where no element contributes. */
  nodal: Record<string, (number | null)[][]>;
  /** Only with `integrationPoints`: field name → rows per material point. */
  points?: Record<string, (number | null)[][]>;
  /**
   * Bars and beams (the elements listed in the document's `lineElements`, in that order): every
   * requested material-point field at the element's governing point, the one with the largest
   * von Mises stress (a beam's outermost fibre at its most loaded station). Beam fibres are not
   * averaged to nodes, so this is what a contour of a beam can show.
   */
  lineElements?: Record<string, (number | null)[][]>;
}

/** An element as RESULT.json lists it; `section` names an entry of the document's `sections`. */
export interface ResultElementEntry { id: number; type: string; nodes: number[]; material: string; section: string }

export interface ResultDocument {
  format: string;
  title: string;
  solver: { name: string; version: string };
  status: AnalysisResult['status'];
  message: string;
  failure: AnalysisResult['failure'] | null;
  stats: AnalysisResult['stats'] & { wallSeconds: number };
  nodes: number[];
  coordinates: number[][];
  elements: ResultElementEntry[];
  /**
   * The model's sections by name (added in phaseloop-result/1 as an optional key: older documents
   * lack it). The viewer draws bars and beams as solids of their cross-section from it.
   */
  sections?: Record<string, SectionSpec>;
  fields: Record<string, readonly string[]>;
  /** Ids of the bar and beam elements, when there are any: the rows of each frame's `lineElements`. */
  lineElements?: number[];
  history: Record<string, number[]>;
  /** Material-point positions (x, y), present when integration-point fields are written. */
  pointCoordinates?: number[][];
  frames: ResultFrameEntry[];
}

const LINE_KERNELS = new Set(['bar2', 'beam2-eb', 'beam2-timo']);

/** Indices of the bar and beam elements of a problem. */
function lineElementIndices(problem: Problem): number[] {
  const out: number[] = [];
  problem.elements.forEach((el, e) => { if (LINE_KERNELS.has(el.kernel.name)) out.push(e); });
  return out;
}

/** Point fields of a frame at each line element's governing point (largest von Mises stress). */
function lineElementValues(problem: Problem, frame: Frame, fields: readonly FieldName[], lines: readonly number[]): Record<string, (number | null)[][]> | undefined {
  const pointFields = fields.map((name) => ({ name, f: pointField(frame, name) })).filter((x) => x.f !== null);
  if (pointFields.length === 0) return undefined;
  const governing = lines.map((e) => {
    const el = problem.elements[e];
    let best = el.pointOffset;
    let bestVm = -Infinity;
    for (let p = el.pointOffset; p < el.pointOffset + el.points; p++) {
      const vm = vonMises(frame.pointStress, 6 * p);
      if (vm > bestVm) { bestVm = vm; best = p; }
    }
    return best;
  });
  const out: Record<string, (number | null)[][]> = {};
  for (const { name, f } of pointFields) {
    const width = f!.components.length;
    out[name] = governing.map((p) => {
      const row: (number | null)[] = [];
      for (let c = 0; c < width; c++) { const v = f!.values[p * width + c]; row.push(Number.isFinite(v) ? v : null); }
      return row;
    });
  }
  return out;
}

export function buildResultDocument(problem: Problem, result: AnalysisResult, wallSeconds: number): ResultDocument {
  const model = problem.model;
  const fields = model.output.fields as FieldName[];
  const lines = lineElementIndices(problem);
  const componentNames: Record<string, readonly string[]> = {};
  const frames = result.frames.map((frame): ResultFrameEntry => {
    const nodal: Record<string, (number | null)[][]> = {};
    for (const name of fields) {
      const f = nodalField(problem, frame, name);
      componentNames[name] = f.components;
      nodal[name] = rows(f.values, f.components.length);
    }
    const entry: ResultFrameEntry = {
      index: frame.index,
      segment: frame.segment,
      segmentName: frame.segmentName,
      increment: frame.increment,
      time: frame.time,
      iterations: frame.iterations,
      history: frame.history,
      nodal,
    };
    if (model.output.integrationPoints) {
      const points: Record<string, (number | null)[][]> = {};
      for (const name of fields) {
        const p = pointField(frame, name);
        if (p) points[name] = rows(p.values, p.components.length);
      }
      entry.points = points;
    }
    if (lines.length > 0) {
      const values = lineElementValues(problem, frame, fields, lines);
      if (values) entry.lineElements = values;
    }
    return entry;
  });
  const history: Record<string, number[]> = {};
  for (const frame of result.frames) for (const k of Object.keys(frame.history)) history[k] ??= [];
  for (const frame of result.frames) for (const k of Object.keys(history)) history[k].push(frame.history[k] ?? Number.NaN);
  return {
    format: RESULT_FORMAT,
    title: model.title,
    solver: { name: SOLVER_NAME, version: SOLVER_VERSION },
    status: result.status,
    message: result.failure?.message ?? '',
    failure: result.failure ?? null,
    stats: { ...result.stats, wallSeconds },
    nodes: Array.from(problem.nodeIds),
    coordinates: rows(problem.coords, 2) as number[][],
    elements: model.elements.map((e) => ({ id: e.id, type: e.type, nodes: e.nodes, material: e.material, section: e.section })),
    sections: model.sections,
    fields: componentNames,
    ...(lines.length > 0 ? { lineElements: lines.map((e) => problem.elements[e].id) } : {}),
    history,
    ...(model.output.integrationPoints ? { pointCoordinates: rows(problem.pointCoords, 2) as number[][] } : {}),
    frames,
  };
}
