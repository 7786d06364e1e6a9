import { describe, expect, it } from 'vitest';
import { openResultSource, type JsonAnswer } from './resultSource';
import { lineRow, lineValues, nodalValues, rangeFromMeta, scalarQuantities, type ResultDocument } from './resultFile';

/** Two nodes, one bar, two frames; node 1 has no von Mises value (null). */
const doc: ResultDocument = {
  format: 'phaseloop-result/1', title: 't', status: 'succeeded', message: '',
  nodes: [1, 2], coordinates: [[0, 0], [10, 0]],
  elements: [{ id: 1, type: 'bar2', nodes: [1, 2], section: 'wire' }],
  sections: { wire: { kind: 'bar', area: 1 } },
  fields: { displacement: ['ux', 'uy', 'rz'], vonMises: ['value'] },
  lineElements: [1],
  history: { time: [0, 1] },
  frames: [
    { index: 0, segment: 0, segmentName: 'pull', increment: 0, time: 0, history: { time: 0 }, nodal: { displacement: [[0, 0, 0], [0, 0, 0]], vonMises: [[0], null] } },
    { index: 1, segment: 0, segmentName: 'pull', increment: 1, time: 1, history: { time: 1 }, nodal: { displacement: [[0, 0, 0], [3, 4, 0]], vonMises: [[120], null] }, lineElements: { vonMises: [[150]] } },
  ],
};

/** The split files of `doc`, written out by hand as the worker stores them. */
const files: Record<string, unknown> = {
  'result-mesh.json': {
    format: 'phaseloop-result-mesh/1', resultFormat: 'phaseloop-result/1', title: 't', status: 'succeeded', message: '',
    nodes: doc.nodes, coordinates: doc.coordinates, elements: doc.elements, sections: doc.sections, fields: doc.fields, lineElements: [1], history: doc.history,
    frames: doc.frames.map(({ nodal: _n, lineElements: _l, ...f }) => ({
      ...f, file: `result-frame-${f.index}.json`,
      ranges: { displacement: f.index ? [[0, 3], [0, 4], [0, 0]] : [[0, 0], [0, 0], [0, 0]], vonMises: [[f.index ? 120 : 0, f.index ? 120 : 0]] },
      displacementMagnitude: f.index ? [0, 5] : [0, 0],
    })),
  },
  'result-frame-0.json': { format: 'phaseloop-result-frame/1', index: 0, time: 0, nodeCount: 2, nodal: { displacement: [0, 0, 0, 0, 0, 0], vonMises: [0, null] } },
  'result-frame-1.json': { format: 'phaseloop-result-frame/1', index: 1, time: 1, nodeCount: 2, nodal: { displacement: [0, 0, 0, 3, 4, 0], vonMises: [120, null] }, lineElements: { vonMises: [150] } },
};

function server(stored: Record<string, unknown>, whole: unknown) {
  const requests: string[] = [];
  const fetchJson = async (url: string): Promise<JsonAnswer> => {
    requests.push(url);
    if (url === 'whole') return whole ? { status: 200, body: whole } : { status: 404, body: null };
    const name = url.replace('file:', '');
    return name in stored ? { status: 200, body: stored[name] } : { status: 404, body: { error: { code: 'not_found' } } };
  };
  return { requests, fetchJson, urls: { file: (n: string) => `file:${n}`, whole: 'whole' } };
}

describe('result source', () => {
  it('reads the mesh file, then only the frame asked for; the values equal RESULT.json', async () => {
    const s = server(files, doc);
    const source = await openResultSource(s.urls, s.fetchJson);
    expect(source.kind).toBe('split');
    expect(s.requests).toEqual(['file:result-mesh.json']);
    const f1 = await source.frame(1);
    expect(s.requests).toEqual(['file:result-mesh.json', 'file:result-frame-1.json']);
    const vm = scalarQuantities(source.meta).find((q) => q.key === 'vonMises')!;
    const mag = scalarQuantities(source.meta).find((q) => q.key === 'displacement:mag')!;
    const out = new Float32Array(2);
    expect(Array.from(nodalValues(f1, vm, source.meta.fields, out))).toEqual([120, Number.NaN]);
    expect(Array.from(nodalValues(f1, mag, source.meta.fields, out))).toEqual([0, 5]);
    expect(Array.from(lineValues(f1, vm, source.meta, new Map([[1, 0]]), new Float32Array(1)))).toEqual([150]);
    expect(lineRow(f1, 0, source.meta.fields)).toEqual({ vonMises: [150] });
    // A second request for the same frame comes from the cache.
    await source.frame(1);
    expect(s.requests.length).toBe(2);
    // Legend ranges come from the mesh file, without reading frame 0.
    expect(rangeFromMeta(source.meta, vm)).toEqual([0, 120]);
    expect(rangeFromMeta(source.meta, mag)).toEqual([0, 5]);
  });

  it('falls back to result.json when the run has no split files, with the same values', async () => {
    const s = server({}, doc);
    const source = await openResultSource(s.urls, s.fetchJson);
    expect(source.kind).toBe('whole');
    expect(s.requests).toEqual(['file:result-mesh.json', 'whole']);
    const vm = scalarQuantities(source.meta).find((q) => q.key === 'vonMises')!;
    const f1 = await source.frame(1);
    expect(Array.from(nodalValues(f1, vm, source.meta.fields, new Float32Array(2)))).toEqual([120, Number.NaN]);
    expect(source.meta.frames[1]).not.toHaveProperty('nodal');
    // The bar's own value (its governing point) sits at the element's position in the mesh.
    const positions = new Map([[1, 0]]);
    expect(Array.from(lineValues(f1, vm, source.meta, positions, new Float32Array(1)))).toEqual([150]);
    expect(Array.from(lineValues(await source.frame(0), vm, source.meta, positions, new Float32Array(1)))).toEqual([Number.NaN]);
    // Without stored ranges the caller has to scan the frames.
    expect(rangeFromMeta(source.meta, vm)).toBeNull();
  });

  it('refuses a frame file of the wrong frame or length, and does not fall back on a refusal other than 404', async () => {
    const wrong = server({ ...files, 'result-frame-1.json': { ...(files['result-frame-0.json'] as object) } }, doc);
    const source = await openResultSource(wrong.urls, wrong.fetchJson);
    await expect(source.frame(1)).rejects.toThrow(/holds frame 0, expected 1/);
    const short = server({ ...files, 'result-frame-0.json': { format: 'phaseloop-result-frame/1', index: 0, nodal: { vonMises: [1] } } }, doc);
    await expect((await openResultSource(short.urls, short.fetchJson)).frame(0)).rejects.toThrow(/vonMises has 1 values, expected 2/);
    const forbidden = { urls: wrong.urls, fetchJson: async (): Promise<JsonAnswer> => ({ status: 403, body: null }) };
    await expect(openResultSource(forbidden.urls, forbidden.fetchJson)).rejects.toThrow(/HTTP 403/);
  });
});
