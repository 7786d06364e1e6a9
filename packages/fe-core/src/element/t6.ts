/**
 * T6: 6-node quadratic triangle, 3-point rule (degree 2: exact stiffness for straight sides).
 * Nodes: corners 0–2 counter-clockwise, then mid-edge 3 (0–1), 4 (1–2), 5 (2–0).
 */
import { gaussTriangle } from '../quadrature/gauss';
import { makeContinuumKernel } from './continuum';
import type { ShapeFunctions } from './types';

// Area coordinates L0 = 1 − ξ − η, L1 = ξ, L2 = η and their (ξ, η) gradients.
const GRAD = [[-1, -1], [1, 0], [0, 1]] as const;
const MID = [[0, 1], [1, 2], [2, 0]] as const;
const L = new Float64Array(3);

export const t6Shape: ShapeFunctions = {
  nodes: 6,
  cell: 'triangle',
  referenceNodes: Float64Array.from([0, 0, 1, 0, 0, 1, 0.5, 0, 0.5, 0.5, 0, 0.5]),
  evaluate(xi, eta, N, dN) {
    L[0] = 1 - xi - eta;
    L[1] = xi;
    L[2] = eta;
    for (let i = 0; i < 3; i++) {
      N[i] = L[i] * (2 * L[i] - 1);
      dN[2 * i] = (4 * L[i] - 1) * GRAD[i][0];
      dN[2 * i + 1] = (4 * L[i] - 1) * GRAD[i][1];
    }
    for (let m = 0; m < 3; m++) {
      const [a, b] = MID[m];
      N[3 + m] = 4 * L[a] * L[b];
      dN[2 * (3 + m)] = 4 * (GRAD[a][0] * L[b] + L[a] * GRAD[b][0]);
      dN[2 * (3 + m) + 1] = 4 * (GRAD[a][1] * L[b] + L[a] * GRAD[b][1]);
    }
  },
};

export const t6 = makeContinuumKernel({
  name: 't6',
  shape: t6Shape,
  rule: gaussTriangle(3),
  edges: [[0, 1, 3], [1, 2, 4], [2, 0, 5]],
});
