/**
 * T3: 3-node linear triangle (constant strain), one integration point.
 * Nodes counter-clockwise; reference triangle (0,0), (1,0), (0,1).
 */
import { gaussTriangle } from '../quadrature/gauss';
import { makeContinuumKernel } from './continuum';
import type { ShapeFunctions } from './types';

export const t3Shape: ShapeFunctions = {
  nodes: 3,
  cell: 'triangle',
  referenceNodes: Float64Array.from([0, 0, 1, 0, 0, 1]),
  evaluate(xi, eta, N, dN) {
    N[0] = 1 - xi - eta;
    N[1] = xi;
    N[2] = eta;
    dN[0] = -1; dN[1] = -1;
    dN[2] = 1; dN[3] = 0;
    dN[4] = 0; dN[5] = 1;
  },
};

export const t3 = makeContinuumKernel({
  name: 't3',
  shape: t3Shape,
  rule: gaussTriangle(1),
  edges: [[0, 1], [1, 2], [2, 0]],
});
