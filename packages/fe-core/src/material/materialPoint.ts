/**
 * Material-point driver: one integration point in a uniaxial stress state (σ22 = σ33 = 0 by the
 * local Newton iteration of ReducedMaterial 'uniaxial', condensed tangent), driven along a path of
 * legs in axial strain or axial stress and temperature. Used by calibration, by the material
 * preview and by tests.
 *
 * Conventions
 *  - The point starts virgin and stress-free at the first path temperature. Strain is reported
 *    (and prescribed, under strain control) relative to that stress-free state, so a clamped
 *    start does not pick up a thermal stress from T_ref.
 *  - If the first path point has a non-zero value it is reached by a first leg at constant
 *    temperature (its `increments`, default 20).
 *  - Leg k runs over time k−1 … k; value and temperature vary linearly along it.
 *  - A failed increment (local return map, or the stress-control iteration) is cut in halves up
 *    to MAX_CUTS times; only the requested increments produce rows.
 */
import { ReducedMaterial, createReducedOutput, type ReducedOutput } from './reduce';
import { createMaterialReport, type Material } from './types';

export type MaterialPointControl = 'strain' | 'stress';

export interface MaterialPointPoint {
  /** Axial strain (strain control) or axial stress in MPa (stress control) at the leg's end. */
  value: number;
  /** Temperature at the leg's end (°C). */
  temperature: number;
  /** Increments used to reach this point from the previous one. */
  increments?: number;
}

export interface MaterialPointPath {
  control: MaterialPointControl;
  path: readonly MaterialPointPoint[];
}

export interface MaterialPointRow {
  time: number;
  strain: number;
  stress: number;
  temperature: number;
  xi: number;
  /** Axial component of the transformation strain. */
  transformationStrain: number;
  /** Lateral strain ε22 (= ε33). */
  lateralStrain: number;
}

export interface MaterialPointResult {
  rows: MaterialPointRow[];
  ok: boolean;
  message: string;
  /** Increments that needed cut-backs, and the total number of sub-increments solved. */
  cutBacks: number;
  subIncrements: number;
}

export const DEFAULT_INCREMENTS = 100;
const FIRST_LEG_INCREMENTS = 20;
const MAX_CUTS = 14;
const MAX_STRESS_ITERATIONS = 40;

interface PointState {
  strain: number;
  stress: number;
  temperature: number;
  tangent: number;
}

/** Runs the path; never throws on non-convergence (ok = false and the rows so far). */
export function runMaterialPoint<P>(material: Material<P>, driver: MaterialPointPath): MaterialPointResult {
  return new MaterialPointRunner(material, driver).run();
}

/** σ22 = σ33 = 0 through ReducedMaterial 'uniaxial'; state = [material state | ε22, ε33]. */
export class UniaxialPoint<P> {
  readonly stateSize: number;
  private readonly reduced: ReducedMaterial<P>;
  private readonly out: ReducedOutput = createReducedOutput('uniaxial');
  private readonly strain = new Float64Array(1);
  private readonly strainOld = new Float64Array(1);
  private readonly input = { strain: this.strain, strainOld: this.strainOld, temperature: 0, temperatureOld: 0 };
  /** Axial stress, condensed axial tangent, and the local failure message. */
  stress = 0;
  tangent = 0;
  ok = true;
  message = '';

  constructor(readonly material: Material<P>) {
    this.reduced = new ReducedMaterial(material, 'uniaxial');
    this.stateSize = this.reduced.stateSize;
  }

  initState(state: Float64Array, temperature: number): void {
    this.reduced.initState(state, 0, temperature);
  }

  update(strain: number, strainOld: number, temperature: number, temperatureOld: number, stateOld: Float64Array, state: Float64Array): boolean {
    this.strain[0] = strain;
    this.strainOld[0] = strainOld;
    this.input.temperature = temperature;
    this.input.temperatureOld = temperatureOld;
    this.reduced.update(this.input, stateOld, 0, state, 0, this.out);
    this.ok = this.out.ok;
    this.message = this.out.message;
    this.stress = this.out.stress[0];
    this.tangent = this.out.tangent[0];
    return this.ok;
  }
}

class MaterialPointRunner<P> {
  private readonly point: UniaxialPoint<P>;
  private stateOld: Float64Array;
  private state: Float64Array;
  private readonly report = createMaterialReport();
  private readonly rows: MaterialPointRow[] = [];
  private cur: PointState = { strain: 0, stress: 0, temperature: 0, tangent: 0 };
  private strainOffset = 0;
  private cutBacks = 0;
  private subIncrements = 0;
  private failure = '';

  constructor(
    material: Material<P>,
    private readonly driver: MaterialPointPath,
  ) {
    this.point = new UniaxialPoint(material);
    this.stateOld = new Float64Array(this.point.stateSize);
    this.state = new Float64Array(this.point.stateSize);
  }

  run(): MaterialPointResult {
    const path = this.driver.path;
    if (path.length === 0) return this.result(false, 'the path is empty');
    const T0 = path[0].temperature;
    this.point.initState(this.stateOld, T0);
    this.cur = { strain: 0, stress: 0, temperature: T0, tangent: 0 };
    // Stress-free start: find the thermal strain at T0 with zero axial stress.
    if (!this.tryStep(0, 'stress', T0)) return this.result(false, `no stress-free start at ${T0} °C: ${this.failure}`);
    this.strainOffset = this.cur.strain;
    this.pushRow(0);
    const legs: { from: MaterialPointPoint; to: MaterialPointPoint; time0: number }[] = [];
    let time = 0;
    if (path[0].value !== 0) {
      legs.push({ from: { value: 0, temperature: T0 }, to: { ...path[0], increments: path[0].increments ?? FIRST_LEG_INCREMENTS }, time0: time });
      time += 1;
    }
    for (let k = 1; k < path.length; k++) {
      legs.push({ from: path[k - 1], to: path[k], time0: time });
      time += 1;
    }
    for (let l = 0; l < legs.length; l++) {
      const { from, to, time0 } = legs[l];
      const n = Math.max(1, Math.round(to.increments ?? DEFAULT_INCREMENTS));
      for (let i = 1; i <= n; i++) {
        const f = i / n;
        const value = from.value + f * (to.value - from.value);
        const temp = from.temperature + f * (to.temperature - from.temperature);
        if (!this.advance(value, temp)) {
          return this.result(false, `leg ${l + 1}, increment ${i} of ${n}: ${this.failure}`);
        }
        this.pushRow(time0 + f);
      }
    }
    return this.result(true, '');
  }

  private result(ok: boolean, message: string): MaterialPointResult {
    return { rows: this.rows, ok, message, cutBacks: this.cutBacks, subIncrements: this.subIncrements };
  }

  /** Target value in the driver's variable → internal (strain control adds the start offset). */
  private advance(value: number, temp: number): boolean {
    const control = this.driver.control;
    const target = control === 'strain' ? value + this.strainOffset : value;
    const start = { ...this.cur };
    const startValue = control === 'strain' ? start.strain : start.stress;
    // Sub-increments: 1, then halves on failure.
    let done = 0; // fraction of the increment completed
    let step = 1;
    let cuts = 0;
    while (done < 1 - 1e-14) {
      const f = Math.min(1, done + step);
      const v = startValue + f * (target - startValue);
      const T = start.temperature + f * (temp - start.temperature);
      if (this.tryStep(v, control, T)) {
        done = f;
        this.subIncrements++;
        if (step < 1 - done) step = Math.min(2 * step, 1 - done);
      } else {
        cuts++;
        if (cuts === 1) this.cutBacks++;
        if (cuts > MAX_CUTS) return false;
        step *= 0.5;
      }
    }
    return true;
  }

  /** One sub-increment from the converged state; on success it becomes the converged state. */
  private tryStep(value: number, control: MaterialPointControl, temp: number): boolean {
    const ok = control === 'strain' ? this.evaluate(value, temp) : this.solveStress(value, temp);
    if (!ok) return false;
    const swap = this.stateOld;
    this.stateOld = this.state;
    this.state = swap;
    this.cur = { strain: this.trialStrain, stress: this.point.stress, temperature: temp, tangent: this.point.tangent };
    return true;
  }

  private trialStrain = 0;

  private evaluate(strain: number, temp: number): boolean {
    this.trialStrain = strain;
    const ok = this.point.update(strain, this.cur.strain, temp, this.cur.temperature, this.stateOld, this.state);
    if (!ok) this.failure = this.point.message;
    return ok;
  }

  /** Newton on the axial strain so that σ11 = target, safeguarded by a bracket. */
  private solveStress(target: number, temp: number): boolean {
    let eps = this.cur.strain;
    let lo = -Infinity;
    let hi = Infinity;
    const tol = 1e-10 * Math.max(Math.abs(target), Math.abs(this.cur.stress), 1);
    for (let it = 0; it < MAX_STRESS_ITERATIONS; it++) {
      if (!this.evaluate(eps, temp)) return false;
      const r = this.point.stress - target;
      if (Math.abs(r) <= tol) return true;
      if (r > 0) hi = Math.min(hi, eps);
      else lo = Math.max(lo, eps);
      const k = this.point.tangent;
      let next = k > 0 ? eps - r / k : NaN;
      if (!(next > lo && next < hi)) {
        if (Number.isFinite(lo) && Number.isFinite(hi)) next = 0.5 * (lo + hi);
        else {
          this.failure = 'the axial tangent is not positive (softening) under stress control';
          return false;
        }
      }
      eps = next;
    }
    this.failure = `stress control did not converge in ${MAX_STRESS_ITERATIONS} iterations`;
    return false;
  }

  private pushRow(time: number): void {
    this.point.material.report(this.stateOld, 0, this.report);
    this.rows.push({
      time,
      strain: this.cur.strain - this.strainOffset,
      stress: this.cur.stress,
      temperature: this.cur.temperature,
      xi: this.report.xi,
      transformationStrain: this.report.transformationStrain[0],
      lateralStrain: this.stateOld[this.point.material.stateSize],
    });
  }
}

export const MATERIAL_POINT_COLUMNS = [
  'time',
  'strain',
  'stress',
  'temperature',
  'xi',
  'transformation_strain',
  'lateral_strain',
] as const;

/** CSV text (header + one row per converged increment). */
export function materialPointCsv(rows: readonly MaterialPointRow[]): string {
  const lines = [MATERIAL_POINT_COLUMNS.join(',')];
  for (const r of rows) {
    lines.push(
      [r.time, r.strain, r.stress, r.temperature, r.xi, r.transformationStrain, r.lateralStrain]
        .map((x) => (Number.isInteger(x) ? String(x) : x.toPrecision(10)))
        .join(','),
    );
  }
  return lines.join('\n') + '\n';
}
