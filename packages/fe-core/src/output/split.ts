/**
 * RESULT.json split for frame-by-frame loading: one mesh file (everything but the frames' nodal
 * values, plus each frame's value ranges) and one small file per frame with that frame's nodal
 * values. A viewer of a large run then downloads the mesh once and only the frames it shows,
 * while the ranges let it fix a legend over all frames without reading them.
 *
 * The split is derived from the finished RESULT.json document, so the split files hold exactly
 * the numbers RESULT.json holds. This module has no runtime imports, so the web app can share
 * its names and types without pulling in the solver.
 */
import type { ResultDocument, ResultFrameEntry } from './result';

export const RESULT_MESH_FORMAT = 'phaseloop-result-mesh/1';
export const RESULT_FRAME_FORMAT = 'phaseloop-result-frame/1';
export const RESULT_MESH_FILE = 'result-mesh.json';

/** Name of the stored file that holds frame `index` (the frame's own index, not its position). */
export function resultFrameFileName(index: number): string {
  return `result-frame-${index}.json`;
}

/** Smallest and largest finite value (null, null when there is none). */
export type ValueRange = [number | null, number | null];

export interface ResultMeshFrame extends Omit<ResultFrameEntry, 'nodal' | 'points' | 'lineElements'> {
  /** Stored file with this frame's nodal values. */
  file: string;
  /** Per field, the range of each component over the nodes (and the bar and beam values) of this frame. */
  ranges: Record<string, ValueRange[]>;
  /** Range of the in-plane displacement magnitude √(ux² + uy²), when displacement is written. */
  displacementMagnitude?: ValueRange;
}

export interface ResultMesh extends Omit<ResultDocument, 'format' | 'frames'> {
  format: typeof RESULT_MESH_FORMAT;
  /** The RESULT.json format these files were split from. */
  resultFormat: string;
  frames: ResultMeshFrame[];
}

export interface ResultFrameFile {
  format: typeof RESULT_FRAME_FORMAT;
  index: number;
  time: number;
  /** Number of nodes (rows) in every nodal array. */
  nodeCount: number;
  /**
   * Field name → node-major flat array (node 0's components, then node 1's, …; the component
   * names are the mesh file's `fields`); null where RESULT.json has null.
   */
  nodal: Record<string, (number | null)[]>;
  /** Only with `integrationPoints`: the same flat layout per material point. */
  points?: Record<string, (number | null)[]>;
  /** Bars and beams: the same flat layout per element of the mesh file's `lineElements`. */
  lineElements?: Record<string, (number | null)[]>;
}

function flatten(rows: (number | null)[][] | null[], width: number): (number | null)[] {
  const out: (number | null)[] = new Array<number | null>(rows.length * width);
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i];
    for (let c = 0; c < width; c++) out[i * width + c] = r ? (r[c] ?? null) : null;
  }
  return out;
}

function componentRanges(rows: (number | null)[][], width: number): ValueRange[] {
  const lo = new Array<number>(width).fill(Infinity);
  const hi = new Array<number>(width).fill(-Infinity);
  for (const r of rows) {
    if (!r) continue;
    for (let c = 0; c < width; c++) {
      const v = r[c];
      if (typeof v !== 'number' || !Number.isFinite(v)) continue;
      if (v < lo[c]) lo[c] = v;
      if (v > hi[c]) hi[c] = v;
    }
  }
  return lo.map((l, c) => (Number.isFinite(l) ? [l, hi[c]] : [null, null]));
}

function magnitudeRange(rows: (number | null)[][]): ValueRange {
  let lo = Infinity;
  let hi = -Infinity;
  for (const r of rows) {
    if (!r || typeof r[0] !== 'number' || typeof r[1] !== 'number') continue;
    const m = Math.hypot(r[0], r[1]);
    if (m < lo) lo = m;
    if (m > hi) hi = m;
  }
  return Number.isFinite(lo) ? [lo, hi] : [null, null];
}

function widthOf(doc: ResultDocument, field: string, rows: (number | null)[][]): number {
  return doc.fields[field]?.length ?? rows.find((r) => r)?.length ?? 1;
}

/** The mesh file and the frame files of a RESULT.json document. */
export function splitResultDocument(doc: ResultDocument): { mesh: ResultMesh; frames: ResultFrameFile[] } {
  const frames: ResultFrameFile[] = [];
  const meshFrames: ResultMeshFrame[] = [];
  for (const f of doc.frames) {
    const nodal: Record<string, (number | null)[]> = {};
    const ranges: Record<string, ValueRange[]> = {};
    for (const [field, rows] of Object.entries(f.nodal)) {
      const width = widthOf(doc, field, rows);
      nodal[field] = flatten(rows, width);
      ranges[field] = componentRanges([...rows, ...(f.lineElements?.[field] ?? [])], width);
    }
    const file: ResultFrameFile = { format: RESULT_FRAME_FORMAT, index: f.index, time: f.time, nodeCount: doc.nodes.length, nodal };
    if (f.points) {
      file.points = {};
      for (const [field, rows] of Object.entries(f.points)) file.points[field] = flatten(rows, widthOf(doc, field, rows));
    }
    if (f.lineElements) {
      file.lineElements = {};
      for (const [field, rows] of Object.entries(f.lineElements)) file.lineElements[field] = flatten(rows, widthOf(doc, field, rows));
    }
    frames.push(file);
    const { nodal: _nodal, points: _points, lineElements: _lines, ...meta } = f;
    const entry: ResultMeshFrame = { ...meta, file: resultFrameFileName(f.index), ranges };
    if (f.nodal.displacement) entry.displacementMagnitude = magnitudeRange(f.nodal.displacement);
    meshFrames.push(entry);
  }
  const { format, frames: _frames, ...rest } = doc;
  return { mesh: { ...rest, format: RESULT_MESH_FORMAT, resultFormat: format, frames: meshFrames }, frames };
}
