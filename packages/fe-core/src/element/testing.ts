/**
 * Test helpers for elements (not used by the engine): a tiny dense assembly with Newton iteration
 * for patch tests and small benchmarks, and a finite-difference check of element tangents.
 * The production assembly lives in assembly/; this one favours clarity over speed.
 */
import { ReducedMaterial } from '../material/reduce';
import type { Material } from '../material/types';
import { luFactor, luSolve } from './dense';
import { createElementOutput, elementDofs, type ElementContext, type ElementKernel, type ElementOutput, type Section } from './types';

export interface TestMeshInput<P> {
  kernel: ElementKernel;
  section: Section;
  material: Material<P>;
  /** Node coordinates, node-major (x, y). */
  coords: Float64Array | number[];
  /** Element connectivity (node indices per element). */
  elements: readonly (readonly number[])[];
  initialTemperature?: number;
}

export interface SolveOptions {
  /** Prescribed dof values (global dof index → value) for this increment. */
  fixed: ReadonlyMap<number, number>;
  /** External nodal forces (global dofs); zeros when absent. */
  loads?: Float64Array;
  /** Nodal temperatures at the end of the increment. */
  temperature?: Float64Array;
  maxIterations?: number;
  /** Residual tolerance relative to the largest nodal force (default 1e-10). */
  tolerance?: number;
}

export interface SolveResult {
  iterations: number;
  /** Residual norm (free dofs) after each assembly. */
  residuals: number[];
  converged: boolean;
}

/** Small model: state arrays, dense assembly, Newton on the free dofs. */
export class TestModel<P> {
  readonly nodes: number;
  readonly ndof: number;
  readonly reduced: ReducedMaterial<P>;
  readonly coords: Float64Array;
  u: Float64Array;
  uOld: Float64Array;
  temperature: Float64Array;
  temperatureOld: Float64Array;
  state: Float64Array;
  stateOld: Float64Array;
  readonly outputs: ElementOutput[];
  private readonly elementState: number;
  private readonly dpn: number;

  constructor(readonly input: TestMeshInput<P>) {
    const { kernel, section, elements } = input;
    this.coords = Float64Array.from(input.coords);
    this.nodes = this.coords.length / 2;
    this.dpn = kernel.dofsPerNode;
    this.ndof = this.nodes * this.dpn;
    this.reduced = new ReducedMaterial(input.material, kernel.stressState(section));
    this.elementState = kernel.stateSize(section, this.reduced.stateSize);
    this.state = new Float64Array(Math.max(1, this.elementState * elements.length));
    this.stateOld = new Float64Array(this.state.length);
    const t0 = input.initialTemperature ?? 20;
    elements.forEach((_, e) => kernel.initState(this.stateOld, e * this.elementState, section, this.reduced as ReducedMaterial<unknown>, t0));
    this.u = new Float64Array(this.ndof);
    this.uOld = new Float64Array(this.ndof);
    this.temperature = new Float64Array(this.nodes).fill(t0);
    this.temperatureOld = new Float64Array(this.nodes).fill(t0);
    this.outputs = elements.map(() => createElementOutput(kernel, section));
  }

  /** Element context of element e at the current u (fresh arrays: clarity over speed). */
  context(e: number, wantTangent = true): ElementContext {
    const { kernel, section } = this.input;
    const conn = this.input.elements[e];
    const nd = elementDofs(kernel);
    const coords = new Float64Array(2 * conn.length);
    const u = new Float64Array(nd);
    const uOld = new Float64Array(nd);
    const t = new Float64Array(conn.length);
    const tOld = new Float64Array(conn.length);
    conn.forEach((n, a) => {
      coords[2 * a] = this.coords[2 * n];
      coords[2 * a + 1] = this.coords[2 * n + 1];
      for (let d = 0; d < this.dpn; d++) {
        u[a * this.dpn + d] = this.u[n * this.dpn + d];
        uOld[a * this.dpn + d] = this.uOld[n * this.dpn + d];
      }
      t[a] = this.temperature[n];
      tOld[a] = this.temperatureOld[n];
    });
    return {
      coords, u, uOld, temperature: t, temperatureOld: tOld, section, material: this.reduced as ReducedMaterial<unknown>,
      state: this.state, stateOld: this.stateOld, stateOffset: e * this.elementState, wantTangent,
    };
  }

  globalDof(e: number, local: number): number {
    const a = Math.floor(local / this.dpn);
    return this.input.elements[e][a] * this.dpn + (local % this.dpn);
  }

  /** Assembles fint and the dense tangent at the current u. */
  assemble(): { fint: Float64Array; K: Float64Array } {
    const n = this.ndof;
    const fint = new Float64Array(n);
    const K = new Float64Array(n * n);
    const { kernel } = this.input;
    const nd = elementDofs(kernel);
    this.input.elements.forEach((_, e) => {
      const out = this.outputs[e];
      kernel.evaluate(this.context(e), out);
      if (!out.ok) throw new Error(`element ${e}: ${out.message}`);
      for (let i = 0; i < nd; i++) {
        const gi = this.globalDof(e, i);
        fint[gi] += out.fint[i];
        for (let j = 0; j < nd; j++) K[gi * n + this.globalDof(e, j)] += out.K[i * nd + j];
      }
    });
    return { fint, K };
  }

  /**
   * One load/displacement increment by Newton's method with a residual backtracking line
   * search (halving, at most 5 times); commit() afterwards to accept it.
   */
  solve(options: SolveOptions): SolveResult {
    const n = this.ndof;
    if (options.temperature) this.temperature.set(options.temperature);
    // Predictor: the first iteration linearises at the converged state and carries the
    // prescribed-displacement increments through K_fp Δu_p (instead of jumping the boundary
    // nodes alone, which would squeeze the whole increment into the boundary elements).
    this.u.set(this.uOld);
    const prescribed: [number, number][] = [];
    let jump = false;
    for (const [d, v] of options.fixed) {
      prescribed.push([d, v - this.uOld[d]]);
      if (v !== this.uOld[d]) jump = true;
    }
    const free: number[] = [];
    for (let d = 0; d < n; d++) if (!options.fixed.has(d)) free.push(d);
    const loads = options.loads ?? new Float64Array(n);
    const tolerance = options.tolerance ?? 1e-10;
    const nf = free.length;
    const Kff = new Float64Array(nf * nf);
    const r = new Float64Array(nf);
    const base = new Float64Array(nf);
    const piv = new Int32Array(nf);
    const residuals: number[] = [];
    const maxIt = options.maxIterations ?? 25;

    /** Assembles at the current u; fills r (free residual) and returns its norm and scale. */
    const evaluate = (predictor: boolean): { norm: number; scale: number; K: Float64Array } => {
      const { fint, K } = this.assemble();
      let norm = 0;
      for (let i = 0; i < nf; i++) {
        r[i] = loads[free[i]] - fint[free[i]];
        if (predictor) for (const [d, du] of prescribed) r[i] -= K[free[i] * n + d] * du;
        norm += r[i] * r[i];
      }
      // Force scale: nodal forces, or stiffness × displacement when they all vanish (free
      // thermal expansion is stress-free, its residual is pure round-off).
      let scale = 0, uMax = 0, kMax = 0;
      for (let d = 0; d < n; d++) {
        scale = Math.max(scale, Math.abs(fint[d]), Math.abs(loads[d]));
        uMax = Math.max(uMax, Math.abs(this.u[d]));
        kMax = Math.max(kMax, Math.abs(K[d * n + d]));
      }
      return { norm: Math.sqrt(norm), scale: Math.max(scale, kMax * uMax, 1e-30), K };
    };

    let current = evaluate(jump);
    residuals.push(current.norm);
    for (let it = 0; it < maxIt; it++) {
      const predictor = it === 0 && jump;
      if (!predictor && (current.norm <= tolerance * current.scale || nf === 0)) return { iterations: it, residuals, converged: true };
      const K = current.K;
      for (let i = 0; i < nf; i++) for (let j = 0; j < nf; j++) Kff[i * nf + j] = K[free[i] * n + free[j]];
      if (!luFactor(nf, Kff, piv)) throw new Error('singular stiffness in test model');
      luSolve(nf, Kff, piv, r);
      for (let i = 0; i < nf; i++) base[i] = this.u[free[i]];
      if (predictor) for (const [d, v] of options.fixed) this.u[d] = v;
      const du = Float64Array.from(r);
      let step = 1;
      for (;;) {
        for (let i = 0; i < nf; i++) this.u[free[i]] = base[i] + step * du[i];
        const trial = evaluate(false);
        if (predictor || trial.norm <= current.norm || step < 1 / 32) {
          current = trial;
          break;
        }
        step /= 2;
      }
      residuals.push(current.norm);
    }
    return { iterations: maxIt, residuals, converged: false };
  }

  commit(): void {
    this.uOld.set(this.u);
    this.stateOld.set(this.state);
    this.temperatureOld.set(this.temperature);
  }
}

/**
 * Largest |K − K_fd| / max|K| of one element at its context, by central differences of fint.
 */
export function elementTangentError(kernel: ElementKernel, ctx: ElementContext, h: number): number {
  const out = createElementOutput(kernel, ctx.section);
  const plus = createElementOutput(kernel, ctx.section);
  const minus = createElementOutput(kernel, ctx.section);
  kernel.evaluate(ctx, out);
  if (!out.ok) throw new Error(out.message);
  const nd = elementDofs(kernel);
  let scale = 0;
  for (const v of out.K) scale = Math.max(scale, Math.abs(v));
  let worst = 0;
  const u0 = Float64Array.from(ctx.u);
  const u = ctx.u as Float64Array;
  for (let j = 0; j < nd; j++) {
    u.set(u0);
    u[j] += h;
    kernel.evaluate({ ...ctx, wantTangent: false }, plus);
    u.set(u0);
    u[j] -= h;
    kernel.evaluate({ ...ctx, wantTangent: false }, minus);
    for (let i = 0; i < nd; i++) {
      const fd = (plus.fint[i] - minus.fint[i]) / (2 * h);
      worst = Math.max(worst, Math.abs(fd - out.K[i * nd + j]));
    }
  }
  u.set(u0);
  return worst / scale;
}

/** Mesh as node coordinates and connectivity. */
export interface PlainMesh {
  coords: number[];
  elements: number[][];
}

/** Splits each quad [a, b, c, d] into triangles [a, b, c] and [a, c, d]. */
export function splitQuads(mesh: PlainMesh): PlainMesh {
  const elements: number[][] = [];
  for (const [a, b, c, d] of mesh.elements) elements.push([a, b, c], [a, c, d]);
  return { coords: [...mesh.coords], elements };
}

/**
 * Adds a node at the middle of every (straight) edge, shared between neighbours: quads become
 * Q8 (corners, then mid-edges 0–1, 1–2, 2–3, 3–0) and triangles T6 (mid-edges 0–1, 1–2, 2–0).
 */
export function addMidsideNodes(mesh: PlainMesh): PlainMesh {
  const coords = [...mesh.coords];
  const edgeNode = new Map<string, number>();
  const mid = (a: number, b: number): number => {
    const key = a < b ? `${a}-${b}` : `${b}-${a}`;
    let n = edgeNode.get(key);
    if (n === undefined) {
      n = coords.length / 2;
      coords.push((coords[2 * a] + coords[2 * b]) / 2, (coords[2 * a + 1] + coords[2 * b + 1]) / 2);
      edgeNode.set(key, n);
    }
    return n;
  };
  const elements = mesh.elements.map((el) => {
    const k = el.length;
    const mids = el.map((a, i) => mid(a, el[(i + 1) % k]));
    return [...el, ...mids];
  });
  return { coords, elements };
}

/** nx × ny rectangular quad mesh of [x0, x1] × [y0, y1], nodes row by row (x fastest). */
export function rectangleMesh(nx: number, ny: number, x0: number, x1: number, y0: number, y1: number): PlainMesh {
  const coords: number[] = [];
  for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) coords.push(x0 + ((x1 - x0) * i) / nx, y0 + ((y1 - y0) * j) / ny);
  const elements: number[][] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const a = j * (nx + 1) + i;
      elements.push([a, a + 1, a + nx + 2, a + nx + 1]);
    }
  }
  return { coords, elements };
}
