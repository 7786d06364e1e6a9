/**
 * What the two Q4 variants with a modified strain field (q4-bbar, q4-eas) share: the 2×2 Gauss
 * rule, the kernel fields that do not depend on the variant, and the geometry pass that stores,
 * for every Gauss point, the standard B, the volume weight, the shape values and the Jacobian
 * data, before each variant modifies or extends B.
 */
import { gaussQuad } from '../quadrature/gauss';
import {
  ContinuumGeometry,
  continuumPointCoordinates,
  continuumStressState,
  fillB,
  geometryProblem,
  volumeWeight,
} from './continuum';
import { Q4_EDGES, q4Shape } from './q4';
import type { ContinuumSection, ElementKernel, ElementName } from './types';

export const Q4_RULE = gaussQuad(2);
/** Gauss points per element. */
export const Q4_NQ = Q4_RULE.count;
/** Displacement columns of B (4 nodes × 2). */
export const Q4_COLS = 8;

/** The 2×2 Gauss points of one Q4 element, filled by `fill` and reused through the evaluation. */
export class Q4GaussPoints {
  /** Standard B of each point (rows × 8, row-major), one view per point. */
  readonly B: readonly Float64Array[];
  /** Shape-function values of each point, one view per point. */
  readonly N: readonly Float64Array[];
  readonly dV = new Float64Array(Q4_NQ);
  /** det J and radius (x) of each point. */
  readonly detJ = new Float64Array(Q4_NQ);
  readonly x = new Float64Array(Q4_NQ);
  private readonly g = new ContinuumGeometry(q4Shape);

  constructor() {
    // Views made once here, so the evaluation allocates nothing per integration point.
    const B = new Float64Array(Q4_NQ * 4 * Q4_COLS);
    const N = new Float64Array(Q4_NQ * 4);
    this.B = Array.from({ length: Q4_NQ }, (_, q) => B.subarray(q * 4 * Q4_COLS, (q + 1) * 4 * Q4_COLS));
    this.N = Array.from({ length: Q4_NQ }, (_, q) => N.subarray(4 * q, 4 * q + 4));
  }

  /** Geometry at every Gauss point; returns the first point's geometry problem, or ''. */
  fill(section: ContinuumSection, coords: Float64Array, name: string): string {
    const { g } = this;
    for (let q = 0; q < Q4_NQ; q++) {
      g.at(coords, Q4_RULE.points[2 * q], Q4_RULE.points[2 * q + 1]);
      const problem = geometryProblem(section, g, name);
      if (problem) return problem;
      fillB(section.analysis, g, this.B[q]);
      this.N[q].set(g.N);
      this.dV[q] = volumeWeight(section, g, Q4_RULE.weights[q]);
      this.detJ[q] = g.detJ;
      this.x[q] = g.x;
    }
    return '';
  }

}

/** The kernel fields both variants fill the same way (everything but the evaluation and the state). */
export function q4VariantFields(
  name: ElementName,
): Pick<
  ElementKernel,
  'name' | 'sectionKind' | 'nodes' | 'dofsPerNode' | 'edges' | 'shape' | 'rule' | 'stressState' | 'pointsPerElement' | 'pointCoordinates'
> {
  return {
    name,
    sectionKind: 'continuum',
    nodes: 4,
    dofsPerNode: 2,
    edges: Q4_EDGES,
    shape: q4Shape,
    rule: Q4_RULE,
    stressState: (section) => continuumStressState(section, name),
    pointsPerElement: () => Q4_NQ,
    pointCoordinates(coords, _section, out) {
      continuumPointCoordinates(q4Shape, Q4_RULE, coords, out);
    },
  };
}

/** Material state of every Gauss point, one block of material.stateSize each from offset. */
export const initQ4PointStates: ElementKernel['initState'] = (state, offset, _section, material, temperature) => {
  for (let q = 0; q < Q4_NQ; q++) material.initState(state, offset + q * material.stateSize, temperature);
};
