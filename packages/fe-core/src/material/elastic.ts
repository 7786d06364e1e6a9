/**
 * Isotropic linear elasticity with thermal strain ε_θ = α (T − T_ref) I.
 *
 * σ = λ tr(ε − ε_θ) I + 2μ (ε − ε_θ). In Kelvin–Mandel form the tangent is λ 1⊗1 + 2μ I₆ (the
 * √2 on the shear components makes 2μ appear on every diagonal entry). No internal state.
 */
import type { LinearElasticParams } from '@phaseloop/shared';
import { KM, type Material, type MaterialPointInput, type MaterialPointOutput, type MaterialReport } from './types';

/** Lamé constants from E and ν. */
export function lame(E: number, nu: number): { lambda: number; mu: number; bulk: number } {
  const mu = E / (2 * (1 + nu));
  const lambda = (E * nu) / ((1 + nu) * (1 - 2 * nu));
  return { lambda, mu, bulk: lambda + (2 * mu) / 3 };
}

/** Writes the isotropic 6×6 Kelvin–Mandel stiffness λ 1⊗1 + 2μ I into `out`. */
export function isotropicStiffness(lambda: number, mu: number, out: Float64Array): void {
  out.fill(0);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) out[i * KM + j] = lambda;
  for (let i = 0; i < KM; i++) out[i * KM + i] += 2 * mu;
}

export function createLinearElastic(params: LinearElasticParams): Material<LinearElasticParams> {
  const { lambda, mu } = lame(params.E, params.nu);
  const stiffness = new Float64Array(KM * KM);
  isotropicStiffness(lambda, mu, stiffness);
  const { alpha, T_ref } = params;
  return {
    model: 'linear-elastic',
    stateSize: 0,
    params,
    initState(): void {},
    update(input: MaterialPointInput, _so: Float64Array, _oo: number, _s: Float64Array, _no: number, out: MaterialPointOutput): void {
      const e = input.strain;
      const thermal = alpha * (input.temperature - T_ref);
      const trace = e[0] + e[1] + e[2] - 3 * thermal;
      for (let i = 0; i < 3; i++) out.stress[i] = lambda * trace + 2 * mu * (e[i] - thermal);
      for (let i = 3; i < KM; i++) out.stress[i] = 2 * mu * e[i];
      out.tangent.set(stiffness);
      out.ok = true;
      out.message = '';
    },
    report(_state: Float64Array, _offset: number, out: MaterialReport): void {
      out.xi = 0;
      out.eqPlastic = 0;
      out.transformationStrain.fill(0);
    },
  };
}
