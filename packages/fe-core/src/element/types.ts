/**
 * The element contract of fe-core.
 *
 * An element kernel is a stateless object (one per element type) that turns the nodal
 * displacements of ONE element into its internal force vector and consistent tangent, updating
 * the material points it owns. Everything it needs arrives in an `ElementContext`; everything it
 * produces goes into caller-owned arrays of an `ElementOutput`, so the assembly loop can reuse one
 * context and one output per element type and allocate nothing per element or per iteration.
 *
 * Conventions
 * - Plane analyses in x–y; axisymmetric in r–z with r = x ≥ 0 (axis of symmetry x = 0).
 * - Element dofs are node-major: [u1x, u1y, (θ1), u2x, u2y, (θ2), ...]. Continuum and bar
 *   elements have 2 dofs per node (ux, uy); frame beams have 3 (ux, uy, θz, θz counter-clockwise).
 * - fint is ∫ Bᵀσ dV (the force the element exerts on its nodes is −fint; the residual is
 *   fext − fint). K = ∂fint/∂u (row-major ndof × ndof, may be non-symmetric for SMA materials).
 * - Volume measure: plane stress/strain use the section thickness; axisymmetric integrates over
 *   the FULL ring, dV = 2π r dr dz, so nodal forces are total ring forces (thickness is ignored).
 * - Geometrically linear (small strain, small rotation).
 * - Material points: continuum elements have one per integration point; bars one per bar; beams
 *   (axial Gauss points) × (fibres through the depth), ordered Gauss-point-major. Each point's
 *   state lives at stateOffset + p·material.stateSize; element-level extras (e.g. the EAS
 *   parameters) follow the points (see `stateSize`).
 * - Temperatures are nodal and interpolated to the points with the element's shape functions;
 *   the materials turn them into thermal strain.
 */
import type { ReducedMaterial, StressState } from '../material/reduce';
import type { QuadratureRule } from '../quadrature/gauss';

export type ElementName = 'bar2' | 'beam2-eb' | 'beam2-timo' | 't3' | 'q4' | 'q4-eas' | 'q4-bbar' | 't6' | 'q8';

export type ContinuumAnalysis = 'planeStress' | 'planeStrain' | 'axisymmetric';

export interface ContinuumSection {
  readonly kind: 'continuum';
  readonly analysis: ContinuumAnalysis;
  /** Out-of-plane thickness (mm) for plane stress/strain; ignored for axisymmetric. */
  readonly thickness: number;
}

export interface BarSection {
  readonly kind: 'bar';
  /** Cross-section area (mm²). */
  readonly area: number;
}

export type BeamShape =
  | { readonly type: 'rectangle'; readonly b: number; readonly h: number }
  | { readonly type: 'circle'; readonly d: number }
  | { readonly type: 'tube'; readonly do: number; readonly di: number };

export interface BeamSection {
  readonly kind: 'beam';
  /** Cross-section; its depth lies along the element's local y axis (in the model plane). */
  readonly shape: BeamShape;
  /** Layers through the depth for fibre integration (default 16). */
  readonly fibres?: number;
  /** Timoshenko shear correction factor κ (default 5/6 rectangle, 0.9 circle, 0.5 tube). */
  readonly shearCorrection?: number;
  /**
   * Elastic shear modulus G for the Timoshenko shear term (MPa). Default: from the material's
   * initial 3D tangent (C_1212), evaluated once at the virgin state.
   */
  readonly shearModulus?: number;
}

export type Section = ContinuumSection | BarSection | BeamSection;

/** Isoparametric shape functions of a 2D continuum element on its reference cell. */
export interface ShapeFunctions {
  readonly nodes: number;
  /** Reference cell: triangle {ξ, η ≥ 0, ξ + η ≤ 1} or square [−1, 1]². */
  readonly cell: 'triangle' | 'quad';
  /** Reference coordinates of the nodes, length nodes·2. */
  readonly referenceNodes: Float64Array;
  /** Writes N (length nodes) and dN (node-major dN/dξ, dN/dη, length nodes·2) at (ξ, η). */
  evaluate(xi: number, eta: number, N: Float64Array, dN: Float64Array): void;
}

/** Everything an element needs for one evaluation. Arrays are element-local unless stated. */
export interface ElementContext {
  /** Nodal coordinates, node-major (x, y) or (r, z): length nodes·2. */
  readonly coords: Float64Array;
  /** Element dofs at the end of the increment (current Newton iterate). */
  readonly u: Float64Array;
  /** Element dofs at the start of the increment (last converged). */
  readonly uOld: Float64Array;
  /** Nodal temperatures now and at the start of the increment (°C), length nodes. */
  readonly temperature: Float64Array;
  readonly temperatureOld: Float64Array;
  readonly section: Section;
  /** The element's material, reduced to `kernel.stressState(section)`. */
  readonly material: ReducedMaterial<unknown>;
  /** GLOBAL state arrays and this element's offset into them (see `ElementKernel.stateSize`). */
  readonly state: Float64Array;
  readonly stateOld: Float64Array;
  readonly stateOffset: number;
  /** false: only fint (and point results) are needed, e.g. a residual-only check. */
  readonly wantTangent: boolean;
}

/** Caller-owned results of one evaluation (create with `createElementOutput`). */
export interface ElementOutput {
  /** Internal force vector, length ndof. */
  fint: Float64Array;
  /** Tangent ∂fint/∂u, ndof × ndof row-major (left untouched when wantTangent is false). */
  K: Float64Array;
  /** Full 3D strain and stress per material point, Kelvin–Mandel, length points·6. */
  strain: Float64Array;
  stress: Float64Array;
  /** false when a material point failed: the driver cuts the increment back. */
  ok: boolean;
  message: string;
}

export interface ElementKernel {
  readonly name: ElementName;
  readonly sectionKind: Section['kind'];
  readonly nodes: number;
  readonly dofsPerNode: 2 | 3;
  /**
   * Local node lists of the element's edges, counter-clockwise, each ordered end–end–(mid) —
   * for edge loads and boundary detection (2D continuum elements; empty for bars and beams).
   */
  readonly edges: readonly (readonly number[])[];
  /** Continuum elements: shape functions and the rule whose points are the material points
   *  (for body loads, nodal extrapolation of results, edge loads). Absent for bars and beams. */
  readonly shape?: ShapeFunctions;
  readonly rule?: QuadratureRule;
  /** Stress state the element's ReducedMaterial must be built with for this section. */
  stressState(section: Section): StressState;
  /** Material points per element (continuum: integration points; beam: Gauss points × fibres). */
  pointsPerElement(section: Section): number;
  /** Doubles of state per element: points × materialStateSize + element extras. */
  stateSize(section: Section, materialStateSize: number): number;
  /** Writes the virgin state of one element at `offset` (material points and extras). */
  initState(state: Float64Array, offset: number, section: Section, material: ReducedMaterial<unknown>, temperature: number): void;
  /** Internal forces, tangent and point results; reads stateOld, writes state. */
  evaluate(ctx: ElementContext, out: ElementOutput): void;
  /** Positions (x, y) of the material points, length points·2 (beam fibres at their depth). */
  pointCoordinates(coords: Float64Array, section: Section, out: Float64Array): void;
}

export function elementDofs(kernel: ElementKernel): number {
  return kernel.nodes * kernel.dofsPerNode;
}

export function createElementOutput(kernel: ElementKernel, section: Section): ElementOutput {
  const ndof = elementDofs(kernel);
  const points = kernel.pointsPerElement(section);
  return {
    fint: new Float64Array(ndof),
    K: new Float64Array(ndof * ndof),
    strain: new Float64Array(points * 6),
    stress: new Float64Array(points * 6),
    ok: true,
    message: '',
  };
}
