/**
 * Turns a validated model document into the arrays the solver works on: node coordinates, the
 * dof numbering (2 per node, 3 where a beam meets the node), element records with their kernels,
 * reduced materials, dof maps and state offsets, unit load patterns and the Dirichlet list.
 *
 * Everything is built once per analysis; the Newton loop then only reads these arrays.
 */
import type { DofName, LoadSpec, Model, SectionSpec, TemperatureField } from '@phaseloop/shared';
import { getElementKernel, type ElementKernel, type ElementName, type Section } from '../element';
import { createMaterial, type Material } from '../material';
import { ReducedMaterial } from '../material/reduce';

export class ModelError extends Error {
  constructor(
    message: string,
    /** JSON path of the offending entry when known. */
    readonly path: string = '',
  ) {
    super(message);
    this.name = 'ModelError';
  }
}

export interface ProblemElement {
  readonly id: number;
  readonly index: number;
  readonly kernel: ElementKernel;
  readonly section: Section;
  readonly sectionName: string;
  readonly materialName: string;
  readonly material: ReducedMaterial<unknown>;
  /** Node indices (0-based). */
  readonly nodes: Int32Array;
  /** Global dof of each element dof (node-major). */
  readonly dofs: Int32Array;
  /** Nodal coordinates, node-major (x, y). */
  readonly coords: Float64Array;
  readonly stateOffset: number;
  readonly stateSize: number;
  /** First material point of this element in the global point arrays, and their count. */
  readonly pointOffset: number;
  readonly points: number;
}

export interface DirichletDof {
  readonly dof: number;
  /** Index into `loads` for prescribed values, −1 for a support held at zero. */
  readonly load: number;
}

export interface Problem {
  readonly model: Model;
  readonly nodeCount: number;
  readonly nodeIds: Int32Array;
  readonly nodeIndex: ReadonlyMap<number, number>;
  readonly coords: Float64Array;
  /** First global dof of node i and the count (0 for nodes no element uses). */
  readonly dofStart: Int32Array;
  readonly dofCount: Uint8Array;
  readonly nDof: number;
  readonly elements: readonly ProblemElement[];
  readonly stateSize: number;
  readonly pointCount: number;
  /** Point coordinates (x, y) of every material point. */
  readonly pointCoords: Float64Array;
  readonly dirichlet: readonly DirichletDof[];
  readonly loads: readonly LoadSpec[];
  /** Unit nodal load pattern per load (force, pressure, traction), null for displacement loads. */
  readonly loadPatterns: readonly (Float64Array | null)[];
  /** Characteristic length of the model (bounding-box diagonal). */
  readonly size: number;
}

export const DOF_NAMES: readonly DofName[] = ['ux', 'uy', 'rz'];

export function elementName(type: Model['elements'][number]['type'], section: SectionSpec): ElementName {
  if (type === 'beam2') return section.kind === 'beam' && section.theory === 'timoshenko' ? 'beam2-timo' : 'beam2-eb';
  return type;
}

export function toElementSection(spec: SectionSpec): Section {
  if (spec.kind === 'continuum') return { kind: 'continuum', analysis: spec.analysis, thickness: spec.thickness };
  if (spec.kind === 'bar') return { kind: 'bar', area: spec.area };
  const cs = spec.crossSection;
  const shape =
    cs.shape === 'rectangle'
      ? ({ type: 'rectangle', b: cs.width, h: cs.height } as const)
      : cs.shape === 'circle'
        ? ({ type: 'circle', d: cs.diameter } as const)
        : ({ type: 'tube', do: cs.outerDiameter, di: cs.outerDiameter - 2 * cs.wallThickness } as const);
  return { kind: 'beam', shape, fibres: spec.fibres };
}

export function buildProblem(model: Model): Problem {
  const nodeCount = model.nodes.length;
  const nodeIds = new Int32Array(nodeCount);
  const nodeIndex = new Map<number, number>();
  const coords = new Float64Array(2 * nodeCount);
  model.nodes.forEach((n, i) => {
    nodeIds[i] = n.id;
    nodeIndex.set(n.id, i);
    coords[2 * i] = n.x;
    coords[2 * i + 1] = n.y;
  });

  const materials = new Map<string, Material<unknown>>();
  const reduced = new Map<string, ReducedMaterial<unknown>>();
  const kernels = model.elements.map((e, i) => {
    const spec = model.sections[e.section];
    try {
      return getElementKernel(elementName(e.type, spec));
    } catch (err) {
      throw new ModelError(`element ${e.id}: ${(err as Error).message}`, `elements[${i}].type`);
    }
  });

  const dofCount = new Uint8Array(nodeCount);
  model.elements.forEach((e, i) => {
    for (const id of e.nodes) {
      const n = nodeIndex.get(id)!;
      dofCount[n] = Math.max(dofCount[n], kernels[i].dofsPerNode);
    }
  });
  const dofStart = new Int32Array(nodeCount + 1);
  for (let i = 0; i < nodeCount; i++) dofStart[i + 1] = dofStart[i] + dofCount[i];
  const nDof = dofStart[nodeCount];

  let stateSize = 0;
  let pointCount = 0;
  const elements: ProblemElement[] = model.elements.map((e, i) => {
    const kernel = kernels[i];
    const section = toElementSection(model.sections[e.section]);
    let material = materials.get(e.material);
    if (!material) {
      try {
        material = createMaterial(model.materials[e.material]);
      } catch (err) {
        throw new ModelError(`material "${e.material}": ${(err as Error).message}`, `materials.${e.material}`);
      }
      materials.set(e.material, material);
    }
    const stressState = kernel.stressState(section);
    const key = `${e.material}|${stressState}`;
    let red = reduced.get(key);
    if (!red) {
      red = new ReducedMaterial(material, stressState);
      reduced.set(key, red);
    }
    const nodes = Int32Array.from(e.nodes, (id) => nodeIndex.get(id)!);
    const dofs = new Int32Array(kernel.nodes * kernel.dofsPerNode);
    const elCoords = new Float64Array(2 * kernel.nodes);
    for (let a = 0; a < kernel.nodes; a++) {
      elCoords[2 * a] = coords[2 * nodes[a]];
      elCoords[2 * a + 1] = coords[2 * nodes[a] + 1];
      for (let d = 0; d < kernel.dofsPerNode; d++) dofs[a * kernel.dofsPerNode + d] = dofStart[nodes[a]] + d;
    }
    const size = kernel.stateSize(section, red.stateSize);
    const points = kernel.pointsPerElement(section);
    const el: ProblemElement = {
      id: e.id,
      index: i,
      kernel,
      section,
      sectionName: e.section,
      materialName: e.material,
      material: red,
      nodes,
      dofs,
      coords: elCoords,
      stateOffset: stateSize,
      stateSize: size,
      pointOffset: pointCount,
      points,
    };
    stateSize += size;
    pointCount += points;
    return el;
  });

  const pointCoords = new Float64Array(2 * pointCount);
  for (const el of elements) {
    const out = new Float64Array(2 * el.points);
    el.kernel.pointCoordinates(el.coords, el.section, out);
    pointCoords.set(out, 2 * el.pointOffset);
  }

  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let i = 0; i < nodeCount; i++) {
    minX = Math.min(minX, coords[2 * i]);
    maxX = Math.max(maxX, coords[2 * i]);
    minY = Math.min(minY, coords[2 * i + 1]);
    maxY = Math.max(maxY, coords[2 * i + 1]);
  }
  const size = Math.hypot(maxX - minX, maxY - minY) || 1;

  const partial = { model, nodeIndex, dofStart, dofCount, elements, coords };
  const dirichlet = buildDirichlet(partial);
  const loadPatterns = model.loads.map((load) => buildLoadPattern(partial, load, nDof));

  return {
    model,
    nodeCount,
    nodeIds,
    nodeIndex,
    coords,
    dofStart,
    dofCount,
    nDof,
    elements,
    stateSize,
    pointCount,
    pointCoords,
    dirichlet,
    loads: model.loads,
    loadPatterns,
    size,
  };
}

interface PartialProblem {
  model: Model;
  nodeIndex: Map<number, number>;
  dofStart: Int32Array;
  dofCount: Uint8Array;
  elements: ProblemElement[];
  coords: Float64Array;
}

function buildDirichlet(p: PartialProblem): DirichletDof[] {
  const owner = new Map<number, { load: number; path: string }>();
  const hold = (node: number, d: number, load: number, path: string, strict: boolean) => {
    if (d >= p.dofCount[node]) {
      if (strict) throw new ModelError(`node ${p.model.nodes[node].id} has no ${DOF_NAMES[d]} direction (only beam nodes rotate)`, path);
      return;
    }
    const dof = p.dofStart[node] + d;
    const prev = owner.get(dof);
    if (prev && (prev.load >= 0 || load >= 0) && prev.load !== load) {
      throw new ModelError(
        `node ${p.model.nodes[node].id}, ${DOF_NAMES[d]}: prescribed twice (${prev.path} and ${path}); keep one`,
        path,
      );
    }
    if (!prev || load >= 0) owner.set(dof, { load, path });
  };
  p.model.supports.forEach((s, i) => {
    const path = `supports[${i}]`;
    const dirs: number[] =
      s.type === 'fixed'
        ? s.dofs
          ? s.dofs.map((d) => DOF_NAMES.indexOf(d))
          : [0, 1, 2]
        : s.normal === 'x'
          ? [0, 2]
          : [1, 2];
    const strict = s.type === 'fixed' && s.dofs !== undefined && s.dofs.includes('rz') && dirs.length === 1;
    for (const id of p.model.nodeSets[s.set]) {
      const node = p.nodeIndex.get(id)!;
      for (const d of dirs) hold(node, d, -1, path, strict);
    }
  });
  p.model.loads.forEach((l, i) => {
    if (l.type !== 'displacement') return;
    const d = DOF_NAMES.indexOf(l.dof);
    for (const id of p.model.nodeSets[l.set]) hold(p.nodeIndex.get(id)!, d, i, `loads[${i}]`, true);
  });
  return [...owner.entries()].sort((a, b) => a[0] - b[0]).map(([dof, o]) => ({ dof, load: o.load }));
}

/** 1D Gauss points and weights on [−1, 1] (3 points: exact for the quadratic edges' loads). */
const EDGE_GAUSS = [
  { s: -Math.sqrt(0.6), w: 5 / 9 },
  { s: 0, w: 8 / 9 },
  { s: Math.sqrt(0.6), w: 5 / 9 },
];

function edgeShape(count: number, s: number, out: number[]): void {
  if (count === 2) {
    out[0] = 0.5 * (1 - s);
    out[1] = 0.5 * (1 + s);
  } else {
    out[0] = 0.5 * s * (s - 1);
    out[1] = 0.5 * s * (s + 1);
    out[2] = 1 - s * s;
  }
}

function edgeShapeDerivative(count: number, s: number, out: number[]): void {
  if (count === 2) {
    out[0] = -0.5;
    out[1] = 0.5;
  } else {
    out[0] = s - 0.5;
    out[1] = s + 0.5;
    out[2] = -2 * s;
  }
}

/** Signed area of the element's corner polygon (positive when numbered counter-clockwise). */
function cornerArea(el: ProblemElement): number {
  const corners = el.kernel.edges.length;
  let a = 0;
  for (let k = 0; k < corners; k++) {
    const j = (k + 1) % corners;
    a += el.coords[2 * k] * el.coords[2 * j + 1] - el.coords[2 * j] * el.coords[2 * k + 1];
  }
  return 0.5 * a;
}

function buildLoadPattern(p: PartialProblem, load: LoadSpec, nDof: number): Float64Array | null {
  if (load.type === 'displacement') return null;
  const f = new Float64Array(nDof);
  if (load.type === 'force') {
    const d = load.dof === 'fx' ? 0 : load.dof === 'fy' ? 1 : 2;
    for (const id of p.model.nodeSets[load.set]) {
      const node = p.nodeIndex.get(id)!;
      if (d >= p.dofCount[node]) throw new ModelError(`load "${load.name}": node ${id} has no rotation to carry a moment`);
      f[p.dofStart[node] + d] += 1;
    }
    return f;
  }
  const elementById = new Map(p.elements.map((e) => [e.id, e]));
  let dir: [number, number] | null = null;
  if (load.type === 'traction') {
    const len = Math.hypot(load.direction[0], load.direction[1]);
    dir = [load.direction[0] / len, load.direction[1] / len];
  }
  const N: number[] = [0, 0, 0];
  const dN: number[] = [0, 0, 0];
  for (const ref of p.model.edgeSets[load.edgeSet]) {
    const el = elementById.get(ref.element)!;
    if (el.section.kind !== 'continuum') throw new ModelError(`load "${load.name}": element ${el.id} is not a 2D continuum element`);
    const local = el.kernel.edges[ref.edge - 1];
    const count = local.length;
    const orientation = cornerArea(el) >= 0 ? 1 : -1;
    const axisymmetric = el.section.analysis === 'axisymmetric';
    const thickness = el.section.thickness;
    for (const g of EDGE_GAUSS) {
      edgeShape(count, g.s, N);
      edgeShapeDerivative(count, g.s, dN);
      let x = 0, tx = 0, ty = 0;
      for (let a = 0; a < count; a++) {
        x += N[a] * el.coords[2 * local[a]];
        tx += dN[a] * el.coords[2 * local[a]];
        ty += dN[a] * el.coords[2 * local[a] + 1];
      }
      const jac = Math.hypot(tx, ty);
      // Outward normal: the edge runs counter-clockwise around the element's interior.
      const nx = (orientation * ty) / jac;
      const ny = (-orientation * tx) / jac;
      const [qx, qy] = dir ?? [-nx, -ny];
      const measure = (axisymmetric ? 2 * Math.PI * x : thickness) * jac * g.w;
      for (let a = 0; a < count; a++) {
        const node = el.nodes[local[a]];
        f[p.dofStart[node]] += N[a] * qx * measure;
        f[p.dofStart[node] + 1] += N[a] * qy * measure;
      }
    }
  }
  return f;
}

/** Nodal temperatures of a temperature field (base value, then node sets, then single nodes). */
export function nodalTemperatures(problem: Pick<Problem, 'model' | 'nodeCount' | 'nodeIndex'>, field: TemperatureField, out?: Float64Array): Float64Array {
  const T = out ?? new Float64Array(problem.nodeCount);
  if (typeof field === 'number') {
    T.fill(field);
    return T;
  }
  T.fill(field.base);
  for (const [setName, value] of Object.entries(field.nodeSets)) {
    for (const id of problem.model.nodeSets[setName]) T[problem.nodeIndex.get(id)!] = value;
  }
  for (const n of field.nodes) T[problem.nodeIndex.get(n.id)!] = n.value;
  return T;
}

/** Human name of a global dof, e.g. "node 17, uy". */
export function describeDof(problem: Pick<Problem, 'nodeIds' | 'dofStart' | 'nodeCount'>, dof: number): { node: number; direction: DofName } {
  let lo = 0;
  let hi = problem.nodeCount - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (problem.dofStart[mid] <= dof) lo = mid;
    else hi = mid - 1;
  }
  // Nodes without dofs share a start with the next node: move to the one that owns the dof.
  while (lo + 1 < problem.nodeCount && problem.dofStart[lo + 1] <= dof) lo++;
  return { node: problem.nodeIds[lo], direction: DOF_NAMES[dof - problem.dofStart[lo]] };
}
