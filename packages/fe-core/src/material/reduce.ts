/**
 * Reductions of any 3D material (material/types.ts) to the stress states the elements need.
 *
 * A reduction splits the six Kelvin–Mandel strain components into
 *   - active ones the element prescribes (its strain vector),
 *   - free ones whose stress must vanish (found by a local Newton iteration), and
 *   - ones held at zero (out-of-plane shears).
 * The element then sees the condensed tangent C_aa − C_af C_ff⁻¹ C_fa, which is the exact
 * linearisation of the reduced response. Because it works through the Material interface, the
 * plane-stress and uniaxial versions of every model (elastic, J2, SMA) come from one code path —
 * for the SMA models this is the "local iteration on σ33 = 0" the design notes require.
 *
 * The converged free strains are kept after the material's own state so each local iteration
 * starts from the last converged value (the state layout is [material state | free strains]).
 */
import {
  KM,
  createMaterialPointOutput,
  type Material,
  type MaterialPointInput,
  type MaterialPointOutput,
  type MaterialReport,
} from './types';

export type StressState = 'uniaxial' | 'planeStress' | 'planeStrain' | 'axisymmetric' | 'solid';

interface Layout {
  /** Kelvin–Mandel indices the element prescribes, in the element's order. */
  active: readonly number[];
  /** Indices whose stress is driven to zero. */
  free: readonly number[];
}

/**
 * Element strain orders: uniaxial [ε11]; plane states [ε11, ε22, √2ε12];
 * axisymmetric [ε_rr, ε_zz, ε_θθ, √2ε_rz] (r ↔ 1, z ↔ 2, θ ↔ 3); solid: all six.
 */
const LAYOUTS: Record<StressState, Layout> = {
  uniaxial: { active: [0], free: [1, 2] },
  planeStress: { active: [0, 1, 5], free: [2] },
  planeStrain: { active: [0, 1, 5], free: [] },
  axisymmetric: { active: [0, 1, 2, 5], free: [] },
  solid: { active: [0, 1, 2, 3, 4, 5], free: [] },
};

export function reducedSize(stressState: StressState): number {
  return LAYOUTS[stressState].active.length;
}

export interface ReducedInput {
  /** Element strain at the end of the increment, in the order of the stress state. */
  readonly strain: Float64Array;
  readonly strainOld: Float64Array;
  readonly temperature: number;
  readonly temperatureOld: number;
}

export interface ReducedOutput {
  /** Reduced stress, same order as the strain. */
  stress: Float64Array;
  /** Condensed consistent tangent, size×size row-major. */
  tangent: Float64Array;
  /** Full 3D strain and stress (Kelvin–Mandel) for results, e.g. the thickness strain. */
  fullStrain: Float64Array;
  fullStress: Float64Array;
  ok: boolean;
  message: string;
}

export function createReducedOutput(stressState: StressState): ReducedOutput {
  const n = reducedSize(stressState);
  return {
    stress: new Float64Array(n),
    tangent: new Float64Array(n * n),
    fullStrain: new Float64Array(KM),
    fullStress: new Float64Array(KM),
    ok: true,
    message: '',
  };
}

const MAX_LOCAL_ITERATIONS = 30;

export class ReducedMaterial<P> {
  readonly size: number;
  /** Doubles per point: the material's state followed by the converged free strains. */
  readonly stateSize: number;
  private readonly layout: Layout;
  private readonly strain = new Float64Array(KM);
  private readonly strainOld = new Float64Array(KM);
  private readonly point: MaterialPointOutput = createMaterialPointOutput();
  private readonly input: { strain: Float64Array; strainOld: Float64Array; temperature: number; temperatureOld: number };

  constructor(
    readonly material: Material<P>,
    readonly stressState: StressState,
  ) {
    this.layout = LAYOUTS[stressState];
    this.size = this.layout.active.length;
    this.stateSize = material.stateSize + this.layout.free.length;
    this.input = { strain: this.strain, strainOld: this.strainOld, temperature: 0, temperatureOld: 0 };
  }

  initState(state: Float64Array, offset: number, temperature: number): void {
    this.material.initState(state, offset, temperature);
    const base = offset + this.material.stateSize;
    for (let k = 0; k < this.layout.free.length; k++) state[base + k] = 0;
  }

  report(state: Float64Array, offset: number, out: MaterialReport): void {
    this.material.report(state, offset, out);
  }

  update(
    input: ReducedInput,
    stateOld: Float64Array,
    oldOffset: number,
    state: Float64Array,
    newOffset: number,
    out: ReducedOutput,
  ): void {
    const { active, free } = this.layout;
    const strain = this.strain;
    const strainOld = this.strainOld;
    strain.fill(0);
    strainOld.fill(0);
    for (let a = 0; a < active.length; a++) {
      strain[active[a]] = input.strain[a];
      strainOld[active[a]] = input.strainOld[a];
    }
    const freeBaseOld = oldOffset + this.material.stateSize;
    for (let k = 0; k < free.length; k++) {
      strainOld[free[k]] = stateOld[freeBaseOld + k];
      strain[free[k]] = stateOld[freeBaseOld + k];
    }
    this.input.temperature = input.temperature;
    this.input.temperatureOld = input.temperatureOld;

    const ok = free.length === 0 ? this.evaluate(stateOld, oldOffset, state, newOffset) : this.iterateFree(stateOld, oldOffset, state, newOffset);
    out.ok = ok;
    out.message = ok ? '' : this.point.message || 'local stress-state iteration did not converge';
    this.condense(out);
    const freeBase = newOffset + this.material.stateSize;
    for (let k = 0; k < free.length; k++) state[freeBase + k] = strain[free[k]];
    out.fullStrain.set(strain);
    out.fullStress.set(this.point.stress);
  }

  private evaluate(stateOld: Float64Array, oldOffset: number, state: Float64Array, newOffset: number): boolean {
    this.material.update(this.input as MaterialPointInput, stateOld, oldOffset, state, newOffset, this.point);
    return this.point.ok;
  }

  /** Newton on the free strains so that their stresses vanish (σ33 = 0 for plane stress). */
  private iterateFree(stateOld: Float64Array, oldOffset: number, state: Float64Array, newOffset: number): boolean {
    const { active, free } = this.layout;
    const strain = this.strain;
    const { stress, tangent } = this.point;
    for (let it = 0; it < MAX_LOCAL_ITERATIONS; it++) {
      if (!this.evaluate(stateOld, oldOffset, state, newOffset)) return false;
      // Stress scale: the active stresses, or modulus × strain size when they vanish (a freely
      // expanding heated point has σ ≈ 0 but σ33 carries round-off of order E·αΔT·1e-16).
      let scale = 1e-300;
      for (let a = 0; a < active.length; a++) scale = Math.max(scale, Math.abs(stress[active[a]]));
      let modulus = 0;
      let strainSize = 0;
      for (let i = 0; i < KM; i++) {
        modulus = Math.max(modulus, Math.abs(tangent[i * KM + i]));
        strainSize = Math.max(strainSize, Math.abs(strain[i]));
      }
      scale = Math.max(scale, modulus * strainSize);
      let residual = 0;
      for (let k = 0; k < free.length; k++) residual = Math.max(residual, Math.abs(stress[free[k]]));
      if (residual <= 1e-10 * scale) return true;
      if (free.length === 1) {
        const f = free[0];
        const cff = tangent[f * KM + f];
        if (!(Math.abs(cff) > 0)) break;
        strain[f] -= stress[f] / cff;
      } else {
        const [f0, f1] = free;
        const a = tangent[f0 * KM + f0], b = tangent[f0 * KM + f1];
        const c = tangent[f1 * KM + f0], d = tangent[f1 * KM + f1];
        const det = a * d - b * c;
        if (!(Math.abs(det) > 0)) break;
        const r0 = stress[f0], r1 = stress[f1];
        strain[f0] -= (d * r0 - b * r1) / det;
        strain[f1] -= (-c * r0 + a * r1) / det;
      }
    }
    this.point.message = `the ${this.stressState} condition (zero out-of-plane stress) did not converge in ${MAX_LOCAL_ITERATIONS} local iterations`;
    return false;
  }

  /** Writes the reduced stress and the condensed tangent C_aa − C_af C_ff⁻¹ C_fa. */
  private condense(out: ReducedOutput): void {
    const { active, free } = this.layout;
    const { stress, tangent } = this.point;
    const n = active.length;
    for (let a = 0; a < n; a++) out.stress[a] = stress[active[a]];
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) out.tangent[a * n + b] = tangent[active[a] * KM + active[b]];
    }
    if (free.length === 0) return;
    if (free.length === 1) {
      const f = free[0];
      const cff = tangent[f * KM + f];
      for (let a = 0; a < n; a++) {
        const caf = tangent[active[a] * KM + f] / cff;
        for (let b = 0; b < n; b++) out.tangent[a * n + b] -= caf * tangent[f * KM + active[b]];
      }
      return;
    }
    const [f0, f1] = free;
    const p = tangent[f0 * KM + f0], q = tangent[f0 * KM + f1];
    const r = tangent[f1 * KM + f0], s = tangent[f1 * KM + f1];
    const det = p * s - q * r;
    const i00 = s / det, i01 = -q / det, i10 = -r / det, i11 = p / det;
    for (let a = 0; a < n; a++) {
      const ca0 = tangent[active[a] * KM + f0], ca1 = tangent[active[a] * KM + f1];
      const w0 = ca0 * i00 + ca1 * i10;
      const w1 = ca0 * i01 + ca1 * i11;
      for (let b = 0; b < n; b++) {
        out.tangent[a * n + b] -= w0 * tangent[f0 * KM + active[b]] + w1 * tangent[f1 * KM + active[b]];
      }
    }
  }
}
