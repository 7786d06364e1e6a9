import { describe, expect, it } from 'vitest';
import { q4Shape } from './q4';
import { q8Shape } from './q8';
import { t3Shape } from './t3';
import { t6Shape } from './t6';
import type { ShapeFunctions } from './types';

const shapes: [string, ShapeFunctions][] = [['t3', t3Shape], ['t6', t6Shape], ['q4', q4Shape], ['q8', q8Shape]];

/** Deterministic sample points inside the reference cell. */
function samples(cell: 'triangle' | 'quad'): [number, number][] {
  const pts: [number, number][] = [];
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) {
      const a = (i + 0.37) / 6.4, b = (j + 0.21) / 6.3;
      if (cell === 'quad') pts.push([2 * a - 1, 2 * b - 1]);
      else if (a + b < 0.97) pts.push([a, b]);
    }
  }
  return pts;
}

describe.each(shapes)('%s shape functions', (_name, shape) => {
  const n = shape.nodes;
  const N = new Float64Array(n);
  const dN = new Float64Array(2 * n);
  const Np = new Float64Array(n);
  const Nm = new Float64Array(n);
  const scratch = new Float64Array(2 * n);

  it('are a partition of unity with zero-sum derivatives', () => {
    for (const [x, y] of samples(shape.cell)) {
      shape.evaluate(x, y, N, dN);
      let s = 0, sx = 0, sy = 0;
      for (let a = 0; a < n; a++) {
        s += N[a];
        sx += dN[2 * a];
        sy += dN[2 * a + 1];
      }
      expect(s).toBeCloseTo(1, 14);
      expect(sx).toBeCloseTo(0, 13);
      expect(sy).toBeCloseTo(0, 13);
    }
  });

  it('interpolate the reference coordinates (linear completeness)', () => {
    for (const [x, y] of samples(shape.cell)) {
      shape.evaluate(x, y, N, dN);
      let px = 0, py = 0;
      for (let a = 0; a < n; a++) {
        px += N[a] * shape.referenceNodes[2 * a];
        py += N[a] * shape.referenceNodes[2 * a + 1];
      }
      expect(px).toBeCloseTo(x, 14);
      expect(py).toBeCloseTo(y, 14);
    }
  });

  it('are 1 at their own node and 0 at the others (Kronecker property)', () => {
    for (let b = 0; b < n; b++) {
      shape.evaluate(shape.referenceNodes[2 * b], shape.referenceNodes[2 * b + 1], N, dN);
      for (let a = 0; a < n; a++) expect(N[a]).toBeCloseTo(a === b ? 1 : 0, 14);
    }
  });

  it('have derivatives that match central finite differences', () => {
    const h = 1e-6;
    for (const [x, y] of samples(shape.cell)) {
      shape.evaluate(x, y, N, dN);
      for (let d = 0; d < 2; d++) {
        shape.evaluate(x + (d === 0 ? h : 0), y + (d === 1 ? h : 0), Np, scratch);
        shape.evaluate(x - (d === 0 ? h : 0), y - (d === 1 ? h : 0), Nm, scratch);
        for (let a = 0; a < n; a++) expect(Math.abs((Np[a] - Nm[a]) / (2 * h) - dN[2 * a + d])).toBeLessThan(1e-8);
      }
    }
  });
});
