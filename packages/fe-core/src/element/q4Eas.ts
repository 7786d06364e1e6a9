/**
 * Q4-EAS: bilinear quadrilateral with four ENHANCED ASSUMED STRAIN modes (Simo & Rifai 1990,
 * the "Q1E4" choice). The enhanced strain is
 *   ε̃ = s(ξ, η) · J0⁻¹ E(ξ, η; α) J0⁻ᵀ,   E = [[α1 ξ, α3 ξ + α4 η], [α3 ξ + α4 η, α2 η]],
 * written from parametric (covariant) components through the Jacobian J0 at the element centre,
 * scaled by s = det J0 / det J (axisymmetric: r0 det J0 / (r det J)) so that ∫ ε̃ dV = 0 and the
 * patch test is passed. The modes supply the bending (ξη-type) strains plain Q4 lacks, which cures
 * SHEAR locking in bending and, in plane strain, most of the volumetric locking.
 *
 * The element parameters α are internal: every evaluation solves h(u, α) = ∫ Gᵀσ dV = 0 by a local
 * Newton iteration (exact for elastic materials after one step, since h is then linear in α), so
 * the element works with any path-dependent material. The tangent is the exact condensation
 * K = K_uu − K_uα K_αα⁻¹ K_αu. The converged α is stored after the material points (4 doubles)
 * and is the start of the next increment's iteration.
 */
import { ContinuumGeometry, PointCall, accumulate, asContinuum, interpolate, multiplyB, strainSize } from './continuum';
import { luFactor, luSolve } from './dense';
import { q4Shape } from './q4';
import { initQ4PointStates, Q4_COLS as NU, Q4_NQ as NQ, Q4GaussPoints, Q4_RULE as rule, q4VariantFields } from './q4Points';
import type { ContinuumAnalysis, ElementKernel } from './types';

const NA = 4;
const NT = NU + NA;
const MAX_LOCAL = 40;

const g = new ContinuumGeometry(q4Shape); // element centre, for J0
const points = new Q4GaussPoints();
const W = new Float64Array(NQ * 4 * NT); // [B | G] per Gauss point
const Wview = Array.from({ length: NQ }, (_, q) => W.subarray(q * 4 * NT, (q + 1) * 4 * NT));
const ua = new Float64Array(NT);
const uaOld = new Float64Array(NT);
const CB = new Float64Array(4 * NT);
const full = { fint: new Float64Array(NT), K: new Float64Array(NT * NT) };
const Kaa = new Float64Array(NA * NA);
const piv = new Int32Array(NA);
const dAlpha = new Float64Array(NA);
const dAlphaPrev = new Float64Array(NA);
const X = new Float64Array(NA * NU); // K_αα⁻¹ K_αu
const inv = new Float64Array(4);
const calls = { 3: new PointCall(3), 4: new PointCall(4) } as const;

/** ε_ij of J⁻¹ E J⁻ᵀ for a symmetric parametric tensor E = [[e00, e01], [e01, e11]]. */
function mapped(inv: Float64Array, i: number, j: number, e00: number, e11: number, e01: number): number {
  return inv[2 * i] * (e00 * inv[2 * j] + e01 * inv[2 * j + 1]) + inv[2 * i + 1] * (e01 * inv[2 * j] + e11 * inv[2 * j + 1]);
}

/** Enhanced-strain columns of one Gauss point into W (columns NU..NU+3). */
function fillEnhanced(analysis: ContinuumAnalysis, Wq: Float64Array, xi: number, eta: number, inv: Float64Array, scale: number): void {
  const rows = strainSize(analysis);
  const shearRow = rows - 1;
  for (let m = 0; m < NA; m++) {
    // Parametric tensors of the modes: α1 ξ (ξξ), α2 η (ηη), α3 ξ and α4 η (ξη).
    const e00 = m === 0 ? xi : 0;
    const e11 = m === 1 ? eta : 0;
    const e01 = m === 2 ? xi : m === 3 ? eta : 0;
    const col = NU + m;
    for (let r = 0; r < rows; r++) Wq[r * NT + col] = 0;
    Wq[col] = scale * mapped(inv, 0, 0, e00, e11, e01);
    Wq[NT + col] = scale * mapped(inv, 1, 1, e00, e11, e01);
    Wq[shearRow * NT + col] = scale * Math.SQRT2 * mapped(inv, 0, 1, e00, e11, e01);
  }
}

export const q4Eas: ElementKernel = {
  ...q4VariantFields('q4-eas'),
  stateSize: (_s, m) => NQ * m + NA,
  initState(state, offset, section, material, temperature) {
    initQ4PointStates(state, offset, section, material, temperature);
    state.fill(0, offset + NQ * material.stateSize, offset + NQ * material.stateSize + NA);
  },
  evaluate(ctx, out) {
    const section = asContinuum(ctx.section, 'q4-eas');
    const rows = strainSize(section.analysis);
    const call = calls[rows];
    out.ok = true;
    out.message = '';
    const alphaAt = ctx.stateOffset + NQ * ctx.material.stateSize;

    // Centre Jacobian J0 (and r0) for the enhanced-strain map.
    g.at(ctx.coords, 0, 0);
    const det0 = g.detJ;
    const r0 = g.x;
    // J rows are [x_ξ, y_ξ], [x_η, y_η]: covariant strain E = J ε Jᵀ, hence ε = J⁻¹ E J⁻ᵀ.
    inv[0] = g.J[3] / det0;
    inv[1] = -g.J[1] / det0;
    inv[2] = -g.J[2] / det0;
    inv[3] = g.J[0] / det0;
    const problem = points.fill(section, ctx.coords, 'q4-eas');
    if (problem) {
      out.ok = false;
      out.message = problem;
      return;
    }
    for (let q = 0; q < NQ; q++) {
      const Wq = Wview[q];
      // The standard B is rows × 8; spread it into the rows × 12 layout.
      const B = points.B[q];
      for (let r = 0; r < rows; r++) for (let j = 0; j < NU; j++) Wq[r * NT + j] = B[r * NU + j];
      const detJ = points.detJ[q];
      const scale = section.analysis === 'axisymmetric' ? (r0 * det0) / (points.x[q] * detJ) : det0 / detJ;
      fillEnhanced(section.analysis, Wq, rule.points[2 * q], rule.points[2 * q + 1], inv, scale);
    }

    ua.set(ctx.u);
    uaOld.set(ctx.uOld);
    for (let m = 0; m < NA; m++) {
      uaOld[NU + m] = ctx.stateOld[alphaAt + m];
      ua[NU + m] = ctx.stateOld[alphaAt + m];
    }
    // Newton on h(α) = 0 with backtracking: plastic kinks can make plain Newton cycle.
    let converged = false;
    let hPrev = Infinity;
    let step = 1;
    for (let it = 0; it < MAX_LOCAL && !converged; it++) {
      full.fint.fill(0);
      full.K.fill(0);
      let strainScale = 0;
      let stressMax = 0;
      let modulus = 0;
      for (let q = 0; q < NQ; q++) {
        const Wq = Wview[q];
        multiplyB(Wq, rows, NT, ua, call.strain);
        multiplyB(Wq, rows, NT, uaOld, call.strainOld);
        for (let r = 0; r < rows; r++) strainScale = Math.max(strainScale, Math.abs(call.strain[r]));
        const N = points.N[q];
        const res = call.run(ctx, q, interpolate(N, ctx.temperature), interpolate(N, ctx.temperatureOld), out);
        if (!out.ok) return;
        accumulate(Wq, rows, NT, res.stress, res.tangent, points.dV[q], full, true, CB);
        // Stress over modulus also counts as a strain size (thermal or inelastic strain with
        // zero total strain, e.g. the first iteration of a heated step).
        for (let r = 0; r < rows; r++) {
          stressMax = Math.max(stressMax, Math.abs(res.stress[r]));
          modulus = Math.max(modulus, Math.abs(res.tangent[r * rows + r]));
        }
      }
      if (modulus > 0) strainScale = Math.max(strainScale, stressMax / modulus);
      let hNorm = 0;
      for (let a = 0; a < NA; a++) hNorm = Math.max(hNorm, Math.abs(full.fint[NU + a]));
      for (let a = 0; a < NA; a++) {
        for (let b = 0; b < NA; b++) Kaa[a * NA + b] = full.K[(NU + a) * NT + NU + b];
        dAlpha[a] = -full.fint[NU + a];
      }
      if (!luFactor(NA, Kaa, piv)) {
        out.ok = false;
        out.message = 'q4-eas: the enhanced-strain stiffness is singular (material tangent lost positive definiteness)';
        return;
      }
      luSolve(NA, Kaa, piv, dAlpha);
      // Size of the Newton correction as a strain at the Gauss points.
      let change = 0;
      for (let q = 0; q < NQ; q++) {
        for (let r = 0; r < rows; r++) {
          let s = 0;
          for (let a = 0; a < NA; a++) s += W[q * 4 * NT + r * NT + NU + a] * dAlpha[a];
          change = Math.max(change, Math.abs(s));
        }
      }
      converged = change <= 1e-11 * strainScale;
      if (converged) break;
      if (hNorm > hPrev && step > 1 / 64) {
        // Residual grew: retreat halfway along the previous Newton step and re-evaluate.
        step /= 2;
        for (let a = 0; a < NA; a++) ua[NU + a] -= step * dAlphaPrev[a];
        continue;
      }
      hPrev = hNorm;
      step = 1;
      for (let a = 0; a < NA; a++) {
        ua[NU + a] += dAlpha[a];
        dAlphaPrev[a] = dAlpha[a];
      }
    }
    if (!converged) {
      out.ok = false;
      out.message = `q4-eas: the enhanced-strain iteration did not converge in ${MAX_LOCAL} steps`;
      return;
    }
    for (let a = 0; a < NA; a++) ctx.state[alphaAt + a] = ua[NU + a];

    // fint = f_u + K_uα Δα (the last, negligible correction) and K = K_uu − K_uα K_αα⁻¹ K_αu.
    for (let i = 0; i < NU; i++) {
      let s = full.fint[i];
      for (let a = 0; a < NA; a++) s += full.K[i * NT + NU + a] * dAlpha[a];
      out.fint[i] = s;
    }
    if (!ctx.wantTangent) return;
    for (let a = 0; a < NA; a++) for (let j = 0; j < NU; j++) X[a * NU + j] = full.K[(NU + a) * NT + j];
    for (let j = 0; j < NU; j++) luSolve(NA, Kaa, piv, X, j, NU);
    for (let i = 0; i < NU; i++) {
      for (let j = 0; j < NU; j++) {
        let s = full.K[i * NT + j];
        for (let a = 0; a < NA; a++) s -= full.K[i * NT + NU + a] * X[a * NU + j];
        out.K[i * NU + j] = s;
      }
    }
  },
};
