/**
 * The constitutive interface every material in fe-core implements.
 *
 * A material is a pure update over one integration point: given the total strain and the
 * temperature at the end of the increment, the converged state at the start (`stateOld`) and the
 * parameters, it writes stress, consistent tangent and the trial state. It never mutates
 * `stateOld`; the driver swaps `state`/`stateOld` only after the global increment converges.
 *
 * Tensors are 3D, in Kelvin–Mandel order [11, 22, 33, √2·23, √2·13, √2·12], so every double
 * contraction is a plain dot product and the 6×6 tangent is a true second-order tensor matrix.
 * Reductions to uniaxial stress, plane stress, plane strain and axisymmetric states live in
 * material/reduce.ts and work for any material through this interface.
 */

/** Kelvin–Mandel vector length. */
export const KM = 6;

export interface MaterialPointInput {
  /** Total strain at the end of the increment (Kelvin–Mandel, length 6). */
  readonly strain: Float64Array;
  /** Temperature at the end of the increment (°C). */
  readonly temperature: number;
  /** Total strain and temperature at the start of the increment (converged values). */
  readonly strainOld: Float64Array;
  readonly temperatureOld: number;
}

export interface MaterialPointOutput {
  /** Cauchy (small-strain) stress, Kelvin–Mandel, length 6. */
  stress: Float64Array;
  /** Consistent tangent dσ/dε, 6×6 row-major (may be non-symmetric). */
  tangent: Float64Array;
  /** false when the local return map failed; `message` then says why (the driver cuts back). */
  ok: boolean;
  message: string;
}

/** Scalar fields a material can report per integration point (for results and plots). */
export interface MaterialReport {
  /** Martensite fraction ξ (0 for non-SMA materials). */
  xi: number;
  /** Equivalent plastic strain (0 when none). */
  eqPlastic: number;
  /** Transformation strain, Kelvin–Mandel, length 6 (zeros when none). */
  transformationStrain: Float64Array;
}

export interface Material<P> {
  readonly model: string;
  /** Number of doubles of internal state per integration point. */
  readonly stateSize: number;
  /** Parameters after calibration (derived constants), computed once per analysis. */
  readonly params: P;
  /** Writes the initial (virgin) state at `offset`. */
  initState(state: Float64Array, offset: number, temperature: number): void;
  /**
   * Pure update: reads stateOld[oldOffset .. +stateSize], writes state[newOffset .. +stateSize],
   * out.stress, out.tangent, out.ok/out.message. No allocation on this path.
   */
  update(
    input: MaterialPointInput,
    stateOld: Float64Array,
    oldOffset: number,
    state: Float64Array,
    newOffset: number,
    out: MaterialPointOutput,
  ): void;
  /** Reads the reportable scalars of a stored state. */
  report(state: Float64Array, offset: number, out: MaterialReport): void;
}

export function createMaterialPointOutput(): MaterialPointOutput {
  return { stress: new Float64Array(KM), tangent: new Float64Array(KM * KM), ok: true, message: '' };
}

export function createMaterialReport(): MaterialReport {
  return { xi: 0, eqPlastic: 0, transformationStrain: new Float64Array(KM) };
}
