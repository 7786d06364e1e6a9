/**
 * RESULT.json: the document the CLI writes and docs/model-format.md describes. Nodal fields are
 * node-major arrays of component arrays (in the order of `nodes`); NaN (no contributing element)
 * is written as null. Integration-point fields are included only when the model asks for them.
 */
import type { FieldName, SectionSpec } from '@phaseloop/shared';
import type { Problem } from '../assembly/problem';
import type { AnalysisResult } from '../solve/nonlinear/driver';
import { nodalField, pointField } from './fields';

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
  history: Record<string, number[]>;
  /** Material-point positions (x, y), present when integration-point fields are written. */
  pointCoordinates?: number[][];
  frames: ResultFrameEntry[];
}

export function buildResultDocument(problem: Problem, result: AnalysisResult, wallSeconds: number): ResultDocument {
  const model = problem.model;
  const fields = model.output.fields as FieldName[];
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
    history,
    ...(model.output.integrationPoints ? { pointCoordinates: rows(problem.pointCoords, 2) as number[][] } : {}),
    frames,
  };
}
