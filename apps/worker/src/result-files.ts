/**
 * The files a finished (or stopped) solve leaves besides the per-frame VTU pieces: RESULT.json,
 * and its split for frame-by-frame loading (result-mesh.json and result-frame-<k>.json, see
 * docs/model-format.md). They are ordinary stored result files, served by the files route.
 */
import type { ResultDocument } from '@phaseloop/fe-core';
import { RESULT_MESH_FILE, splitResultDocument } from '@phaseloop/fe-core/output/split';
import type { OutputFile } from './solver';

const JSON_TYPE = 'application/json';

/** The split files of a RESULT.json document, encoded: the mesh file first, then one per frame. */
export function splitResultFiles(doc: ResultDocument, encoder = new TextEncoder()): OutputFile[] {
  const { mesh, frames } = splitResultDocument(doc);
  return [
    { name: RESULT_MESH_FILE, contentType: JSON_TYPE, bytes: encoder.encode(JSON.stringify(mesh)) },
    ...frames.map((f, k) => ({ name: mesh.frames[k]!.file, contentType: JSON_TYPE, bytes: encoder.encode(JSON.stringify(f)) })),
  ];
}
