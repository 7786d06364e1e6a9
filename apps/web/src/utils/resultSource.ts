/**
 * Where the results page gets its data. It asks for the split mesh file first; runs stored
 * before the split existed answer 404 there and are read from the whole RESULT.json instead.
 * Split frames are fetched when shown and kept in a small least-recently-used cache, so a run
 * with hundreds of large frames never sits whole in the browser.
 */
import {
  frameValuesOfDocument, isResultDocument, isResultMesh, metaOfDocument, parseFrameFile, RESULT_MESH_FILE,
  type FrameValues, type ResultMeta,
} from './resultFile';

/** A JSON answer: the HTTP status and the parsed body (null when it was not JSON). */
export interface JsonAnswer { status: number; body: unknown }
export type JsonFetcher = (url: string) => Promise<JsonAnswer>;

export interface ResultSourceUrls {
  /** Address of a stored file by name (the split files). */
  file(name: string): string;
  /** Address of the whole RESULT.json. */
  whole: string;
}

export interface ResultSource {
  /** `split` when frames come one file at a time, `whole` for a RESULT.json read at once. */
  readonly kind: 'split' | 'whole';
  readonly meta: ResultMeta;
  /** Nodal values of the frame at `position` in `meta.frames`. `keep: false` does not cache it (probe sweeps). */
  frame(position: number, options?: { keep?: boolean }): Promise<FrameValues>;
  /** The frame if it is already in memory. */
  cached(position: number): FrameValues | undefined;
  /** Starts loading frames in the background (e.g. the neighbours of the one shown). */
  prefetch(positions: readonly number[]): void;
}

/** Raised with the answer's status so the page can show the API's own error. */
export class ResultLoadError extends Error {
  constructor(message: string, readonly status: number, readonly body: unknown) {
    super(message);
  }
}

async function required(fetchJson: JsonFetcher, url: string, what: string): Promise<unknown> {
  const a = await fetchJson(url);
  if (a.status < 200 || a.status >= 300) throw new ResultLoadError(`${what} could not be loaded (HTTP ${a.status})`, a.status, a.body);
  return a.body;
}

/** Most recently used last; the oldest entry goes first when full. */
class FrameCache {
  private readonly entries = new Map<number, FrameValues>();
  constructor(private readonly capacity: number) {}
  get(k: number): FrameValues | undefined {
    const v = this.entries.get(k);
    if (v) { this.entries.delete(k); this.entries.set(k, v); }
    return v;
  }
  set(k: number, v: FrameValues): void {
    this.entries.delete(k);
    this.entries.set(k, v);
    while (this.entries.size > this.capacity) this.entries.delete(this.entries.keys().next().value as number);
  }
  get size(): number { return this.entries.size; }
}

/** Frames kept in memory: the one shown, its neighbours and a little history of scrubbing. */
export const FRAME_CACHE_SIZE = 12;

function splitSource(meta: ResultMeta, urls: ResultSourceUrls, fetchJson: JsonFetcher): ResultSource {
  const cache = new FrameCache(FRAME_CACHE_SIZE);
  const pending = new Map<number, Promise<FrameValues>>();
  const load = (position: number, keep: boolean): Promise<FrameValues> => {
    const hit = cache.get(position);
    if (hit) return Promise.resolve(hit);
    const inFlight = pending.get(position);
    if (inFlight) return inFlight;
    const f = meta.frames[position];
    if (!f?.file) return Promise.reject(new RangeError(`frame ${position} is not in the result`));
    const promise = required(fetchJson, urls.file(f.file), `Frame ${f.index}`)
      .then((body) => parseFrameFile(body, meta, f.index))
      .then((values) => { if (keep) cache.set(position, values); return values; })
      .finally(() => pending.delete(position));
    pending.set(position, promise);
    return promise;
  };
  return {
    kind: 'split',
    meta,
    frame: (position, options) => load(position, options?.keep ?? true),
    cached: (position) => cache.get(position),
    prefetch(positions) {
      for (const p of positions) if (p >= 0 && p < meta.frames.length) load(p, true).catch(() => undefined);
    },
  };
}

function wholeSource(doc: Parameters<typeof metaOfDocument>[0]): ResultSource {
  const meta = metaOfDocument(doc);
  // The document is in memory already; converting a frame is cheap, so only a few are kept.
  const cache = new FrameCache(FRAME_CACHE_SIZE);
  const get = (position: number): FrameValues => {
    let v = cache.get(position);
    if (!v) { v = frameValuesOfDocument(doc, position); cache.set(position, v); }
    return v;
  };
  return {
    kind: 'whole',
    meta,
    frame: (position) => { try { return Promise.resolve(get(position)); } catch (e) { return Promise.reject(e); } },
    cached: (position) => (position >= 0 && position < doc.frames.length ? get(position) : undefined),
    prefetch: () => undefined,
  };
}

/** Opens a run's results: the split mesh file when stored, else the whole RESULT.json. */
export async function openResultSource(urls: ResultSourceUrls, fetchJson: JsonFetcher): Promise<ResultSource> {
  const mesh = await fetchJson(urls.file(RESULT_MESH_FILE));
  if (mesh.status >= 200 && mesh.status < 300) {
    if (!isResultMesh(mesh.body)) throw new ResultLoadError(`${RESULT_MESH_FILE} is not a Phaseloop result mesh file`, 200, mesh.body);
    return splitSource(mesh.body, urls, fetchJson);
  }
  // Only "not stored" falls back: any other failure (no access, server error) is the answer to show.
  if (mesh.status !== 404) throw new ResultLoadError(`${RESULT_MESH_FILE} could not be loaded (HTTP ${mesh.status})`, mesh.status, mesh.body);
  const body = await required(fetchJson, urls.whole, 'result.json');
  if (!isResultDocument(body)) throw new ResultLoadError('result.json is not a Phaseloop result (phaseloop-result/1).', 200, body);
  return wholeSource(body);
}

/** Browser fetch of JSON with the session cookie. */
export const fetchJsonSameOrigin: JsonFetcher = async (url) => {
  const response = await fetch(url, { credentials: 'same-origin', headers: { accept: 'application/json' } });
  const body = (await response.json().catch(() => null)) as unknown;
  return { status: response.status, body };
};
