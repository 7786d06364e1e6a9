/**
 * J2 (von Mises) plasticity with linear isotropic and linear kinematic (Prager) hardening,
 * small strain, thermal strain α (T − T_ref) I, backward-Euler radial return and the consistent
 * algorithmic tangent (Simo & Hughes, Computational Inelasticity, 1998, box 3.2 and §3.3).
 *
 * Yield: f = ‖s − β‖ − √(2/3) (σ_y + H_iso ε̄ᵖ) ≤ 0 (Kelvin–Mandel norm = tensor norm).
 * Flow: Δεᵖ = Δγ n, n = (s − β)/‖s − β‖; Δβ = (2/3) H_kin Δγ n; Δε̄ᵖ = √(2/3) Δγ.
 * Because all hardening is linear the return is closed form:
 *   Δγ = f_trial / (2μ + (2/3)(H_iso + H_kin)).
 * Tangent: C = K 1⊗1 + 2μ θ P_dev − 2μ θ̄ n⊗n with θ = 1 − 2μΔγ/‖ξ_trial‖ and
 *   θ̄ = 1/(1 + (H_iso + H_kin)/(3μ)) − (1 − θ).
 *
 * State (13 doubles): plastic strain εᵖ (6, Kelvin–Mandel), back stress β (6), ε̄ᵖ (1).
 */
import type { J2PlasticParams } from '@phaseloop/shared';
import { lame } from './elastic';
import { KM, type Material, type MaterialPointInput, type MaterialPointOutput, type MaterialReport } from './types';

const SQRT_2_3 = Math.sqrt(2 / 3);
const EP = 0;
const BACK = 6;
const EQ = 12;
export const J2_STATE_SIZE = 13;

export function createJ2Plastic(params: J2PlasticParams): Material<J2PlasticParams> {
  const { mu, bulk } = lame(params.E, params.nu);
  const { alpha, T_ref, sigma_y, H_iso, H_kin } = params;
  const xi = new Float64Array(KM); // relative stress s − β (trial, then final)

  function writeElasticTangent(out: MaterialPointOutput, theta: number, thetaBar: number, normal: boolean): void {
    const t = out.tangent;
    for (let i = 0; i < KM; i++) {
      for (let j = 0; j < KM; j++) {
        let c = 0;
        if (i < 3 && j < 3) c = bulk - (2 * mu * theta) / 3;
        if (i === j) c += 2 * mu * theta;
        if (normal) c -= 2 * mu * thetaBar * xi[i] * xi[j];
        t[i * KM + j] = c;
      }
    }
  }

  return {
    model: 'j2-plastic',
    stateSize: J2_STATE_SIZE,
    params,
    initState(state: Float64Array, offset: number): void {
      state.fill(0, offset, offset + J2_STATE_SIZE);
    },
    update(input: MaterialPointInput, stateOld: Float64Array, oo: number, state: Float64Array, no: number, out: MaterialPointOutput): void {
      const e = input.strain;
      const thermal = alpha * (input.temperature - T_ref);
      // Elastic strain trial: ε − ε_θ − εᵖ_n; split into volume and deviator.
      let trace = 0;
      for (let i = 0; i < 3; i++) trace += e[i] - thermal - stateOld[oo + EP + i];
      const p = bulk * trace;
      let norm2 = 0;
      for (let i = 0; i < KM; i++) {
        const dev = e[i] - (i < 3 ? thermal + trace / 3 : 0) - stateOld[oo + EP + i];
        const s = 2 * mu * dev;
        xi[i] = s - stateOld[oo + BACK + i];
        norm2 += xi[i] * xi[i];
      }
      const norm = Math.sqrt(norm2);
      const eqOld = stateOld[oo + EQ];
      const f = norm - SQRT_2_3 * (sigma_y + H_iso * eqOld);
      if (f <= 1e-12 * sigma_y) {
        for (let i = 0; i < J2_STATE_SIZE; i++) state[no + i] = stateOld[oo + i];
        for (let i = 0; i < KM; i++) out.stress[i] = xi[i] + stateOld[oo + BACK + i] + (i < 3 ? p : 0);
        writeElasticTangent(out, 1, 0, false);
      } else {
        const dGamma = f / (2 * mu + (2 / 3) * (H_iso + H_kin));
        for (let i = 0; i < KM; i++) xi[i] /= norm; // now the unit normal n
        for (let i = 0; i < KM; i++) {
          const n = xi[i];
          state[no + EP + i] = stateOld[oo + EP + i] + dGamma * n;
          const back = stateOld[oo + BACK + i] + (2 / 3) * H_kin * dGamma * n;
          state[no + BACK + i] = back;
          // s = β_n+1 + (‖ξ_trial‖ − 2μΔγ − (2/3)H_kinΔγ) n, i.e. trial deviator less the return.
          const sRel = (norm - 2 * mu * dGamma - (2 / 3) * H_kin * dGamma) * n;
          out.stress[i] = back + sRel + (i < 3 ? p : 0);
        }
        state[no + EQ] = eqOld + SQRT_2_3 * dGamma;
        const theta = 1 - (2 * mu * dGamma) / norm;
        const thetaBar = 1 / (1 + (H_iso + H_kin) / (3 * mu)) - (1 - theta);
        writeElasticTangent(out, theta, thetaBar, true);
      }
      out.ok = true;
      out.message = '';
    },
    report(state: Float64Array, offset: number, out: MaterialReport): void {
      out.xi = 0;
      out.eqPlastic = state[offset + EQ];
      out.transformationStrain.fill(0);
    },
  };
}
