/**
 * Shared machinery of the 2D continuum elements (plane stress, plane strain, axisymmetric):
 * isoparametric geometry, strain–displacement rows, the material-point call, and a generic
 * displacement-based kernel that T3, Q4, T6 and Q8 instantiate with their shape functions and rule.
 *
 * Strain vectors follow material/reduce.ts: plane [ε11, ε22, √2ε12];
 * axisymmetric [ε_rr, ε_zz, ε_θθ, √2ε_rz] with ε_θθ = u_r / r. Kelvin–Mandel shear rows
 * therefore carry (∂u/∂y + ∂v/∂x)/√2.
 */
import { createReducedOutput, type ReducedMaterial, type ReducedOutput, type StressState } from '../material/reduce';
import type { QuadratureRule } from '../quadrature/gauss';
import type {
  ContinuumAnalysis,
  ContinuumSection,
  ElementContext,
  ElementKernel,
  ElementName,
  ElementOutput,
  Section,
  ShapeFunctions,
} from './types';

export const INV_SQRT2 = Math.SQRT1_2;
const TWO_PI = 2 * Math.PI;

export function asContinuum(section: Section, element: string): ContinuumSection {
  if (section.kind !== 'continuum') throw new Error(`element ${element} needs a continuum section, got '${section.kind}'`);
  return section;
}

export function strainSize(analysis: ContinuumAnalysis): 3 | 4 {
  return analysis === 'axisymmetric' ? 4 : 3;
}

/** Isoparametric geometry at one reference point (buffers owned, reused). */
export class ContinuumGeometry {
  readonly N: Float64Array;
  readonly dN: Float64Array;
  /** dN/dx, dN/dy node-major. */
  readonly dNdx: Float64Array;
  /** Jacobian rows: [∂x/∂ξ, ∂y/∂ξ, ∂x/∂η, ∂y/∂η]. */
  readonly J = new Float64Array(4);
  detJ = 0;
  x = 0;
  y = 0;

  constructor(readonly shape: ShapeFunctions) {
    this.N = new Float64Array(shape.nodes);
    this.dN = new Float64Array(2 * shape.nodes);
    this.dNdx = new Float64Array(2 * shape.nodes);
  }

  /** Evaluates everything at (ξ, η); returns det J (≤ 0 means an inverted element). */
  at(coords: Float64Array, xi: number, eta: number): number {
    const { N, dN, dNdx, J } = this;
    const n = this.shape.nodes;
    this.shape.evaluate(xi, eta, N, dN);
    let j00 = 0, j01 = 0, j10 = 0, j11 = 0, x = 0, y = 0;
    for (let a = 0; a < n; a++) {
      const xa = coords[2 * a], ya = coords[2 * a + 1];
      x += N[a] * xa;
      y += N[a] * ya;
      j00 += dN[2 * a] * xa;
      j01 += dN[2 * a] * ya;
      j10 += dN[2 * a + 1] * xa;
      j11 += dN[2 * a + 1] * ya;
    }
    J[0] = j00; J[1] = j01; J[2] = j10; J[3] = j11;
    const det = j00 * j11 - j01 * j10;
    this.detJ = det;
    this.x = x;
    this.y = y;
    const inv = 1 / det;
    for (let a = 0; a < n; a++) {
      const dxi = dN[2 * a], deta = dN[2 * a + 1];
      dNdx[2 * a] = (j11 * dxi - j01 * deta) * inv;
      dNdx[2 * a + 1] = (-j10 * dxi + j00 * deta) * inv;
    }
    return det;
  }
}

/** Writes the strain–displacement matrix (rows × 2·nodes, row-major) at the current geometry. */
export function fillB(analysis: ContinuumAnalysis, g: ContinuumGeometry, B: Float64Array): void {
  const n = g.shape.nodes;
  const cols = 2 * n;
  const { N, dNdx } = g;
  const rows = strainSize(analysis);
  B.fill(0, 0, rows * cols);
  const shearRow = rows - 1;
  for (let a = 0; a < n; a++) {
    const dx = dNdx[2 * a], dy = dNdx[2 * a + 1];
    B[2 * a] = dx;
    B[cols + 2 * a + 1] = dy;
    B[shearRow * cols + 2 * a] = dy * INV_SQRT2;
    B[shearRow * cols + 2 * a + 1] = dx * INV_SQRT2;
    if (analysis === 'axisymmetric') B[2 * cols + 2 * a] = N[a] / g.x;
  }
}

/** Volume weight of an integration point: w det J × (thickness or 2πr). */
export function volumeWeight(section: ContinuumSection, g: ContinuumGeometry, w: number): number {
  return w * g.detJ * (section.analysis === 'axisymmetric' ? TWO_PI * g.x : section.thickness);
}

/** Checks the geometry at a point; returns an error message or ''. */
export function geometryProblem(section: ContinuumSection, g: ContinuumGeometry, name: string): string {
  if (!(g.detJ > 0)) return `${name} element is inverted or too distorted (Jacobian determinant ${g.detJ.toExponential(3)} ≤ 0)`;
  if (section.analysis === 'axisymmetric' && !(g.x > 0)) return `axisymmetric ${name} element has an integration point at r = ${g.x} ≤ 0 (the model must lie at r ≥ 0)`;
  return '';
}

/**
 * Calls a ReducedMaterial at one point with preallocated input/output and copies the full
 * strain/stress into the element output.
 */
export class PointCall {
  readonly strain: Float64Array;
  readonly strainOld: Float64Array;
  private readonly input: { strain: Float64Array; strainOld: Float64Array; temperature: number; temperatureOld: number };
  private readonly outputs = new Map<StressState, ReducedOutput>();

  constructor(size: number) {
    this.strain = new Float64Array(size);
    this.strainOld = new Float64Array(size);
    this.input = { strain: this.strain, strainOld: this.strainOld, temperature: 0, temperatureOld: 0 };
  }

  output(material: ReducedMaterial<unknown>): ReducedOutput {
    let out = this.outputs.get(material.stressState);
    if (!out) {
      out = createReducedOutput(material.stressState);
      this.outputs.set(material.stressState, out);
    }
    return out;
  }

  /** Updates point `p`; returns the reduced output (stress, tangent) for the element to use. */
  run(ctx: ElementContext, p: number, temperature: number, temperatureOld: number, out: ElementOutput): ReducedOutput {
    const material = ctx.material;
    const res = this.output(material);
    this.input.temperature = temperature;
    this.input.temperatureOld = temperatureOld;
    const offset = ctx.stateOffset + p * material.stateSize;
    material.update(this.input, ctx.stateOld, offset, ctx.state, offset, res);
    if (!res.ok && out.ok) {
      out.ok = false;
      out.message = res.message;
    }
    out.strain.set(res.fullStrain, 6 * p);
    out.stress.set(res.fullStress, 6 * p);
    return res;
  }
}

export function interpolate(N: Float64Array, nodal: Float64Array): number {
  let s = 0;
  for (let a = 0; a < N.length; a++) s += N[a] * nodal[a];
  return s;
}

/** fint += Bᵀσ dV and, when wanted, K += Bᵀ C B dV. `CB` is a rows × cols scratch buffer. */
export function accumulate(
  B: Float64Array, rows: number, cols: number, stress: Float64Array, C: Float64Array, dV: number,
  out: Pick<ElementOutput, 'fint' | 'K'>, wantTangent: boolean, CB: Float64Array,
): void {
  for (let j = 0; j < cols; j++) {
    let s = 0;
    for (let i = 0; i < rows; i++) s += B[i * cols + j] * stress[i];
    out.fint[j] += s * dV;
  }
  if (!wantTangent) return;
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < cols; j++) {
      let s = 0;
      for (let k = 0; k < rows; k++) s += C[i * rows + k] * B[k * cols + j];
      CB[i * cols + j] = s * dV;
    }
  }
  const K = out.K;
  for (let a = 0; a < cols; a++) {
    for (let b = 0; b < cols; b++) {
      let s = 0;
      for (let k = 0; k < rows; k++) s += B[k * cols + a] * CB[k * cols + b];
      K[a * cols + b] += s;
    }
  }
}

/** strain = B·u (rows × cols times cols). */
export function multiplyB(B: Float64Array, rows: number, cols: number, u: Float64Array, strain: Float64Array): void {
  for (let i = 0; i < rows; i++) {
    let s = 0;
    for (let j = 0; j < cols; j++) s += B[i * cols + j] * u[j];
    strain[i] = s;
  }
}

export function continuumStressState(section: Section, name: string): StressState {
  return asContinuum(section, name).analysis;
}

export function continuumPointCoordinates(shape: ShapeFunctions, rule: QuadratureRule, coords: Float64Array, out: Float64Array): void {
  const N = new Float64Array(shape.nodes);
  const dN = new Float64Array(2 * shape.nodes);
  for (let q = 0; q < rule.count; q++) {
    shape.evaluate(rule.points[2 * q], rule.points[2 * q + 1], N, dN);
    let x = 0, y = 0;
    for (let a = 0; a < shape.nodes; a++) {
      x += N[a] * coords[2 * a];
      y += N[a] * coords[2 * a + 1];
    }
    out[2 * q] = x;
    out[2 * q + 1] = y;
  }
}

export interface ContinuumSpec {
  readonly name: ElementName;
  readonly shape: ShapeFunctions;
  readonly rule: QuadratureRule;
  readonly edges: readonly (readonly number[])[];
}

/** The standard displacement-based kernel: one material point per integration point. */
export function makeContinuumKernel(spec: ContinuumSpec): ElementKernel {
  const { name, shape, rule, edges } = spec;
  const nodes = shape.nodes;
  const cols = 2 * nodes;
  const g = new ContinuumGeometry(shape);
  const B = new Float64Array(4 * cols);
  const CB = new Float64Array(4 * cols);
  const calls = { 3: new PointCall(3), 4: new PointCall(4) } as const;

  return {
    name,
    sectionKind: 'continuum',
    nodes,
    dofsPerNode: 2,
    edges,
    shape,
    rule,
    stressState: (section) => continuumStressState(section, name),
    pointsPerElement: () => rule.count,
    stateSize: (_section, materialStateSize) => rule.count * materialStateSize,
    initState(state, offset, _section, material, temperature) {
      for (let q = 0; q < rule.count; q++) material.initState(state, offset + q * material.stateSize, temperature);
    },
    evaluate(ctx, out) {
      const section = asContinuum(ctx.section, name);
      const rows = strainSize(section.analysis);
      const call = calls[rows];
      out.fint.fill(0);
      if (ctx.wantTangent) out.K.fill(0);
      out.ok = true;
      out.message = '';
      for (let q = 0; q < rule.count; q++) {
        g.at(ctx.coords, rule.points[2 * q], rule.points[2 * q + 1]);
        const problem = geometryProblem(section, g, name);
        if (problem) {
          out.ok = false;
          out.message = problem;
          return;
        }
        fillB(section.analysis, g, B);
        multiplyB(B, rows, cols, ctx.u, call.strain);
        multiplyB(B, rows, cols, ctx.uOld, call.strainOld);
        const res = call.run(ctx, q, interpolate(g.N, ctx.temperature), interpolate(g.N, ctx.temperatureOld), out);
        accumulate(B, rows, cols, res.stress, res.tangent, volumeWeight(section, g, rule.weights[q]), out, ctx.wantTangent, CB);
      }
    },
    pointCoordinates(coords, _section, out) {
      continuumPointCoordinates(shape, rule, coords, out);
    },
  };
}
