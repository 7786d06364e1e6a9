/**
 * Import of Gmsh meshes (.msh, ASCII formats 2.2 and 4.1) into a `MeshPart` of the model format.
 *
 * Supported element types (Gmsh type numbers): 1 two-node line, 8 three-node line (edges of
 * quadratic elements), 2 three-node triangle → t3, 3 four-node quadrilateral → q4 (or the
 * chosen Q4 variant), 9 six-node triangle → t6, 16 eight-node quadrilateral → q8, 10 nine-node
 * quadrilateral → q8 (the centre node is dropped, so the element is serendipity, not Lagrange),
 * 15 point. 3D elements and higher orders are refused.
 *
 * Physical groups become named sets: every group gives a node set of all its nodes; groups of
 * curves give edge sets (each line element matched to the edge of a 2D element it lies on);
 * groups of surfaces give element sets, and the first surface group of an element is its
 * section and material name (so the model's `sections` and `materials` are keyed by group
 * name; "default" for elements outside every group). A mesh of lines only becomes bar2 (or
 * beam2) elements grouped by curve groups.
 *
 * 2D only: z is ignored but must be the same for every node. Every problem in the file is
 * reported as a GmshFormatError naming the line number and what was expected there.
 */
import type { EdgeRef, MeshElement, MeshPart } from './structured';

export class GmshFormatError extends Error {
  constructor(
    readonly line: number,
    detail: string,
  ) {
    super(`line ${line}: ${detail}`);
    this.name = 'GmshFormatError';
  }
}

export interface GmshOptions {
  /** Model element type for 4-node quadrilaterals (default q4). */
  quadType?: 'q4' | 'q4-eas' | 'q4-bbar';
  /** Model element type for line meshes without 2D elements (default bar2). */
  lineType?: 'bar2' | 'beam2';
}

export interface GmshMesh extends MeshPart {
  version: '2.2' | '4.1';
  /** Element ids per physical group of the elements' dimension. */
  elementSets: Record<string, number[]>;
  /** Things imported with a change the user should know of (dropped nodes, converted types). */
  warnings: string[];
}

type Dim = 0 | 1 | 2;

interface GmshType {
  dim: Dim;
  nodes: number;
  label: string;
}

/** Gmsh element type number → dimension and node count (the types this importer reads). */
const GMSH_TYPES: Record<number, GmshType> = {
  1: { dim: 1, nodes: 2, label: '2-node line' },
  2: { dim: 2, nodes: 3, label: '3-node triangle' },
  3: { dim: 2, nodes: 4, label: '4-node quadrilateral' },
  8: { dim: 1, nodes: 3, label: '3-node line' },
  9: { dim: 2, nodes: 6, label: '6-node triangle' },
  10: { dim: 2, nodes: 9, label: '9-node quadrilateral' },
  15: { dim: 0, nodes: 1, label: 'point' },
  16: { dim: 2, nodes: 8, label: '8-node quadrilateral' },
};

interface RawElement {
  tag: number;
  type: number;
  nodes: number[];
  physicals: number[];
  line: number;
}

interface RawMesh {
  version: '2.2' | '4.1';
  physicalNames: Map<string, string>;
  nodes: Map<number, { x: number; y: number; z: number; line: number }>;
  elements: RawElement[];
}

/** Line-by-line reader that knows its line number for messages. */
class Lines {
  private readonly lines: string[];
  private index = 0;
  constructor(text: string) {
    this.lines = text.split(/\r?\n/);
  }
  /** 1-based number of the line `next()` returned last. */
  get lineNumber(): number {
    return this.index;
  }
  get done(): boolean {
    let i = this.index;
    while (i < this.lines.length && this.lines[i].trim() === '') i++;
    return i >= this.lines.length;
  }
  /** Next non-empty line, trimmed. */
  next(expected: string): string {
    while (this.index < this.lines.length) {
      const text = this.lines[this.index++].trim();
      if (text !== '') return text;
    }
    throw new GmshFormatError(this.lines.length, `the file ends where ${expected} was expected`);
  }
  tokens(expected: string): string[] {
    return this.next(expected).split(/\s+/);
  }
  fail(detail: string): never {
    throw new GmshFormatError(this.index, detail);
  }
  /** Integers of the next line, at least `min` of them. */
  ints(expected: string, min: number): number[] {
    const t = this.tokens(expected);
    if (t.length < min) this.fail(`expected ${expected}, found "${t.join(' ')}"`);
    return t.map((s) => {
      if (!/^[-+]?\d+$/.test(s)) this.fail(`expected ${expected}, found "${s}" (not an integer)`);
      return Number(s);
    });
  }
  numbers(expected: string, min: number): number[] {
    const t = this.tokens(expected);
    if (t.length < min) this.fail(`expected ${expected}, found "${t.join(' ')}"`);
    return t.map((s) => {
      const v = Number(s);
      if (s === '' || !Number.isFinite(v)) this.fail(`expected ${expected}, found "${s}" (not a number)`);
      return v;
    });
  }
  expectEnd(section: string): void {
    const t = this.next(`$End${section}`);
    if (t !== `$End${section}`) this.fail(`expected $End${section}, found "${t}" (a count earlier in the section may be wrong)`);
  }
  skipSection(section: string): void {
    for (;;) if (this.next(`$End${section}`) === `$End${section}`) return;
  }
}

export function parseGmsh(text: string, options: GmshOptions = {}): GmshMesh {
  return toMeshPart(readRaw(text), options);
}

function readRaw(text: string): RawMesh {
  const lines = new Lines(text);
  const first = lines.next('$MeshFormat');
  if (first !== '$MeshFormat') lines.fail(`expected $MeshFormat on the first line, found "${first.slice(0, 40)}" (is this a Gmsh .msh file?)`);
  const [versionText, fileType] = lines.tokens('"version file-type data-size"');
  const version: RawMesh['version'] = versionText === '4.1' ? '4.1' : '2.2';
  if (versionText !== '4.1' && !/^2(\.\d+)?$/.test(versionText)) lines.fail(`expected format version 2.2 or 4.1, found "${versionText}" (export from Gmsh as version 2 or 4.1 ASCII)`);
  if (fileType !== '0') lines.fail('binary .msh files are not supported: export as ASCII (file type 0)');
  lines.expectEnd('MeshFormat');

  const raw: RawMesh = { version, physicalNames: new Map(), nodes: new Map(), elements: [] };
  const entityPhysicals = new Map<string, number[]>();
  let sawNodes = false;
  let sawElements = false;
  while (!lines.done) {
    const header = lines.next('a section');
    if (!header.startsWith('$')) lines.fail(`expected a section header such as $Nodes, found "${header.slice(0, 40)}"`);
    const section = header.slice(1);
    if (section === 'PhysicalNames') readPhysicalNames(lines, raw);
    else if (section === 'Entities' && version === '4.1') readEntities(lines, entityPhysicals);
    else if (section === 'Nodes') {
      if (version === '2.2') readNodes22(lines, raw);
      else readNodes41(lines, raw);
      sawNodes = true;
    } else if (section === 'Elements') {
      if (!sawNodes) lines.fail('$Elements comes before $Nodes');
      if (version === '2.2') readElements22(lines, raw);
      else readElements41(lines, raw, entityPhysicals);
      sawElements = true;
    } else lines.skipSection(section);
  }
  if (!sawNodes) throw new GmshFormatError(lines.lineNumber, 'the file has no $Nodes section');
  if (!sawElements) throw new GmshFormatError(lines.lineNumber, 'the file has no $Elements section');
  return raw;
}

function readPhysicalNames(lines: Lines, raw: RawMesh): void {
  const [count] = lines.ints('the number of physical names', 1);
  for (let i = 0; i < count; i++) {
    const text = lines.next('a physical name "dimension tag "name""');
    const m = /^(\d+)\s+(\d+)\s+"(.*)"$/.exec(text);
    if (!m) lines.fail(`expected a physical name as: dimension tag "name", found "${text}"`);
    raw.physicalNames.set(`${m[1]}:${m[2]}`, m[3]);
  }
  lines.expectEnd('PhysicalNames');
}

function readEntities(lines: Lines, physicals: Map<string, number[]>): void {
  const counts = lines.ints('the entity counts "points curves surfaces volumes"', 4);
  for (let dim = 0; dim < 4; dim++) {
    for (let i = 0; i < counts[dim]; i++) {
      const what = dim === 0 ? 'a point entity "tag x y z physicals…"' : 'an entity "tag box(6) physicals… bounding…"';
      const v = lines.numbers(what, dim === 0 ? 5 : 8);
      const at = dim === 0 ? 4 : 7;
      const n = v[at];
      if (!Number.isInteger(n) || n < 0 || v.length < at + 1 + n) lines.fail(`expected ${what}: the physical tag count ${n} does not match the line`);
      physicals.set(`${dim}:${v[0]}`, v.slice(at + 1, at + 1 + n).map(Math.abs));
    }
  }
  lines.expectEnd('Entities');
}

function addNode(lines: Lines, raw: RawMesh, id: number, xyz: number[]): void {
  if (id < 1) lines.fail(`expected a positive node tag, found ${id}`);
  if (raw.nodes.has(id)) lines.fail(`node ${id} is defined twice`);
  raw.nodes.set(id, { x: xyz[0], y: xyz[1], z: xyz[2], line: lines.lineNumber });
}

function readNodes22(lines: Lines, raw: RawMesh): void {
  const [count] = lines.ints('the number of nodes', 1);
  for (let i = 0; i < count; i++) {
    const v = lines.numbers('a node "tag x y z"', 4);
    if (!Number.isInteger(v[0])) lines.fail(`expected an integer node tag, found ${v[0]}`);
    addNode(lines, raw, v[0], v.slice(1));
  }
  lines.expectEnd('Nodes');
}

function readNodes41(lines: Lines, raw: RawMesh): void {
  const [blocks, total] = lines.ints('"entity-blocks nodes min-tag max-tag"', 4);
  const headerLine = lines.lineNumber;
  let read = 0;
  for (let b = 0; b < blocks; b++) {
    const [, , parametric, count] = lines.ints('a node block header "entity-dim entity-tag parametric nodes"', 4);
    const tags: number[] = [];
    for (let i = 0; i < count; i++) tags.push(lines.ints('a node tag', 1)[0]);
    for (let i = 0; i < count; i++) {
      const v = lines.numbers(`the coordinates "x y z${parametric ? ' u…' : ''}" of node ${tags[i]}`, 3);
      addNode(lines, raw, tags[i], v);
    }
    read += count;
  }
  if (read !== total) throw new GmshFormatError(headerLine, `the header announced ${total} nodes, the blocks hold ${read}`);
  lines.expectEnd('Nodes');
}

function elementType(lines: Lines, type: number): GmshType {
  const t = GMSH_TYPES[type];
  if (!t) lines.fail(`element type ${type} is not supported (2D meshes of 3/6-node triangles and 4/8/9-node quadrilaterals, with 2/3-node lines and points)`);
  return t;
}

function readElements22(lines: Lines, raw: RawMesh): void {
  const [count] = lines.ints('the number of elements', 1);
  for (let i = 0; i < count; i++) {
    const v = lines.ints('an element "tag type tag-count tags… nodes…"', 3);
    const [tag, type, ntags] = v;
    const t = elementType(lines, type);
    if (v.length !== 3 + ntags + t.nodes) lines.fail(`expected ${3 + ntags + t.nodes} numbers for element ${tag} (${t.label} with ${ntags} tags), found ${v.length}`);
    const physical = ntags > 0 ? v[3] : 0;
    raw.elements.push({ tag, type, nodes: v.slice(3 + ntags), physicals: physical > 0 ? [physical] : [], line: lines.lineNumber });
  }
  lines.expectEnd('Elements');
}

function readElements41(lines: Lines, raw: RawMesh, entityPhysicals: Map<string, number[]>): void {
  const [blocks, total] = lines.ints('"entity-blocks elements min-tag max-tag"', 4);
  const headerLine = lines.lineNumber;
  let read = 0;
  for (let b = 0; b < blocks; b++) {
    const [dim, entity, type, count] = lines.ints('an element block header "entity-dim entity-tag type elements"', 4);
    const t = elementType(lines, type);
    const physicals = entityPhysicals.get(`${dim}:${entity}`) ?? [];
    for (let i = 0; i < count; i++) {
      const v = lines.ints(`an element "tag nodes…" (${t.label})`, 1);
      if (v.length !== 1 + t.nodes) lines.fail(`expected ${1 + t.nodes} numbers for element ${v[0]} (${t.label}), found ${v.length}`);
      raw.elements.push({ tag: v[0], type, nodes: v.slice(1), physicals, line: lines.lineNumber });
    }
    read += count;
  }
  if (read !== total) throw new GmshFormatError(headerLine, `the header announced ${total} elements, the blocks hold ${read}`);
  lines.expectEnd('Elements');
}

// --- conversion to the model's mesh part ---------------------------------------------------

const DIM_WORD = ['point', 'curve', 'surface'] as const;

function groupName(raw: RawMesh, dim: Dim, tag: number): string {
  return raw.physicalNames.get(`${dim}:${tag}`) ?? `${DIM_WORD[dim]}${tag}`;
}

function toMeshPart(raw: RawMesh, options: GmshOptions): GmshMesh {
  checkPlanar(raw);
  const warnings: string[] = [];
  const out: GmshMesh = { version: raw.version, nodes: [], elements: [], nodeSets: {}, edgeSets: {}, elementSets: {}, warnings };
  const has2D = raw.elements.some((e) => GMSH_TYPES[e.type].dim === 2);
  const modelDim: Dim = has2D ? 2 : 1;
  const used = new Set<number>();
  const elementIds = new Set<number>();
  let droppedCentres = 0;

  for (const e of raw.elements) {
    for (const n of e.nodes) if (!raw.nodes.has(n)) throw new GmshFormatError(e.line, `element ${e.tag} refers to node ${n}, which is not in $Nodes`);
    const t = GMSH_TYPES[e.type];
    for (const p of e.physicals) {
      const name = groupName(raw, t.dim, p);
      const set = (out.nodeSets[name] ??= []);
      for (const n of e.nodes.slice(0, e.type === 10 ? 8 : undefined)) set.push(n);
    }
    if (t.dim !== modelDim) continue;
    if (elementIds.has(e.tag)) throw new GmshFormatError(e.line, `element tag ${e.tag} is used twice`);
    elementIds.add(e.tag);
    const element = convertElement(raw, e, options);
    if (e.type === 10) droppedCentres++;
    out.elements.push(element);
    for (const n of element.nodes) used.add(n);
    for (const p of e.physicals) (out.elementSets[groupName(raw, t.dim, p)] ??= []).push(e.tag);
  }
  if (out.elements.length === 0) throw new GmshFormatError(1, 'the file holds no 2D elements and no line elements to build a model from');
  if (droppedCentres > 0) warnings.push(`${droppedCentres} nine-node quadrilaterals were imported as eight-node (q8) elements; their centre nodes were dropped`);
  if (has2D) out.edgeSets = edgeSets(raw, out.elements);

  const ids = [...raw.nodes.keys()].sort((a, b) => a - b);
  for (const id of ids) {
    if (!used.has(id)) continue;
    const n = raw.nodes.get(id)!;
    out.nodes.push({ id, x: n.x, y: n.y });
  }
  const unused = raw.nodes.size - out.nodes.length;
  if (unused > 0) warnings.push(`${unused} nodes that no element uses were left out`);
  for (const [name, set] of Object.entries(out.nodeSets)) {
    const kept = [...new Set(set)].filter((n) => used.has(n)).sort((a, b) => a - b);
    if (kept.length > 0) out.nodeSets[name] = kept;
    else delete out.nodeSets[name];
  }
  return out;
}

function checkPlanar(raw: RawMesh): void {
  let z0: number | undefined;
  let size = 0;
  for (const n of raw.nodes.values()) size = Math.max(size, Math.abs(n.x), Math.abs(n.y), Math.abs(n.z));
  const tol = 1e-9 * (size || 1);
  for (const [id, n] of raw.nodes) {
    if (z0 === undefined) z0 = n.z;
    else if (Math.abs(n.z - z0) > tol) throw new GmshFormatError(n.line, `node ${id} has z = ${n.z} while earlier nodes have z = ${z0}: only flat meshes in the x–y plane can be imported`);
  }
}

function convertElement(raw: RawMesh, e: RawElement, options: GmshOptions): MeshElement {
  const t = GMSH_TYPES[e.type];
  const group = e.physicals.length > 0 ? groupName(raw, t.dim, e.physicals[0]) : 'default';
  if (t.dim === 1) {
    if (e.type !== 1) throw new GmshFormatError(e.line, `element ${e.tag}: 3-node lines are only read as edges of 2D elements; a line model needs 2-node lines`);
    return { id: e.tag, type: options.lineType ?? 'bar2', nodes: e.nodes.slice(), section: group, material: group };
  }
  const type = e.type === 2 ? 't3' : e.type === 9 ? 't6' : e.type === 3 ? (options.quadType ?? 'q4') : 'q8';
  let nodes = e.type === 10 ? e.nodes.slice(0, 8) : e.nodes.slice();
  const area = cornerArea(raw, nodes, type === 't3' || type === 't6' ? 3 : 4);
  if (Math.abs(area) === 0) throw new GmshFormatError(e.line, `element ${e.tag} has zero area (its corner nodes are collinear or repeated)`);
  // Gmsh orders corners counter-clockwise about its own surface normal; the model wants +z.
  if (area < 0) nodes = reverseOrientation(nodes, type);
  return { id: e.tag, type, nodes, section: group, material: group };
}

function cornerArea(raw: RawMesh, nodes: readonly number[], corners: number): number {
  let a = 0;
  for (let k = 0; k < corners; k++) {
    const p = raw.nodes.get(nodes[k])!;
    const q = raw.nodes.get(nodes[(k + 1) % corners])!;
    a += p.x * q.y - q.x * p.y;
  }
  return a / 2;
}

function reverseOrientation(nodes: number[], type: string): number[] {
  if (type === 'q8') {
    const [c1, c2, c3, c4, m12, m23, m34, m41] = nodes;
    return [c1, c4, c3, c2, m41, m34, m23, m12];
  }
  if (type === 't6') {
    const [c1, c2, c3, m12, m23, m31] = nodes;
    return [c1, c3, c2, m31, m23, m12];
  }
  return [nodes[0], ...nodes.slice(1).reverse()];
}

/** Edge sets of the physical curve groups: each line element matched to a 2D element's edge. */
function edgeSets(raw: RawMesh, elements: readonly MeshElement[]): Record<string, EdgeRef[]> {
  const edgeOf = new Map<string, EdgeRef>();
  const key = (a: number, b: number) => (a < b ? `${a}-${b}` : `${b}-${a}`);
  for (const el of elements) {
    const corners = el.type === 't3' || el.type === 't6' ? 3 : 4;
    for (let k = 0; k < corners; k++) {
      const k2 = key(el.nodes[k], el.nodes[(k + 1) % corners]);
      if (!edgeOf.has(k2)) edgeOf.set(k2, { element: el.id, edge: k + 1 });
    }
  }
  const sets: Record<string, EdgeRef[]> = {};
  for (const e of raw.elements) {
    if (GMSH_TYPES[e.type].dim !== 1 || e.physicals.length === 0) continue;
    const ref = edgeOf.get(key(e.nodes[0], e.nodes[1]));
    if (!ref) throw new GmshFormatError(e.line, `line element ${e.tag} (nodes ${e.nodes[0]}, ${e.nodes[1]}) is not an edge of any 2D element`);
    for (const p of e.physicals) (sets[groupName(raw, 1, p)] ??= []).push(ref);
  }
  return sets;
}

