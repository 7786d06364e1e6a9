/**
 * Structured meshers for the geometries templates and verification cases need.
 *
 * Every region is built from four-sided blocks mapped by transfinite (Coons) interpolation of
 * their boundary curves, so curved edges (holes, ellipses) carry their mid-side nodes exactly on
 * the curve. Blocks and parts are glued by merging coincident nodes. The result is a `MeshPart`
 * in the model format (node and element ids from 1, named node sets and edge sets), ready to be
 * placed in a model document.
 */
import type { ElementType } from '@phaseloop/shared';

export type Point = readonly [number, number];
export type Curve = (t: number) => Point;
export type ContinuumType = 't3' | 'q4' | 'q4-eas' | 'q4-bbar' | 't6' | 'q8';

export interface MeshNode {
  id: number;
  x: number;
  y: number;
}
export interface MeshElement {
  id: number;
  type: ElementType;
  nodes: number[];
  section: string;
  material: string;
}
export interface EdgeRef {
  element: number;
  edge: number;
}

export interface MeshPart {
  nodes: MeshNode[];
  elements: MeshElement[];
  nodeSets: Record<string, number[]>;
  edgeSets: Record<string, EdgeRef[]>;
}

export type Side = 'bottom' | 'right' | 'top' | 'left';

/** A four-sided block: bottom and top run with ξ, left and right with η (all from 0 to 1). */
export interface Block {
  bottom: Curve;
  right: Curve;
  top: Curve;
  left: Curve;
  nx: number;
  ny: number;
  /** Maps the uniform parameter to the curve parameter, e.g. to refine towards a hole. */
  gradeX?: (t: number) => number;
  gradeY?: (t: number) => number;
  /** Set names that collect the nodes and element edges of each side. */
  sides?: Partial<Record<Side, string[]>>;
}

export interface MeshOptions {
  type: ContinuumType;
  section?: string;
  material?: string;
}

const isQuadratic = (type: ElementType) => type === 't6' || type === 'q8';
const isTriangle = (type: ElementType) => type === 't3' || type === 't6';

/** Geometric grading: n cells whose sizes grow by `ratio` from t = 0 to t = 1. */
export function geometricGrading(ratio: number): (t: number) => number {
  if (Math.abs(ratio - 1) < 1e-12) return (t) => t;
  // Continuous form of a geometric progression of cell sizes.
  return (t) => (Math.pow(ratio, t) - 1) / (ratio - 1);
}

export const straight =
  (a: Point, b: Point): Curve =>
  (t) => [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];

export const arc =
  (centre: Point, radius: number, from: number, to: number): Curve =>
  (t) => {
    const th = from + t * (to - from);
    return [centre[0] + radius * Math.cos(th), centre[1] + radius * Math.sin(th)];
  };

/** Ellipse x²/a² + y²/b² = 1 by its parametric angle. */
export const ellipse =
  (a: number, b: number, from: number, to: number): Curve =>
  (t) => {
    const th = from + t * (to - from);
    return [a * Math.cos(th), b * Math.sin(th)];
  };

function coons(block: Block, u: number, v: number): Point {
  const B = block.bottom(u);
  const T = block.top(u);
  const L = block.left(v);
  const R = block.right(v);
  const B0 = block.bottom(0);
  const B1 = block.bottom(1);
  const T0 = block.top(0);
  const T1 = block.top(1);
  const c = (k: 0 | 1) =>
    (1 - v) * B[k] + v * T[k] + (1 - u) * L[k] + u * R[k] - ((1 - u) * (1 - v) * B0[k] + u * (1 - v) * B1[k] + (1 - u) * v * T0[k] + u * v * T1[k]);
  return [c(0), c(1)];
}

/** Collects nodes, merging coincident ones, so blocks and parts share their common edges. */
class NodeTable {
  readonly nodes: MeshNode[] = [];
  private readonly index = new Map<string, number>();
  constructor(private readonly tolerance: number) {}

  /** A node known to be new (interior of a block): no lookup, not registered for merging. */
  push(x: number, y: number): number {
    const id = this.nodes.length + 1;
    this.nodes.push({ id, x, y });
    return id;
  }

  add(x: number, y: number): number {
    const key = this.key(x, y);
    const found = this.index.get(key);
    if (found !== undefined) return found;
    const id = this.nodes.length + 1;
    this.nodes.push({ id, x, y });
    // Register the neighbouring grid keys too, so points straddling a rounding boundary merge.
    for (const dx of [-1, 0, 1]) for (const dy of [-1, 0, 1]) {
      const k = this.keyShift(x, y, dx, dy);
      if (!this.index.has(k)) this.index.set(k, id);
    }
    return id;
  }

  private key(x: number, y: number): string {
    return `${Math.round(x / this.tolerance)},${Math.round(y / this.tolerance)}`;
  }
  private keyShift(x: number, y: number, dx: number, dy: number): string {
    return `${Math.round(x / this.tolerance) + dx},${Math.round(y / this.tolerance) + dy}`;
  }
}

function addToSet<T>(sets: Record<string, T[]>, name: string, value: T): void {
  (sets[name] ??= []).push(value);
}

/** Meshes blocks into one part; shared block edges must have the same number of cells. */
export function meshBlocks(blocks: readonly Block[], options: MeshOptions): MeshPart {
  const size = blockSize(blocks);
  const table = new NodeTable(1e-9 * size);
  const part: MeshPart = { nodes: table.nodes, elements: [], nodeSets: {}, edgeSets: {} };
  for (const block of blocks) meshOneBlock(block, options, table, part);
  for (const name of Object.keys(part.nodeSets)) part.nodeSets[name] = [...new Set(part.nodeSets[name])].sort((a, b) => a - b);
  return part;
}

function blockSize(blocks: readonly Block[]): number {
  let size = 0;
  for (const b of blocks) for (const t of [0, 0.5, 1]) for (const c of [b.bottom(t), b.top(t)]) size = Math.max(size, Math.abs(c[0]), Math.abs(c[1]));
  return size > 0 ? size : 1;
}

function meshOneBlock(block: Block, options: MeshOptions, table: NodeTable, part: MeshPart): void {
  const type = options.type;
  const q = isQuadratic(type) ? 2 : 1;
  const gx = block.gradeX ?? ((t: number) => t);
  const gy = block.gradeY ?? ((t: number) => t);
  const mx = block.nx * q;
  const my = block.ny * q;
  // Grid of node ids; quadratic grids hold mid-side points. Parameters of mid-side points are
  // the mid-points in the graded parameter so the nodes sit midway along curved edges.
  const grid: number[][] = [];
  const param = (g: (t: number) => number, k: number, m: number) => {
    if (q === 1 || k % 2 === 0) return g(k / m);
    return 0.5 * (g((k - 1) / m) + g((k + 1) / m));
  };
  for (let i = 0; i <= mx; i++) {
    const column: number[] = [];
    for (let j = 0; j <= my; j++) {
      if (type === 'q8' && i % 2 === 1 && j % 2 === 1) {
        column.push(0);
        continue;
      }
      const [x, y] = coons(block, param(gx, i, mx), param(gy, j, my));
      // Only nodes on the block's boundary can coincide with another block's.
      const onBoundary = i === 0 || j === 0 || i === mx || j === my;
      column.push(onBoundary ? table.add(x, y) : table.push(x, y));
    }
    grid.push(column);
  }
  const flip = signedArea(table, grid[0][0], grid[q][0], grid[q][q]) < 0;
  const section = options.section ?? 'main';
  const material = options.material ?? 'main';
  const firstElement = part.elements.length;
  for (let i = 0; i < block.nx; i++) {
    for (let j = 0; j < block.ny; j++) {
      for (const nodes of cellElements(type, grid, i * q, j * q)) {
        part.elements.push({ id: part.elements.length + 1, type, nodes: flip ? reverseOrientation(nodes, type) : nodes, section, material });
      }
    }
  }
  collectSides(block, grid, mx, my, part, firstElement);
}

function signedArea(table: NodeTable, a: number, b: number, c: number): number {
  const A = table.nodes[a - 1];
  const B = table.nodes[b - 1];
  const C = table.nodes[c - 1];
  return (B.x - A.x) * (C.y - A.y) - (C.x - A.x) * (B.y - A.y);
}

function cellElements(type: ContinuumType, g: number[][], i: number, j: number): number[][] {
  if (type === 'q8') {
    return [[g[i][j], g[i + 2][j], g[i + 2][j + 2], g[i][j + 2], g[i + 1][j], g[i + 2][j + 1], g[i + 1][j + 2], g[i][j + 1]]];
  }
  if (type === 't6') {
    return [
      [g[i][j], g[i + 2][j], g[i + 2][j + 2], g[i + 1][j], g[i + 2][j + 1], g[i + 1][j + 1]],
      [g[i][j], g[i + 2][j + 2], g[i][j + 2], g[i + 1][j + 1], g[i + 1][j + 2], g[i][j + 1]],
    ];
  }
  if (type === 't3') {
    return [
      [g[i][j], g[i + 1][j], g[i + 1][j + 1]],
      [g[i][j], g[i + 1][j + 1], g[i][j + 1]],
    ];
  }
  return [[g[i][j], g[i + 1][j], g[i + 1][j + 1], g[i][j + 1]]];
}

/** Same element traversed the other way (corners reversed, mid-side nodes kept on their edges). */
function reverseOrientation(nodes: number[], type: ElementType): number[] {
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

function collectSides(block: Block, grid: number[][], mx: number, my: number, part: MeshPart, firstElement: number): void {
  const sides = block.sides ?? {};
  const sideNodes: Record<Side, number[]> = {
    bottom: grid.map((col) => col[0]),
    top: grid.map((col) => col[my]),
    left: grid[0].slice(),
    right: grid[mx].slice(),
  };
  for (const side of ['bottom', 'right', 'top', 'left'] as const) {
    const names = sides[side];
    if (!names || names.length === 0) continue;
    const onSide = new Set(sideNodes[side].filter((n) => n > 0));
    const edges: EdgeRef[] = [];
    for (let e = firstElement; e < part.elements.length; e++) {
      const el = part.elements[e];
      const corners = isTriangle(el.type) ? 3 : 4;
      for (let k = 0; k < corners; k++) {
        if (onSide.has(el.nodes[k]) && onSide.has(el.nodes[(k + 1) % corners])) edges.push({ element: el.id, edge: k + 1 });
      }
    }
    for (const name of names) {
      for (const n of onSide) addToSet(part.nodeSets, name, n);
      for (const e of edges) addToSet(part.edgeSets, name, e);
    }
  }
}

/** Rectangle [x0, x0 + width] × [y0, y0 + height]; sets left, right, bottom, top, all. */
export function rectangle(
  spec: { x0?: number; y0?: number; width: number; height: number; nx: number; ny: number },
  options: MeshOptions,
): MeshPart {
  const x0 = spec.x0 ?? 0;
  const y0 = spec.y0 ?? 0;
  const p = (x: number, y: number): Point => [x0 + x * spec.width, y0 + y * spec.height];
  const part = meshBlocks(
    [
      {
        bottom: straight(p(0, 0), p(1, 0)),
        top: straight(p(0, 1), p(1, 1)),
        left: straight(p(0, 0), p(0, 1)),
        right: straight(p(1, 0), p(1, 1)),
        nx: spec.nx,
        ny: spec.ny,
        sides: { bottom: ['bottom'], right: ['right'], top: ['top'], left: ['left'] },
      },
    ],
    options,
  );
  part.nodeSets.all = part.nodes.map((n) => n.id);
  return part;
}

/**
 * Quarter of a rectangular plate with a central circular hole: hole radius a at the origin,
 * plate half-width W (x) and half-height H (y). Two blocks meet on the ray to the corner (W, H).
 * `nAround` cells along each half of the hole, `nRadial` from the hole outwards, graded so cells
 * at the hole are about `ratio` times smaller than at the outer edge.
 * Sets: hole, left (x = 0), bottom (y = 0), right (x = W), top (y = H).
 */
export function quarterPlateWithHole(
  spec: { radius: number; halfWidth: number; halfHeight: number; nAround: number; nRadial: number; ratio?: number },
  options: MeshOptions,
): MeshPart {
  const { radius: a, halfWidth: W, halfHeight: H } = spec;
  const corner = Math.atan2(H, W);
  const grade = geometricGrading(spec.ratio ?? 1);
  const lower: Block = {
    bottom: arc([0, 0], a, 0, corner),
    top: straight([W, 0], [W, H]),
    left: straight([a, 0], [W, 0]),
    right: straight([a * Math.cos(corner), a * Math.sin(corner)], [W, H]),
    nx: spec.nAround,
    ny: spec.nRadial,
    gradeY: grade,
    sides: { bottom: ['hole'], top: ['right'], left: ['bottom'] },
  };
  const upper: Block = {
    bottom: arc([0, 0], a, corner, Math.PI / 2),
    top: straight([W, H], [0, H]),
    left: straight([a * Math.cos(corner), a * Math.sin(corner)], [W, H]),
    right: straight([0, a], [0, H]),
    nx: spec.nAround,
    ny: spec.nRadial,
    gradeY: grade,
    sides: { bottom: ['hole'], top: ['top'], right: ['left'] },
  };
  return meshBlocks([lower, upper], options);
}

/**
 * Region between two concentric ellipses (an annulus when a = b) between parametric angles
 * `from` and `to` (default a quarter). Sets: inner, outer, start (edge at `from`), end.
 */
export function ellipticRing(
  spec: {
    inner: { a: number; b: number };
    outer: { a: number; b: number };
    nAround: number;
    nRadial: number;
    from?: number;
    to?: number;
    ratio?: number;
  },
  options: MeshOptions,
): MeshPart {
  const from = spec.from ?? 0;
  const to = spec.to ?? Math.PI / 2;
  const inner = ellipse(spec.inner.a, spec.inner.b, from, to);
  const outer = ellipse(spec.outer.a, spec.outer.b, from, to);
  return meshBlocks(
    [
      {
        bottom: inner,
        top: outer,
        left: straight(inner(0), outer(0)),
        right: straight(inner(1), outer(1)),
        nx: spec.nAround,
        ny: spec.nRadial,
        gradeY: geometricGrading(spec.ratio ?? 1),
        sides: { bottom: ['inner'], top: ['outer'], left: ['start'], right: ['end'] },
      },
    ],
    options,
  );
}

/**
 * Quarter disc of radius r at the origin: a square core and two curved blocks (no degenerate
 * cells). `n` cells along each side of the core and around each half of the arc.
 * Sets: arc, left (x = 0), bottom (y = 0).
 */
export function quarterDisc(spec: { radius: number; n: number; nRadial?: number }, options: MeshOptions): MeshPart {
  const r = spec.radius;
  const c = 0.5 * r;
  const m = spec.nRadial ?? spec.n;
  const d: Point = [r * Math.SQRT1_2, r * Math.SQRT1_2];
  const core: Block = {
    bottom: straight([0, 0], [c, 0]),
    top: straight([0, c], [c, c]),
    left: straight([0, 0], [0, c]),
    right: straight([c, 0], [c, c]),
    nx: spec.n,
    ny: spec.n,
    sides: { bottom: ['bottom'], left: ['left'] },
  };
  const lower: Block = {
    bottom: straight([c, 0], [r, 0]),
    top: straight([c, c], d),
    left: straight([c, 0], [c, c]),
    right: arc([0, 0], r, 0, Math.PI / 4),
    nx: m,
    ny: spec.n,
    sides: { bottom: ['bottom'], right: ['arc'] },
  };
  const upper: Block = {
    bottom: straight([0, c], [c, c]),
    top: arc([0, 0], r, Math.PI / 2, Math.PI / 4),
    left: straight([0, c], [0, r]),
    right: straight([c, c], d),
    nx: spec.n,
    ny: m,
    sides: { top: ['arc'], left: ['left'] },
  };
  return meshBlocks([core, lower, upper], options);
}

/** Straight line of bars or beams; sets start, end, all. */
export function line(spec: { from: Point; to: Point; n: number }, options: { type: 'bar2' | 'beam2'; section?: string; material?: string }): MeshPart {
  const nodes: MeshNode[] = [];
  for (let i = 0; i <= spec.n; i++) {
    const t = i / spec.n;
    nodes.push({ id: i + 1, x: spec.from[0] + t * (spec.to[0] - spec.from[0]), y: spec.from[1] + t * (spec.to[1] - spec.from[1]) });
  }
  const elements: MeshElement[] = [];
  for (let i = 0; i < spec.n; i++) {
    elements.push({ id: i + 1, type: options.type, nodes: [i + 1, i + 2], section: options.section ?? 'main', material: options.material ?? 'main' });
  }
  return { nodes, elements, nodeSets: { start: [1], end: [spec.n + 1], all: nodes.map((n) => n.id) }, edgeSets: {} };
}

/** Glues parts by merging coincident nodes; ids are renumbered, sets of the same name united. */
export function mergeParts(parts: readonly MeshPart[]): MeshPart {
  let size = 1;
  for (const p of parts) for (const n of p.nodes) size = Math.max(size, Math.abs(n.x), Math.abs(n.y));
  const table = new NodeTable(1e-9 * size);
  const out: MeshPart = { nodes: table.nodes, elements: [], nodeSets: {}, edgeSets: {} };
  for (const part of parts) {
    const nodeMap = new Map<number, number>();
    for (const n of part.nodes) nodeMap.set(n.id, table.add(n.x, n.y));
    const elementMap = new Map<number, number>();
    for (const e of part.elements) {
      const id = out.elements.length + 1;
      elementMap.set(e.id, id);
      out.elements.push({ ...e, id, nodes: e.nodes.map((n) => nodeMap.get(n)!) });
    }
    for (const [name, ids] of Object.entries(part.nodeSets)) for (const n of ids) addToSet(out.nodeSets, name, nodeMap.get(n)!);
    for (const [name, refs] of Object.entries(part.edgeSets)) for (const r of refs) addToSet(out.edgeSets, name, { element: elementMap.get(r.element)!, edge: r.edge });
  }
  for (const name of Object.keys(out.nodeSets)) out.nodeSets[name] = [...new Set(out.nodeSets[name])].sort((a, b) => a - b);
  return out;
}

/** Nodes whose coordinates satisfy a predicate (e.g. to build a set after meshing). */
export function nodesWhere(part: MeshPart, test: (x: number, y: number) => boolean): number[] {
  return part.nodes.filter((n) => test(n.x, n.y)).map((n) => n.id);
}
