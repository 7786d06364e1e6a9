/**
 * Q4: 4-node bilinear quadrilateral, full 2×2 Gauss integration (locks in bending and near
 * incompressibility; q4-eas and q4-bbar are the remedies). Nodes counter-clockwise.
 */
import { gaussQuad } from '../quadrature/gauss';
import { makeContinuumKernel } from './continuum';
import type { ShapeFunctions } from './types';

const CORNERS = Float64Array.from([-1, -1, 1, -1, 1, 1, -1, 1]);

export const q4Shape: ShapeFunctions = {
  nodes: 4,
  cell: 'quad',
  referenceNodes: CORNERS,
  evaluate(xi, eta, N, dN) {
    for (let a = 0; a < 4; a++) {
      const xa = CORNERS[2 * a], ya = CORNERS[2 * a + 1];
      const fx = 1 + xi * xa, fy = 1 + eta * ya;
      N[a] = 0.25 * fx * fy;
      dN[2 * a] = 0.25 * xa * fy;
      dN[2 * a + 1] = 0.25 * ya * fx;
    }
  },
};

export const Q4_EDGES = [[0, 1], [1, 2], [2, 3], [3, 0]] as const;

export const q4 = makeContinuumKernel({ name: 'q4', shape: q4Shape, rule: gaussQuad(2), edges: Q4_EDGES });
