/**
 * Q4-B-bar: bilinear quadrilateral with the selective-dilatation (B-bar / mean-dilatation)
 * remedy for VOLUMETRIC locking — nearly incompressible elasticity, J2 and SMA flow, which are
 * isochoric. The volumetric strain at every Gauss point is replaced by its element average
 * θ̄ = (1/V)∫θ dV while the deviatoric part stays point-wise; B̄ is linear in u, so the tangent
 * B̄ᵀCB̄ is exact.
 *
 * Plane strain keeps ε33 = 0 and spreads the correction over the two in-plane normal strains
 * (½(θ̄ − θ) each), so tr ε = θ̄ exactly; axisymmetric spreads it over ε_rr, ε_zz, ε_θθ (⅓ each).
 * Plane stress has no volumetric constraint (σ33 = 0 lets the thickness change), so this kernel
 * behaves exactly like q4 there. It does not cure shear locking in bending: use q4-eas for that.
 */
import { PointCall, accumulate, asContinuum, interpolate, multiplyB, strainSize } from './continuum';
import { initQ4PointStates, Q4_COLS as COLS, Q4_NQ as NQ, Q4GaussPoints, q4VariantFields } from './q4Points';
import type { ElementKernel } from './types';

const points = new Q4GaussPoints();
const vol = new Float64Array(NQ * COLS); // volumetric row b per Gauss point
const volBar = new Float64Array(COLS);
const CB = new Float64Array(4 * COLS);
const calls = { 3: new PointCall(3), 4: new PointCall(4) } as const;

export const q4BBar: ElementKernel = {
  ...q4VariantFields('q4-bbar'),
  stateSize: (_s, m) => NQ * m,
  initState: initQ4PointStates,
  evaluate(ctx, out) {
    const section = asContinuum(ctx.section, 'q4-bbar');
    const rows = strainSize(section.analysis);
    const call = calls[rows];
    out.fint.fill(0);
    if (ctx.wantTangent) out.K.fill(0);
    out.ok = true;
    out.message = '';
    // Pass 1: geometry, standard B, volumetric rows and their volume average.
    const problem = points.fill(section, ctx.coords, 'q4-bbar');
    if (problem) {
      out.ok = false;
      out.message = problem;
      return;
    }
    volBar.fill(0);
    let volume = 0;
    const normalRows = section.analysis === 'axisymmetric' ? 3 : 2;
    for (let q = 0; q < NQ; q++) {
      const B = points.B[q];
      const dV = points.dV[q];
      volume += dV;
      for (let j = 0; j < COLS; j++) {
        let b = 0;
        for (let i = 0; i < normalRows; i++) b += B[i * COLS + j];
        vol[q * COLS + j] = b;
        volBar[j] += b * dV;
      }
    }
    for (let j = 0; j < COLS; j++) volBar[j] /= volume;
    // Pass 2: B̄ = B + (1/m)(b̄ − b) on the normal rows, then the material points.
    const correct = section.analysis !== 'planeStress';
    const m = normalRows;
    for (let q = 0; q < NQ; q++) {
      const B = points.B[q];
      if (correct) {
        for (let i = 0; i < m; i++) {
          for (let j = 0; j < COLS; j++) B[i * COLS + j] += (volBar[j] - vol[q * COLS + j]) / m;
        }
      }
      multiplyB(B, rows, COLS, ctx.u, call.strain);
      multiplyB(B, rows, COLS, ctx.uOld, call.strainOld);
      const N = points.N[q];
      const res = call.run(ctx, q, interpolate(N, ctx.temperature), interpolate(N, ctx.temperatureOld), out);
      accumulate(B, rows, COLS, res.stress, res.tangent, points.dV[q], out, ctx.wantTangent, CB);
    }
  },
};
