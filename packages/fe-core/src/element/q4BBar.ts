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
import { gaussQuad } from '../quadrature/gauss';
import {
  ContinuumGeometry,
  PointCall,
  accumulate,
  asContinuum,
  continuumPointCoordinates,
  continuumStressState,
  fillB,
  geometryProblem,
  interpolate,
  multiplyB,
  strainSize,
  volumeWeight,
} from './continuum';
import { Q4_EDGES, q4Shape } from './q4';
import type { ElementKernel } from './types';

const rule = gaussQuad(2);
const NQ = rule.count;
const COLS = 8;
const g = new ContinuumGeometry(q4Shape);
const Bq = new Float64Array(NQ * 4 * COLS); // B̄ per Gauss point
const vol = new Float64Array(NQ * COLS); // volumetric row b per Gauss point
const volBar = new Float64Array(COLS);
const dV = new Float64Array(NQ);
const Nq = new Float64Array(NQ * 4);
const CB = new Float64Array(4 * COLS);
const calls = { 3: new PointCall(3), 4: new PointCall(4) } as const;

export const q4BBar: ElementKernel = {
  name: 'q4-bbar',
  sectionKind: 'continuum',
  nodes: 4,
  dofsPerNode: 2,
  edges: Q4_EDGES,
  shape: q4Shape,
  rule,
  stressState: (section) => continuumStressState(section, 'q4-bbar'),
  pointsPerElement: () => NQ,
  stateSize: (_s, m) => NQ * m,
  initState(state, offset, _section, material, temperature) {
    for (let q = 0; q < NQ; q++) material.initState(state, offset + q * material.stateSize, temperature);
  },
  evaluate(ctx, out) {
    const section = asContinuum(ctx.section, 'q4-bbar');
    const rows = strainSize(section.analysis);
    const call = calls[rows];
    out.fint.fill(0);
    if (ctx.wantTangent) out.K.fill(0);
    out.ok = true;
    out.message = '';
    // Pass 1: geometry, standard B, volumetric rows and their volume average.
    volBar.fill(0);
    let volume = 0;
    for (let q = 0; q < NQ; q++) {
      g.at(ctx.coords, rule.points[2 * q], rule.points[2 * q + 1]);
      const problem = geometryProblem(section, g, 'q4-bbar');
      if (problem) {
        out.ok = false;
        out.message = problem;
        return;
      }
      const B = Bq.subarray(q * 4 * COLS, (q + 1) * 4 * COLS);
      fillB(section.analysis, g, B);
      Nq.set(g.N, 4 * q);
      dV[q] = volumeWeight(section, g, rule.weights[q]);
      volume += dV[q];
      const normalRows = section.analysis === 'axisymmetric' ? 3 : 2;
      for (let j = 0; j < COLS; j++) {
        let b = 0;
        for (let i = 0; i < normalRows; i++) b += B[i * COLS + j];
        vol[q * COLS + j] = b;
        volBar[j] += b * dV[q];
      }
    }
    for (let j = 0; j < COLS; j++) volBar[j] /= volume;
    // Pass 2: B̄ = B + (1/m)(b̄ − b) on the normal rows, then the material points.
    const correct = section.analysis !== 'planeStress';
    const m = section.analysis === 'axisymmetric' ? 3 : 2;
    for (let q = 0; q < NQ; q++) {
      const B = Bq.subarray(q * 4 * COLS, (q + 1) * 4 * COLS);
      if (correct) {
        for (let i = 0; i < m; i++) {
          for (let j = 0; j < COLS; j++) B[i * COLS + j] += (volBar[j] - vol[q * COLS + j]) / m;
        }
      }
      multiplyB(B, rows, COLS, ctx.u, call.strain);
      multiplyB(B, rows, COLS, ctx.uOld, call.strainOld);
      const N = Nq.subarray(4 * q, 4 * q + 4);
      const res = call.run(ctx, q, interpolate(N, ctx.temperature), interpolate(N, ctx.temperatureOld), out);
      accumulate(B, rows, COLS, res.stress, res.tangent, dV[q], out, ctx.wantTangent, CB);
    }
  },
  pointCoordinates(coords, _section, out) {
    continuumPointCoordinates(q4Shape, rule, coords, out);
  },
};
