/**
 * The nonlinear driver: segments × increments × Newton–Raphson with the consistent tangent.
 *
 * - Each segment ramps its load targets and temperature linearly from the values reached at
 *   the end of the previous segment; increments are fractions of the segment.
 * - An increment converges when the out-of-balance force on the free dofs is small relative to
 *   the force scale (external loads and support reactions) AND the last displacement correction
 *   is small relative to the increment's displacement (or the residual is at round-off).
 * - A failing increment (too many iterations, diverging residual, a material point that could
 *   not return, a singular tangent) is cut back and retried; increments that converge easily
 *   grow again. Integration-point state is only committed (state → stateOld) after convergence.
 * - The analysis is a generator that yields after every iteration, so the same code runs
 *   synchronously (CLI, tests) or cooperatively in an event loop (worker) and can be cancelled
 *   between iterations through shouldStop().
 * - A failure returns the converged frames and a reason an analyst can act on.
 */
import { Assembler, type AssemblyStatus } from '../../assembly/assembler';
import { recoverReactions } from '../../constraints/dirichlet';
import { freeRigidBodyMotions } from '../../constraints/rigidBody';
import { describeDof, nodalTemperatures, type Problem } from '../../assembly/problem';
import { reportPoints, type Frame } from '../../output/frame';
import { locatePoint, type Probe } from '../../output/probe';
import { frameHistory } from '../../output/history';
import { defaultSolverFactory } from './solverChoice';
import { SingularMatrixError, type SparseDirectSolver } from '../linear/types';

export interface IterationInfo {
  segment: number;
  segmentName: string;
  increment: number;
  iteration: number;
  /** Analysis time at the end of the increment being solved (s). */
  time: number;
  /** Fraction of the segment at the end of the increment, and the increment's size. */
  fraction: number;
  step: number;
  /** Out-of-balance force relative to the force scale. */
  residualNorm: number;
  /** Last displacement correction relative to the increment's displacement (NaN before the first). */
  correctionNorm: number;
  /** Cut-backs so far in this segment. */
  cutBacks: number;
}

export interface CutBackInfo {
  segment: number;
  segmentName: string;
  time: number;
  reason: string;
  newStep: number;
}

export type FailureKind = 'unconstrained' | 'not-converged' | 'material' | 'bad-model';

export interface AnalysisFailure {
  kind: FailureKind;
  /** One paragraph: where, what stalled, what to try. */
  message: string;
  segment?: number;
  segmentName?: string;
  time?: number;
  /** For unconstrained models: where the stiffness vanished. */
  node?: number;
  direction?: string;
}

export interface AnalysisResult {
  status: 'succeeded' | 'failed' | 'cancelled';
  frames: Frame[];
  failure?: AnalysisFailure;
  stats: { increments: number; iterations: number; cutBacks: number; factorisations: number; unknowns: number };
}

export interface AnalysisHooks {
  onIteration?(info: IterationInfo): void;
  onFrame?(frame: Frame): void;
  onCutBack?(info: CutBackInfo): void;
  /** Checked between iterations: return true to stop (the run is then 'cancelled'). */
  shouldStop?(): boolean;
}

export interface AnalysisOptions extends AnalysisHooks {
  /** Sparse direct solver factory; solverChoice.ts decides by default. */
  createSolver?: () => SparseDirectSolver;
  /** Keep frames in the result (default true; a worker streaming frames may turn it off). */
  keepFrames?: boolean;
  /**
   * Start each increment with a predictor from the converged tangent, the load step and the
   * prescribed-displacement step (default true). Without it the prescribed step is applied to
   * the boundary nodes alone and the first iterate strains only the boundary elements.
   */
  predictor?: boolean;
}

/** A converged increment needing this many iterations or fewer lets the next one grow. */
const EASY_ITERATIONS = 5;
const GROWTH = 1.5;
const CUT = 0.25;
/** Residual at this fraction of the force tolerance counts as converged without the displacement test. */
const ROUND_OFF = 1e-3;

/** Material models whose consistent tangent is symmetric (others use the LU path). */
const SYMMETRIC_MODELS = new Set(['linear-elastic', 'j2-plastic', 'souza-auricchio']);

class IncrementFailure extends Error {
  constructor(
    readonly kind: FailureKind,
    message: string,
  ) {
    super(message);
  }
}

class Cancelled extends Error {}

/** Runs the whole analysis synchronously. */
export function runAnalysis(problem: Problem, options: AnalysisOptions = {}): AnalysisResult {
  const gen = analysisSteps(problem, options);
  for (;;) {
    const next = gen.next();
    if (next.done) return next.value;
  }
}

/**
 * Runs the analysis, yielding to the event loop at most every `yieldMs` milliseconds of work
 * (between iterations), so progress events go out and a cancel request is seen by shouldStop().
 */
export async function runAnalysisAsync(problem: Problem, options: AnalysisOptions = {}, yieldMs = 20): Promise<AnalysisResult> {
  const gen = analysisSteps(problem, options);
  let last = performance.now();
  for (;;) {
    const next = gen.next();
    if (next.done) return next.value;
    if (performance.now() - last >= yieldMs) {
      await new Promise<void>((resolve) => setTimeout(resolve, 0));
      last = performance.now();
    }
  }
}

/** The analysis as a generator: yields after every Newton iteration. */
export function* analysisSteps(problem: Problem, options: AnalysisOptions = {}): Generator<IterationInfo, AnalysisResult, void> {
  const driver = new Driver(problem, options);
  return yield* driver.run();
}

class Driver {
  private readonly asm: Assembler;
  private readonly solver: SparseDirectSolver;
  private readonly symmetric: boolean;
  private readonly nDof: number;
  private readonly nEq: number;
  // Converged values at the start of the increment and the current iterate.
  private readonly u: Float64Array;
  private readonly uOld: Float64Array;
  private readonly T: Float64Array;
  private readonly TOld: Float64Array;
  private state: Float64Array;
  private stateOld: Float64Array;
  private readonly fext: Float64Array;
  private readonly rhs: Float64Array;
  private readonly predictorStep: Float64Array;
  private readonly du: Float64Array;
  /** Load values at the start of the current segment and at its end. */
  private readonly loadStart: Float64Array;
  private readonly loadEnd: Float64Array;
  private readonly loadNow: Float64Array;
  private readonly TSegStart: Float64Array;
  private readonly TSegEnd: Float64Array;
  private readonly status: AssemblyStatus = { ok: true, element: 0, message: '' };
  private readonly frames: Frame[] = [];
  private readonly probes: Probe[];
  private analysed = false;
  private anyConverged = false;
  private forceFloor = 0;
  /** Force scale of the last converged increment, and of the last residual evaluation. */
  private startScale = 0;
  private lastScale = 0;
  private stats = { increments: 0, iterations: 0, cutBacks: 0, factorisations: 0, unknowns: 0 };

  constructor(
    private readonly problem: Problem,
    private readonly options: AnalysisOptions,
  ) {
    this.asm = new Assembler(problem);
    this.solver = (options.createSolver ?? defaultSolverFactory(problem))();
    this.symmetric = Object.values(problem.model.materials).every((m) => SYMMETRIC_MODELS.has(m.model));
    this.nDof = problem.nDof;
    this.nEq = this.asm.numbering.freeDofs.length;
    this.stats.unknowns = this.nEq;
    this.u = new Float64Array(this.nDof);
    this.uOld = new Float64Array(this.nDof);
    this.T = nodalTemperatures(problem, problem.model.initialTemperature);
    this.TOld = this.T.slice();
    this.TSegStart = this.T.slice();
    this.TSegEnd = this.T.slice();
    this.state = new Float64Array(problem.stateSize);
    this.stateOld = new Float64Array(problem.stateSize);
    this.asm.initState(this.stateOld, this.T);
    this.state.set(this.stateOld);
    this.fext = new Float64Array(this.nDof);
    this.rhs = new Float64Array(this.nEq);
    this.predictorStep = new Float64Array(problem.dirichlet.length);
    this.du = new Float64Array(this.nEq);
    const nLoads = problem.loads.length;
    this.loadStart = new Float64Array(nLoads);
    this.loadEnd = new Float64Array(nLoads);
    this.loadNow = new Float64Array(nLoads);
    this.probes = problem.model.output.points.map((p) => locatePoint(problem, p.x, p.y));
  }

  *run(): Generator<IterationInfo, AnalysisResult, void> {
    const segments = this.problem.model.segments;
    // Frame 0: the unloaded initial state (stresses from the initial evaluation, normally zero).
    this.evaluate(true);
    this.emitFrame(0, 0, 0, 0);
    let time = 0;
    for (let s = 0; s < segments.length; s++) {
      const seg = segments[s];
      this.beginSegment(s);
      const ctl = seg.increments;
      let fraction = 0;
      let step = ctl.initial;
      let cutBacks = 0;
      let increment = 0;
      while (fraction < 1 - 1e-12) {
        // Finish the segment exactly; avoid leaving a sliver much smaller than the minimum.
        if (fraction + step > 1 - 1e-12 || 1 - (fraction + step) < 0.5 * ctl.min) step = 1 - fraction;
        const target = fraction + step;
        let iterations = 0;
        try {
          iterations = yield* this.solveIncrement(s, increment + 1, target, step, time + target * seg.duration, cutBacks);
        } catch (err) {
          if (err instanceof Cancelled) return this.finish('cancelled');
          if (!(err instanceof IncrementFailure)) throw err;
          if (err.kind === 'unconstrained' || err.kind === 'bad-model') {
            return this.finish('failed', { kind: err.kind, message: err.message, segment: s, segmentName: seg.name, time, ...this.unconstrainedWhere });
          }
          this.cutBack();
          const newStep = step * CUT;
          cutBacks++;
          this.stats.cutBacks++;
          const at = time + fraction * seg.duration;
          if (newStep < ctl.min * (1 - 1e-9)) {
            return this.finish('failed', {
              kind: err.kind,
              segment: s,
              segmentName: seg.name,
              time: at,
              message: this.explainFailure(seg.name, at, err, step, ctl.min),
            });
          }
          this.options.onCutBack?.({ segment: s, segmentName: seg.name, time: at, reason: err.message, newStep });
          step = newStep;
          continue;
        }
        this.commitIncrement();
        fraction = target;
        increment++;
        this.stats.increments++;
        const atEnd = fraction >= 1 - 1e-12;
        if (seg.frames === 'every' || atEnd) this.emitFrame(s, increment, time + fraction * seg.duration, iterations);
        if (iterations <= Math.min(EASY_ITERATIONS, ctl.maxIterations)) step = Math.min(step * GROWTH, ctl.max);
      }
      time += seg.duration;
    }
    return this.finish('succeeded');
  }

  private unconstrainedWhere: { node?: number; direction?: string } = {};

  private explainFailure(segName: string, at: number, err: IncrementFailure, step: number, min: number): string {
    const where = `Segment "${segName}" stopped at t = ${at.toPrecision(4)} s`;
    const tries =
      err.kind === 'material'
        ? 'Try a smaller minimum increment, check the material constants (temperatures, slopes, stress levels), or control the load by displacement instead of force on soft plateaus.'
        : 'Try a smaller minimum increment or more iterations per increment; if the structure loses stiffness (yield or transformation plateau), prescribe displacement instead of force.';
    return `${where}: the increment could not be solved even at the minimum size (${min} of the segment; last tried ${step.toPrecision(3)}). Last problem: ${err.message}. ${tries}`;
  }

  private beginSegment(s: number): void {
    const seg = this.problem.model.segments[s];
    this.loadStart.set(this.loadEnd);
    this.problem.loads.forEach((l, i) => {
      const target = seg.targets[l.name];
      this.loadEnd[i] = target === undefined ? this.loadStart[i] : target;
    });
    this.TSegStart.set(this.TSegEnd);
    if (seg.temperature !== undefined) nodalTemperatures(this.problem, seg.temperature, this.TSegEnd);
  }

  /** Load values, prescribed displacements, temperatures and fext at a fraction of the segment. */
  private applyLoads(fraction: number): void {
    const { loadStart, loadEnd, loadNow } = this;
    for (let i = 0; i < loadNow.length; i++) loadNow[i] = loadStart[i] + fraction * (loadEnd[i] - loadStart[i]);
    for (let n = 0; n < this.T.length; n++) this.T[n] = this.TSegStart[n] + fraction * (this.TSegEnd[n] - this.TSegStart[n]);
    this.fext.fill(0);
    this.problem.loadPatterns.forEach((pattern, i) => {
      if (!pattern || loadNow[i] === 0) return;
      const v = loadNow[i];
      for (let d = 0; d < this.nDof; d++) this.fext[d] += v * pattern[d];
    });
    for (const d of this.problem.dirichlet) this.u[d.dof] = d.load >= 0 ? loadNow[d.load] : 0;
  }

  private evaluate(wantTangent: boolean): void {
    this.asm.assemble(
      { u: this.u, uOld: this.uOld, temperature: this.T, temperatureOld: this.TOld, state: this.state, stateOld: this.stateOld },
      wantTangent,
      this.status,
    );
  }

  /** Free-dof residual r = fext − fint into rhs; returns its norm and the force scale. */
  private residual(): { norm: number; scale: number } {
    const { freeDofs } = this.asm.numbering;
    const fint = this.asm.fint;
    let r2 = 0;
    let f2 = 0;
    for (let k = 0; k < this.nEq; k++) {
      const d = freeDofs[k];
      const r = this.fext[d] - fint[d];
      this.rhs[k] = r;
      r2 += r * r;
      f2 += this.fext[d] * this.fext[d];
    }
    let R2 = 0;
    for (const d of this.problem.dirichlet) {
      const r = fint[d.dof] - this.fext[d.dof];
      R2 += r * r;
    }
    // The force scale at the start of the increment counts too, so unloading to zero force is
    // judged against the forces the structure just carried rather than against round-off.
    const scale = Math.max(Math.sqrt(f2), Math.sqrt(R2), this.startScale, this.forceFloor);
    this.lastScale = scale;
    return { norm: Math.sqrt(r2), scale };
  }

  private *solveIncrement(
    segment: number,
    increment: number,
    fraction: number,
    step: number,
    time: number,
    cutBacks: number,
  ): Generator<IterationInfo, number, void> {
    const seg = this.problem.model.segments[segment];
    const { forceTolerance, displacementTolerance, lineSearch } = this.problem.model.solver;
    if (this.options.predictor !== false && this.nEq > 0) this.predict(fraction);
    else this.applyLoads(fraction);
    const { freeDofs } = this.asm.numbering;
    let correction = Number.NaN;
    let firstResidual = 0;
    for (let it = 0; it <= seg.increments.maxIterations; it++) {
      this.updateIntegrationPoints(true);
      if (this.forceFloor === 0) this.forceFloor = this.forceScaleFloor();
      const { norm, scale } = this.residual();
      const rel = norm / scale;
      if (it === 0) firstResidual = rel;
      this.stats.iterations++;
      const info: IterationInfo = {
        segment,
        segmentName: seg.name,
        increment,
        iteration: it,
        time,
        fraction,
        step,
        residualNorm: rel,
        correctionNorm: correction,
        cutBacks,
      };
      this.options.onIteration?.(info);
      yield info;
      if (this.options.shouldStop?.()) throw new Cancelled();
      if (!Number.isFinite(rel)) throw new IncrementFailure('not-converged', 'the residual became infinite or NaN');
      const forceOk = rel <= forceTolerance || this.nEq === 0;
      const dispOk = correction <= displacementTolerance;
      if (forceOk && (dispOk || rel <= ROUND_OFF * forceTolerance)) return it;
      if (it === seg.increments.maxIterations) {
        throw new IncrementFailure('not-converged', `Newton iterations stalled (relative residual ${rel.toExponential(2)} after ${it} iterations)`);
      }
      if (it >= 3 && rel > 1e3 * Math.max(firstResidual, forceTolerance)) {
        throw new IncrementFailure('not-converged', `the residual grew from ${firstResidual.toExponential(2)} to ${rel.toExponential(2)} (diverging)`);
      }
      this.solveCorrection();
      let eta = 1;
      if (lineSearch) eta = this.lineSearch();
      let du2 = 0;
      let inc2 = 0;
      for (let k = 0; k < this.nEq; k++) {
        const d = freeDofs[k];
        this.u[d] += eta * this.du[k];
        du2 += (eta * this.du[k]) ** 2;
        inc2 += (this.u[d] - this.uOld[d]) ** 2;
      }
      correction = Math.sqrt(du2) / Math.max(Math.sqrt(inc2), 1e-12 * this.problem.size);
    }
    return seg.increments.maxIterations;
  }

  /**
   * Predictor: the first correction of the increment, from the tangent and internal forces at
   * the converged displacements under the increment's new temperatures (a zero strain increment,
   * so a load reversal sees the elastic unloading stiffness rather than the transforming or
   * yielding one of the last iteration, and a temperature change already acts as a load):
   *   K_ff du_f = f_ext,f(new) − f_int,f(u_old, T_new) − K_fp Δu_p.
   * A step of prescribed displacement thus spreads over the whole body (as the linear response
   * would) instead of straining only the elements at the boundary in the first iterate.
   */
  private predict(fraction: number): void {
    const { freeDofs, prescribed } = this.asm.numbering;
    // Entered with u = uOld, T = TOld (after a commit or a cut-back).
    this.applyLoads(fraction);
    const step = this.predictorStep;
    let stepNorm = 0;
    for (let k = 0; k < prescribed.length; k++) {
      const d = prescribed[k];
      step[k] = this.u[d] - this.uOld[d];
      stepNorm += step[k] * step[k];
      this.u[d] = this.uOld[d];
    }
    this.evaluate(true);
    for (let k = 0; k < prescribed.length; k++) this.u[prescribed[k]] += step[k];
    if (!this.status.ok) throw new IncrementFailure('material', `material point in element ${this.status.element} did not converge in the predictor (${this.status.message || 'local update failed'})`);
    if (stepNorm > 0) this.asm.couplingTimes(step, this.rhs);
    else this.rhs.fill(0);
    let r2 = 0;
    let f2 = 0;
    for (let k = 0; k < this.nEq; k++) {
      const d = freeDofs[k];
      const fint = this.asm.fint[d];
      const r = this.fext[d] - fint - this.rhs[k];
      this.rhs[k] = r;
      r2 += r * r;
      f2 += this.fext[d] * this.fext[d] + fint * fint;
    }
    // Nothing to predict (a hold): the iterations take over.
    if (r2 <= 1e-28 * Math.max(f2, this.forceFloor * this.forceFloor)) return;
    this.solveCorrection();
    for (let k = 0; k < this.nEq; k++) this.u[freeDofs[k]] += this.du[k];
  }

  /** Element loop at the current iterate: trial material state, fint and (assembleTangent) K. */
  private updateIntegrationPoints(wantTangent: boolean): void {
    this.evaluate(wantTangent);
    if (!this.status.ok) {
      throw new IncrementFailure('material', `material point in element ${this.status.element} did not converge (${this.status.message || 'local update failed'})`);
    }
  }

  /** Absolute floor of the force scale: round-off level of the stiffness times the model size. */
  private forceScaleFloor(): number {
    const { rowPtr, colIdx, values, n } = this.asm.matrix;
    let maxDiag = 0;
    for (let i = 0; i < n; i++) for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) if (colIdx[p] === i) maxDiag = Math.max(maxDiag, Math.abs(values[p]));
    return Math.max(1e-12 * maxDiag * this.problem.size, 1e-300);
  }

  /** The tangent was assembled with the integration-point update; factor it and solve K du = r. */
  private solveCorrection(): void {
    if (this.nEq === 0) return;
    const A = this.asm.matrix;
    try {
      if (!this.analysed) {
        this.solver.analyse(A, { symmetric: this.symmetric, coordinates: this.equationCoordinates() });
        this.analysed = true;
      }
      this.solver.factor(A);
      this.stats.factorisations++;
    } catch (err) {
      if (!(err instanceof SingularMatrixError)) {
        // Any other linear-solver failure (e.g. an iterative solver that stalls) is worth a cut-back.
        throw new IncrementFailure('not-converged', `the linear solver failed: ${(err as Error).message}`);
      }
      const dof = this.asm.numbering.freeDofs[err.unknown];
      const where = dof === undefined ? { node: undefined, direction: undefined } : describeDof(this.problem, dof);
      if (!this.anyConverged) {
        this.unconstrainedWhere = { node: where.node, direction: where.direction };
        throw new IncrementFailure('unconstrained', this.explainUnconstrained(where.node, where.direction));
      }
      throw new IncrementFailure('not-converged', `the tangent stiffness became singular at node ${where.node}, direction ${where.direction} (a mechanism or a fully softened region)`);
    }
    try {
      this.solver.solve(this.rhs, this.du);
    } catch (err) {
      throw new IncrementFailure('not-converged', `the linear solver failed: ${(err as Error).message}`);
    }
  }

  /** Words for a model that moves without resistance: which rigid motions are free, and where. */
  private explainUnconstrained(node: number | undefined, direction: string | undefined): string {
    const { free } = freeRigidBodyMotions(this.problem);
    const at = `the stiffness vanished at node ${node} in direction ${direction}`;
    if (free.length > 0) {
      return (
        `The model is not held: it can move without resistance (free: ${free.join('; ')}); ${at}. ` +
        `Add supports (a fixed set or symmetry) that stop these motions, and check that every element is connected to the rest of the mesh.`
      );
    }
    return (
      `A part of the model can move without resistance although the supports stop rigid-body motion: ${at}. ` +
      `Check for elements or parts not connected to the rest of the mesh, nodes used by no element, and materials with zero stiffness.`
    );
  }

  private equationCoordinates(): Float64Array {
    const { freeDofs } = this.asm.numbering;
    const xy = new Float64Array(2 * this.nEq);
    for (let k = 0; k < this.nEq; k++) {
      const { node } = describeDof(this.problem, freeDofs[k]);
      const i = this.problem.nodeIndex.get(node)!;
      xy[2 * k] = this.problem.coords[2 * i];
      xy[2 * k + 1] = this.problem.coords[2 * i + 1];
    }
    return xy;
  }

  /**
   * Line search on the energy along the Newton direction: g(η) = du·r(u + η du). When the full
   * step overshoots (g changes sign and has not shrunk enough) take the secant root, clipped to
   * [0.1, 1]. One extra residual evaluation per iteration.
   */
  private lineSearch(): number {
    const { freeDofs } = this.asm.numbering;
    let g0 = 0;
    for (let k = 0; k < this.nEq; k++) g0 += this.du[k] * this.rhs[k];
    for (let k = 0; k < this.nEq; k++) this.u[freeDofs[k]] += this.du[k];
    this.evaluate(false);
    let g1 = 0;
    for (let k = 0; k < this.nEq; k++) {
      const d = freeDofs[k];
      g1 += this.du[k] * (this.fext[d] - this.asm.fint[d]);
      this.u[d] -= this.du[k];
    }
    if (!this.status.ok || !Number.isFinite(g1)) return 0.5;
    if (Math.abs(g1) <= 0.8 * Math.abs(g0) || g0 === g1) return 1;
    const eta = g0 / (g0 - g1);
    return Math.min(1, Math.max(0.1, eta));
  }

  private commitIncrement(): void {
    this.anyConverged = true;
    this.startScale = this.lastScale;
    // The trial state of the last (converged) evaluation becomes the converged state.
    const tmp = this.stateOld;
    this.stateOld = this.state;
    this.state = tmp;
    this.uOld.set(this.u);
    this.TOld.set(this.T);
  }

  /** Back to the converged state at the start of the increment (the trial state is simply overwritten). */
  private cutBack(): void {
    this.u.set(this.uOld);
    this.T.set(this.TOld);
  }

  private emitFrame(segment: number, increment: number, time: number, iterations: number): void {
    const p = this.problem;
    const displacement = new Float64Array(3 * p.nodeCount);
    const reaction = new Float64Array(3 * p.nodeCount);
    const R = new Float64Array(p.nDof);
    recoverReactions(this.asm.numbering, this.asm.fint, this.fext, R);
    for (let n = 0; n < p.nodeCount; n++) {
      for (let d = 0; d < p.dofCount[n]; d++) {
        displacement[3 * n + d] = this.u[p.dofStart[n] + d];
        reaction[3 * n + d] = R[p.dofStart[n] + d];
      }
    }
    // After commit the converged state sits in stateOld.
    const state = this.frames.length === 0 && increment === 0 ? this.state : this.stateOld;
    const rep = reportPoints(p, state);
    const base = {
      index: this.frameCount++,
      segment,
      segmentName: p.model.segments[segment].name,
      increment,
      time,
      iterations,
      displacement,
      reaction,
      temperature: this.T.slice(),
      pointStress: this.asm.pointStress.slice(),
      pointStrain: this.asm.pointStrain.slice(),
      pointXi: rep.xi,
      pointEqPlastic: rep.eqPlastic,
      pointTransformationStrain: rep.transformationStrain,
    };
    const frame: Frame = { ...base, history: frameHistory(p, base, this.probes) };
    if (this.options.keepFrames !== false) this.frames.push(frame);
    this.options.onFrame?.(frame);
  }

  private frameCount = 0;

  private finish(status: AnalysisResult['status'], failure?: AnalysisFailure): AnalysisResult {
    if (status === 'cancelled') {
      failure = { kind: 'not-converged', message: 'The run was cancelled; the frames converged so far are kept.' };
    }
    return { status, frames: this.frames, failure, stats: { ...this.stats } };
  }
}
