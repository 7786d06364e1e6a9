/**
 * Shared core of the 2-node plane frame elements (beam2-eb, beam2-timo).
 *
 * Local dofs [u1, w1, θ1, u2, w2, θ2] (u along the axis, w transverse, θ counter-clockwise);
 * global dofs [ux, uy, θz] per node through the rotation R = [[c, s, 0], [−s, c, 0], [0, 0, 1]].
 * Geometrically linear. The section is integrated by fibres (beamSection.ts): at every axial
 * Gauss point the fibre strain is ε = ε0 − y κ and each fibre is a material point with the
 * uniaxial-stress reduction of the material, so any Material (elastic, J2, SMA) gives a nonlinear
 * beam. With κ > 0 for counter-clockwise bending, M = −∫σ y dA = EIκ in the elastic case.
 * Three Gauss–Lobatto points along the axis (x = 0, L/2, L; exact for the elastic stiffness,
 * whose integrand is quadratic): the end sections, where frame moments peak and plastic hinges
 * form, are sampled directly.
 * Point results are in the element's local axes (1 = beam axis).
 */
import { createMaterialPointOutput } from '../material/types';
import type { ReducedMaterial } from '../material/reduce';
import { gaussLobattoLine } from '../quadrature/gauss';
import { asBeam, fibreLayout, type FibreLayout } from './beamSection';
import { PointCall } from './continuum';
import type { BeamSection, ElementKernel, ElementName } from './types';

export const AXIAL_POINTS = 3;
const line = gaussLobattoLine(AXIAL_POINTS);

export interface BeamInterpolation {
  readonly name: ElementName;
  /** true: Timoshenko (elastic shear term kGA γ²/2 and shear flexibility φ). */
  readonly shear: boolean;
  /**
   * Writes the curvature row bk (κ = bk·u_local) and, for Timoshenko, the shear row bg
   * (γ = bg·u_local) at local coordinate x ∈ [0, L]; φ = 12EI/(κ_s G A L²).
   */
  rows(x: number, L: number, phi: number, bk: Float64Array, bg: Float64Array): void;
}

interface Moduli {
  E: number;
  G: number;
}
const moduliCache = new WeakMap<object, Moduli>();

/**
 * Initial elastic E and G of the 3D material (virgin state, zero strain): E from the uniaxial
 * condensation of the 6×6 tangent, G = C_66/2 (Kelvin–Mandel). Cached per material object.
 */
export function initialModuli(material: ReducedMaterial<unknown>, temperature: number): Moduli {
  const m = material.material;
  const hit = moduliCache.get(m);
  if (hit) return hit;
  const s0 = new Float64Array(Math.max(1, m.stateSize));
  const s1 = new Float64Array(s0.length);
  m.initState(s0, 0, temperature);
  const out = createMaterialPointOutput();
  const zero = new Float64Array(6);
  m.update({ strain: zero, strainOld: zero, temperature, temperatureOld: temperature }, s0, 0, s1, 0, out);
  const C = out.tangent;
  const c11 = C[7], c12 = C[8], c21 = C[13], c22 = C[14];
  const det = c11 * c22 - c12 * c21;
  const w1 = (C[1] * c22 - C[2] * c21) / det;
  const w2 = (-C[1] * c12 + C[2] * c11) / det;
  const E = C[0] - w1 * C[6] - w2 * C[12];
  const moduli = { E, G: C[35] / 2 };
  moduliCache.set(m, moduli);
  return moduli;
}

export function makeFrameKernel(interp: BeamInterpolation): ElementKernel {
  const { name } = interp;
  const call = new PointCall(1);
  const ul = new Float64Array(6);
  const ulOld = new Float64Array(6);
  const bk = new Float64Array(6);
  const bg = new Float64Array(6);
  const b = new Float64Array(6);
  const fl = new Float64Array(6);
  const Kl = new Float64Array(36);

  function toLocal(c: number, s: number, u: Float64Array, out: Float64Array): void {
    for (let n = 0; n < 2; n++) {
      const ux = u[3 * n], uy = u[3 * n + 1];
      out[3 * n] = c * ux + s * uy;
      out[3 * n + 1] = -s * ux + c * uy;
      out[3 * n + 2] = u[3 * n + 2];
    }
  }

  function layoutOf(section: BeamSection): FibreLayout {
    return fibreLayout(section);
  }

  return {
    name,
    sectionKind: 'beam',
    nodes: 2,
    dofsPerNode: 3,
    edges: [],
    stressState: (section) => {
      asBeam(section, name);
      return 'uniaxial';
    },
    pointsPerElement: (section) => AXIAL_POINTS * layoutOf(asBeam(section, name)).count,
    stateSize: (section, m) => AXIAL_POINTS * layoutOf(asBeam(section, name)).count * m,
    initState(state, offset, section, material, temperature) {
      const n = AXIAL_POINTS * layoutOf(asBeam(section, name)).count;
      for (let p = 0; p < n; p++) material.initState(state, offset + p * material.stateSize, temperature);
    },
    evaluate(ctx, out) {
      const section = asBeam(ctx.section, name);
      const layout = layoutOf(section);
      const x = ctx.coords;
      const dx = x[2] - x[0], dy = x[3] - x[1];
      const L = Math.hypot(dx, dy);
      out.ok = true;
      out.message = '';
      if (!(L > 0)) {
        out.ok = false;
        out.message = `${name} element has zero length`;
        return;
      }
      const c = dx / L, s = dy / L;
      toLocal(c, s, ctx.u, ul);
      toLocal(c, s, ctx.uOld, ulOld);
      let phi = 0;
      let kGA = 0;
      let G = 0;
      if (interp.shear) {
        const moduli = initialModuli(ctx.material, 0.5 * (ctx.temperature[0] + ctx.temperature[1]));
        G = section.shearModulus ?? moduli.G;
        kGA = (section.shearCorrection ?? layout.shearCorrection) * G * layout.A;
        phi = (12 * moduli.E * layout.I) / (kGA * L * L);
      }
      fl.fill(0);
      Kl.fill(0);
      const nf = layout.count;
      for (let q = 0; q < AXIAL_POINTS; q++) {
        const xi = line.points[q];
        const w = (line.weights[q] * L) / 2;
        const xl = (L * (1 + xi)) / 2;
        interp.rows(xl, L, phi, bk, bg);
        const eps0 = (ul[3] - ul[0]) / L, eps0Old = (ulOld[3] - ulOld[0]) / L;
        let kappa = 0, kappaOld = 0;
        for (let j = 0; j < 6; j++) {
          kappa += bk[j] * ul[j];
          kappaOld += bk[j] * ulOld[j];
        }
        const n1 = (1 - xi) / 2, n2 = (1 + xi) / 2;
        const t = n1 * ctx.temperature[0] + n2 * ctx.temperature[1];
        const to = n1 * ctx.temperatureOld[0] + n2 * ctx.temperatureOld[1];
        let gamma = 0;
        if (interp.shear) for (let j = 0; j < 6; j++) gamma += bg[j] * ul[j];
        for (let f = 0; f < nf; f++) {
          const y = layout.y[f];
          const dA = layout.area[f] * w;
          call.strain[0] = eps0 - y * kappa;
          call.strainOld[0] = eps0Old - y * kappaOld;
          const p = q * nf + f;
          const res = call.run(ctx, p, t, to, out);
          if (interp.shear) {
            // Average shear stress V/A and its strain, for results only (local axes).
            out.stress[6 * p + 5] = Math.SQRT2 * (kGA / layout.A) * gamma;
            out.strain[6 * p + 5] = Math.SQRT1_2 * gamma;
          }
          for (let j = 0; j < 6; j++) b[j] = -y * bk[j];
          b[0] -= 1 / L;
          b[3] += 1 / L;
          const sig = res.stress[0] * dA;
          for (let i = 0; i < 6; i++) fl[i] += b[i] * sig;
          if (ctx.wantTangent) {
            const et = res.tangent[0] * dA;
            for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) Kl[i * 6 + j] += et * b[i] * b[j];
          }
        }
        if (interp.shear) {
          const V = kGA * gamma * w;
          for (let i = 0; i < 6; i++) fl[i] += bg[i] * V;
          for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) Kl[i * 6 + j] += kGA * w * bg[i] * bg[j];
        }
      }
      // Back to global axes: f = Rᵀ f_l, K = Rᵀ K_l R (R block-diagonal per node).
      for (let n = 0; n < 2; n++) {
        const a = fl[3 * n], bb = fl[3 * n + 1];
        out.fint[3 * n] = c * a - s * bb;
        out.fint[3 * n + 1] = s * a + c * bb;
        out.fint[3 * n + 2] = fl[3 * n + 2];
      }
      if (!ctx.wantTangent) return;
      for (let i = 0; i < 6; i++) {
        for (let n = 0; n < 2; n++) {
          const a = Kl[i * 6 + 3 * n], bb = Kl[i * 6 + 3 * n + 1];
          Kl[i * 6 + 3 * n] = c * a - s * bb;
          Kl[i * 6 + 3 * n + 1] = s * a + c * bb;
        }
      }
      for (let j = 0; j < 6; j++) {
        for (let n = 0; n < 2; n++) {
          const a = Kl[3 * n * 6 + j], bb = Kl[(3 * n + 1) * 6 + j];
          out.K[3 * n * 6 + j] = c * a - s * bb;
          out.K[(3 * n + 1) * 6 + j] = s * a + c * bb;
          out.K[(3 * n + 2) * 6 + j] = Kl[(3 * n + 2) * 6 + j];
        }
      }
    },
    pointCoordinates(coords, section, out) {
      const layout = layoutOf(asBeam(section, name));
      const dx = coords[2] - coords[0], dy = coords[3] - coords[1];
      const L = Math.hypot(dx, dy);
      const nx = -dy / L, ny = dx / L;
      for (let q = 0; q < AXIAL_POINTS; q++) {
        const t = (1 + line.points[q]) / 2;
        for (let f = 0; f < layout.count; f++) {
          const p = q * layout.count + f;
          out[2 * p] = coords[0] + t * dx + layout.y[f] * nx;
          out[2 * p + 1] = coords[1] + t * dy + layout.y[f] * ny;
        }
      }
    },
  };
}
