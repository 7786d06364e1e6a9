/**
 * Element loops: internal forces over all dofs and the tangent on the free dofs.
 *
 * The Dirichlet conditions are applied by elimination: prescribed dofs get no equation, so the
 * tangent is assembled straight into a CSR matrix over the free dofs. Its pattern (full, sorted
 * rows) is built once from the element connectivity, and every element keeps a scatter map from
 * its local (a, b) entry to the position in `values` (−1 where a row or column is prescribed),
 * so assembling is a plain indexed add with no search and no allocation.
 */
import type { CsrMatrix } from '../solve/linear/types';
import { createElementOutput, type ElementContext, type ElementOutput } from '../element';
import type { Problem, ProblemElement } from './problem';
import { numberDofs, type DofNumbering } from '../constraints/dirichlet';

export type { DofNumbering };

/** Builds the sorted full CSR pattern over the free dofs from node–element adjacency. */
export function buildPattern(problem: Problem, numbering: DofNumbering): { rowPtr: Int32Array; colIdx: Int32Array } {
  const n = numbering.freeDofs.length;
  const nodeElements: number[][] = Array.from({ length: problem.nodeCount }, () => []);
  problem.elements.forEach((el, e) => {
    for (const node of el.nodes) nodeElements[node].push(e);
  });
  const marker = new Int32Array(n).fill(-1);
  const rowPtr = new Int32Array(n + 1);
  const columnsPerNode: Int32Array[] = new Array(problem.nodeCount);
  for (let node = 0; node < problem.nodeCount; node++) {
    const cols: number[] = [];
    for (const e of nodeElements[node]) {
      for (const dof of problem.elements[e].dofs) {
        const eq = numbering.equation[dof];
        if (eq >= 0 && marker[eq] !== node) {
          marker[eq] = node;
          cols.push(eq);
        }
      }
    }
    cols.sort((a, b) => a - b);
    columnsPerNode[node] = Int32Array.from(cols);
  }
  for (let node = 0; node < problem.nodeCount; node++) {
    for (let d = 0; d < problem.dofCount[node]; d++) {
      const eq = numbering.equation[problem.dofStart[node] + d];
      if (eq >= 0) rowPtr[eq + 1] = columnsPerNode[node].length;
    }
  }
  for (let i = 0; i < n; i++) rowPtr[i + 1] += rowPtr[i];
  const colIdx = new Int32Array(rowPtr[n]);
  for (let node = 0; node < problem.nodeCount; node++) {
    for (let d = 0; d < problem.dofCount[node]; d++) {
      const eq = numbering.equation[problem.dofStart[node] + d];
      if (eq >= 0) colIdx.set(columnsPerNode[node], rowPtr[eq]);
    }
  }
  return { rowPtr, colIdx };
}

/** Pattern of the coupling block: free equations × prescribed dofs touched by a common element. */
export function buildCouplingPattern(problem: Problem, numbering: DofNumbering): CsrMatrix {
  const n = numbering.freeDofs.length;
  const rows: number[][] = Array.from({ length: n }, () => []);
  for (const el of problem.elements) {
    const cols: number[] = [];
    for (const d of el.dofs) if (numbering.prescribedIndex[d] >= 0) cols.push(numbering.prescribedIndex[d]);
    if (cols.length === 0) continue;
    for (const d of el.dofs) {
      const eq = numbering.equation[d];
      if (eq >= 0) rows[eq].push(...cols);
    }
  }
  const rowPtr = new Int32Array(n + 1);
  const sorted = rows.map((r) => [...new Set(r)].sort((a, b) => a - b));
  for (let i = 0; i < n; i++) rowPtr[i + 1] = rowPtr[i] + sorted[i].length;
  const colIdx = new Int32Array(rowPtr[n]);
  sorted.forEach((r, i) => colIdx.set(r, rowPtr[i]));
  return { n, rowPtr, colIdx, values: new Float64Array(colIdx.length) };
}

function findInRow(rowPtr: Int32Array, colIdx: Int32Array, row: number, col: number): number {
  let lo = rowPtr[row];
  let hi = rowPtr[row + 1] - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const c = colIdx[mid];
    if (c === col) return mid;
    if (c < col) lo = mid + 1;
    else hi = mid - 1;
  }
  return -1;
}

interface MutableContext {
  coords: Float64Array;
  u: Float64Array;
  uOld: Float64Array;
  temperature: Float64Array;
  temperatureOld: Float64Array;
  section: ElementContext['section'];
  material: ElementContext['material'];
  state: Float64Array;
  stateOld: Float64Array;
  stateOffset: number;
  wantTangent: boolean;
}

/** What the element loop needs from the driver at one evaluation. */
export interface AssemblyInput {
  /** Global dofs now and at the start of the increment. */
  readonly u: Float64Array;
  readonly uOld: Float64Array;
  /** Nodal temperatures now and at the start of the increment. */
  readonly temperature: Float64Array;
  readonly temperatureOld: Float64Array;
  readonly state: Float64Array;
  readonly stateOld: Float64Array;
}

export interface AssemblyStatus {
  ok: boolean;
  /** Element id and message of the first material point that failed. */
  element: number;
  message: string;
}

export class Assembler {
  readonly numbering: DofNumbering;
  readonly matrix: CsrMatrix;
  /** Internal forces over all dofs (reactions are read from the prescribed ones). */
  readonly fint: Float64Array;
  /** Strain and stress (3D Kelvin–Mandel) of every material point from the last evaluation. */
  readonly pointStrain: Float64Array;
  readonly pointStress: Float64Array;
  /**
   * Coupling block K_fp (free rows × prescribed columns, CSR), assembled with the tangent: the
   * driver's predictor turns an increment of prescribed displacements into free-dof forces.
   */
  readonly coupling: CsrMatrix;
  private readonly scatter: Int32Array[];
  private readonly couplingScatter: (Int32Array | null)[];
  private readonly outputs: ElementOutput[];
  private readonly ctx: MutableContext;
  private readonly buffers = new Map<number, { u: Float64Array; uOld: Float64Array; T: Float64Array; TOld: Float64Array }>();

  constructor(readonly problem: Problem) {
    this.numbering = numberDofs(problem);
    const { rowPtr, colIdx } = buildPattern(problem, this.numbering);
    this.matrix = { n: this.numbering.freeDofs.length, rowPtr, colIdx, values: new Float64Array(colIdx.length) };
    this.fint = new Float64Array(problem.nDof);
    this.pointStrain = new Float64Array(6 * problem.pointCount);
    this.pointStress = new Float64Array(6 * problem.pointCount);
    this.scatter = problem.elements.map((el) => this.elementScatter(el));
    this.coupling = buildCouplingPattern(problem, this.numbering);
    this.couplingScatter = problem.elements.map((el) => this.elementCouplingScatter(el));
    const outputCache = new Map<string, ElementOutput>();
    this.outputs = problem.elements.map((el) => {
      const key = `${el.kernel.name}|${el.sectionName}`;
      let out = outputCache.get(key);
      if (!out) {
        out = createElementOutput(el.kernel, el.section);
        outputCache.set(key, out);
      }
      return out;
    });
    const empty = new Float64Array(0);
    this.ctx = {
      coords: empty,
      u: empty,
      uOld: empty,
      temperature: empty,
      temperatureOld: empty,
      section: problem.elements[0].section,
      material: problem.elements[0].material,
      state: empty,
      stateOld: empty,
      stateOffset: 0,
      wantTangent: true,
    };
  }

  private elementScatter(el: ProblemElement): Int32Array {
    const nd = el.dofs.length;
    const map = new Int32Array(nd * nd).fill(-1);
    const { rowPtr, colIdx } = this.matrix;
    for (let a = 0; a < nd; a++) {
      const row = this.numbering.equation[el.dofs[a]];
      if (row < 0) continue;
      for (let b = 0; b < nd; b++) {
        const col = this.numbering.equation[el.dofs[b]];
        if (col >= 0) map[a * nd + b] = findInRow(rowPtr, colIdx, row, col);
      }
    }
    return map;
  }

  private elementCouplingScatter(el: ProblemElement): Int32Array | null {
    const nd = el.dofs.length;
    const { equation, prescribedIndex } = this.numbering;
    if (!el.dofs.some((d) => prescribedIndex[d] >= 0)) return null;
    const map = new Int32Array(nd * nd).fill(-1);
    const { rowPtr, colIdx } = this.coupling;
    for (let a = 0; a < nd; a++) {
      const row = equation[el.dofs[a]];
      if (row < 0) continue;
      for (let b = 0; b < nd; b++) {
        const col = prescribedIndex[el.dofs[b]];
        if (col >= 0) map[a * nd + b] = findInRow(rowPtr, colIdx, row, col);
      }
    }
    return map;
  }

  /** y = K_fp · v over the prescribed dofs (v indexed like `numbering.prescribed`). */
  couplingTimes(v: Float64Array, y: Float64Array): void {
    const { n, rowPtr, colIdx, values } = this.coupling;
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) s += values[p] * v[colIdx[p]];
      y[i] = s;
    }
  }

  private buffersFor(el: ProblemElement) {
    const key = el.dofs.length * 100 + el.nodes.length;
    let b = this.buffers.get(key);
    if (!b) {
      b = {
        u: new Float64Array(el.dofs.length),
        uOld: new Float64Array(el.dofs.length),
        T: new Float64Array(el.nodes.length),
        TOld: new Float64Array(el.nodes.length),
      };
      this.buffers.set(key, b);
    }
    return b;
  }

  /** Virgin state of every element at the initial temperatures. */
  initState(state: Float64Array, temperature: Float64Array): void {
    for (const el of this.problem.elements) {
      let T = 0;
      for (const n of el.nodes) T += temperature[n];
      el.kernel.initState(state, el.stateOffset, el.section, el.material, T / el.nodes.length);
    }
  }

  /**
   * assembleTangent / assembleResidual: evaluates every element at `input`, updating the
   * integration points' trial state, and sums fint (all dofs) and, when asked, K (free dofs).
   */
  assemble(input: AssemblyInput, wantTangent: boolean, status: AssemblyStatus): void {
    const { fint, matrix, pointStrain, pointStress, ctx } = this;
    fint.fill(0);
    if (wantTangent) {
      matrix.values.fill(0);
      this.coupling.values.fill(0);
    }
    status.ok = true;
    status.element = 0;
    status.message = '';
    ctx.state = input.state;
    ctx.stateOld = input.stateOld;
    ctx.wantTangent = wantTangent;
    const elements = this.problem.elements;
    for (let e = 0; e < elements.length; e++) {
      const el = elements[e];
      const buf = this.buffersFor(el);
      const dofs = el.dofs;
      for (let a = 0; a < dofs.length; a++) {
        buf.u[a] = input.u[dofs[a]];
        buf.uOld[a] = input.uOld[dofs[a]];
      }
      for (let a = 0; a < el.nodes.length; a++) {
        buf.T[a] = input.temperature[el.nodes[a]];
        buf.TOld[a] = input.temperatureOld[el.nodes[a]];
      }
      ctx.coords = el.coords;
      ctx.u = buf.u;
      ctx.uOld = buf.uOld;
      ctx.temperature = buf.T;
      ctx.temperatureOld = buf.TOld;
      ctx.section = el.section;
      ctx.material = el.material;
      ctx.stateOffset = el.stateOffset;
      const out = this.outputs[e];
      out.ok = true;
      out.message = '';
      el.kernel.evaluate(ctx, out);
      if (!out.ok && status.ok) {
        status.ok = false;
        status.element = el.id;
        status.message = out.message;
      }
      const nd = dofs.length;
      for (let a = 0; a < nd; a++) fint[dofs[a]] += out.fint[a];
      if (wantTangent) {
        const map = this.scatter[e];
        const K = out.K;
        const values = matrix.values;
        for (let k = 0; k < nd * nd; k++) {
          const pos = map[k];
          if (pos >= 0) values[pos] += K[k];
        }
        const cmap = this.couplingScatter[e];
        if (cmap) {
          const cv = this.coupling.values;
          for (let k = 0; k < nd * nd; k++) {
            const pos = cmap[k];
            if (pos >= 0) cv[pos] += K[k];
          }
        }
      }
      const p0 = 6 * el.pointOffset;
      const np = 6 * el.points;
      for (let k = 0; k < np; k++) {
        pointStrain[p0 + k] = out.strain[k];
        pointStress[p0 + k] = out.stress[k];
      }
    }
  }

  /** Whether the tangent's values are symmetric (to pick LDLᵀ rather than LU). */
  isSymmetric(relTol = 1e-10): boolean {
    const { rowPtr, colIdx, values, n } = this.matrix;
    let maxAbs = 0;
    for (let k = 0; k < values.length; k++) maxAbs = Math.max(maxAbs, Math.abs(values[k]));
    for (let i = 0; i < n; i++) {
      for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) {
        const j = colIdx[p];
        if (j <= i) continue;
        const q = findInRow(rowPtr, colIdx, j, i);
        if (Math.abs(values[p] - values[q]) > relTol * maxAbs) return false;
      }
    }
    return true;
  }
}
