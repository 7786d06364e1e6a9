/**
 * Q8: 8-node serendipity quadrilateral, full 3×3 Gauss integration (2×2 would leave a
 * spurious zero-energy mode). Nodes: corners 0–3 counter-clockwise, then mid-edge
 * 4 (0–1), 5 (1–2), 6 (2–3), 7 (3–0).
 */
import { gaussQuad } from '../quadrature/gauss';
import { makeContinuumKernel } from './continuum';
import type { ShapeFunctions } from './types';

const REF = Float64Array.from([-1, -1, 1, -1, 1, 1, -1, 1, 0, -1, 1, 0, 0, 1, -1, 0]);

export const q8Shape: ShapeFunctions = {
  nodes: 8,
  cell: 'quad',
  referenceNodes: REF,
  evaluate(xi, eta, N, dN) {
    for (let a = 0; a < 4; a++) {
      const xa = REF[2 * a], ya = REF[2 * a + 1];
      const fx = 1 + xi * xa, fy = 1 + eta * ya;
      N[a] = 0.25 * fx * fy * (xi * xa + eta * ya - 1);
      dN[2 * a] = 0.25 * xa * fy * (2 * xi * xa + eta * ya);
      dN[2 * a + 1] = 0.25 * ya * fx * (xi * xa + 2 * eta * ya);
    }
    for (let a = 4; a < 8; a++) {
      const xa = REF[2 * a], ya = REF[2 * a + 1];
      if (xa === 0) {
        N[a] = 0.5 * (1 - xi * xi) * (1 + eta * ya);
        dN[2 * a] = -xi * (1 + eta * ya);
        dN[2 * a + 1] = 0.5 * (1 - xi * xi) * ya;
      } else {
        N[a] = 0.5 * (1 + xi * xa) * (1 - eta * eta);
        dN[2 * a] = 0.5 * xa * (1 - eta * eta);
        dN[2 * a + 1] = -eta * (1 + xi * xa);
      }
    }
  },
};

export const q8 = makeContinuumKernel({
  name: 'q8',
  shape: q8Shape,
  rule: gaussQuad(3),
  edges: [[0, 1, 4], [1, 2, 5], [2, 3, 6], [3, 0, 7]],
});
