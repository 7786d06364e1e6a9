/**
 * bar2: 2-node axial bar (truss member) in the plane, geometrically linear, one material point
 * with the uniaxial-stress reduction of the material (so SMA and J2 bars work unchanged).
 * ε = e·(u2 − u1)/L with e the unit axis; fint = A σ [−e, e]; K = (A E_t / L) [e⊗e, −e⊗e; …].
 */
import { PointCall } from './continuum';
import type { BarSection, ElementKernel, Section } from './types';

const call = new PointCall(1);
const e = new Float64Array(4);

function asBar(section: Section): BarSection {
  if (section.kind !== 'bar') throw new Error(`element bar2 needs a bar section, got '${section.kind}'`);
  if (!(section.area > 0)) throw new Error('bar section: area must be > 0');
  return section;
}

export const bar2: ElementKernel = {
  name: 'bar2',
  sectionKind: 'bar',
  nodes: 2,
  dofsPerNode: 2,
  edges: [],
  stressState: (section) => {
    asBar(section);
    return 'uniaxial';
  },
  pointsPerElement: () => 1,
  stateSize: (_s, m) => m,
  initState(state, offset, _section, material, temperature) {
    material.initState(state, offset, temperature);
  },
  evaluate(ctx, out) {
    const { area } = asBar(ctx.section);
    const x = ctx.coords;
    const dx = x[2] - x[0], dy = x[3] - x[1];
    const L = Math.hypot(dx, dy);
    out.ok = true;
    out.message = '';
    if (!(L > 0)) {
      out.ok = false;
      out.message = 'bar2 element has zero length';
      return;
    }
    const c = dx / L, s = dy / L;
    const u = ctx.u, uo = ctx.uOld;
    call.strain[0] = (c * (u[2] - u[0]) + s * (u[3] - u[1])) / L;
    call.strainOld[0] = (c * (uo[2] - uo[0]) + s * (uo[3] - uo[1])) / L;
    const t = 0.5 * (ctx.temperature[0] + ctx.temperature[1]);
    const to = 0.5 * (ctx.temperatureOld[0] + ctx.temperatureOld[1]);
    const res = call.run(ctx, 0, t, to, out);
    const N = area * res.stress[0];
    e[0] = -c; e[1] = -s; e[2] = c; e[3] = s;
    for (let i = 0; i < 4; i++) out.fint[i] = N * e[i];
    if (!ctx.wantTangent) return;
    const k = (area * res.tangent[0]) / L;
    for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) out.K[i * 4 + j] = k * e[i] * e[j];
  },
  pointCoordinates(coords, _section, out) {
    out[0] = 0.5 * (coords[0] + coords[2]);
    out[1] = 0.5 * (coords[1] + coords[3]);
  },
};
