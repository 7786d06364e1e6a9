import { describe, expect, it } from 'vitest';
import { gaussLine, gaussLobattoLine, gaussQuad, gaussTriangle } from './gauss';

// Closed forms: ∫_{−1}^{1} x^k dx = (1 + (−1)^k)/(k + 1); over the unit triangle
// ∫ ξ^i η^j dA = i! j! / (i + j + 2)! (Dirichlet/beta integral).
const lineMoment = (k: number): number => (k % 2 === 0 ? 2 / (k + 1) : 0);
const fact = (n: number): number => (n <= 1 ? 1 : n * fact(n - 1));
const triangleMoment = (i: number, j: number): number => (fact(i) * fact(j)) / fact(i + j + 2);

describe('Gauss–Legendre line rules', () => {
  for (let n = 1; n <= 5; n++) {
    it(`${n} points integrate x^k exactly up to k = ${2 * n - 1} and not beyond`, () => {
      const r = gaussLine(n);
      const integrate = (k: number): number => {
        let s = 0;
        for (let q = 0; q < n; q++) s += r.weights[q] * r.points[q] ** k;
        return s;
      };
      for (let k = 0; k <= 2 * n - 1; k++) expect(integrate(k)).toBeCloseTo(lineMoment(k), 14);
      expect(Math.abs(integrate(2 * n) - lineMoment(2 * n))).toBeGreaterThan(1e-6);
    });
  }
  it('rejects unavailable orders', () => {
    expect(() => gaussLine(6)).toThrow(/not available/);
  });
});

describe('Gauss–Lobatto line rules', () => {
  for (let n = 2; n <= 5; n++) {
    it(`${n} points include ±1 and integrate x^k exactly up to k = ${2 * n - 3} and not beyond`, () => {
      const r = gaussLobattoLine(n);
      expect(r.points[0]).toBe(-1);
      expect(r.points[n - 1]).toBe(1);
      const integrate = (k: number): number => {
        let s = 0;
        for (let q = 0; q < n; q++) s += r.weights[q] * r.points[q] ** k;
        return s;
      };
      for (let k = 0; k <= 2 * n - 3; k++) expect(integrate(k)).toBeCloseTo(lineMoment(k), 14);
      expect(Math.abs(integrate(2 * n - 2) - lineMoment(2 * n - 2))).toBeGreaterThan(1e-6);
    });
  }
});

describe('tensor quad rules', () => {
  for (let n = 1; n <= 4; n++) {
    it(`${n}×${n} integrates x^i y^j exactly for i, j ≤ ${2 * n - 1}`, () => {
      const r = gaussQuad(n);
      for (let i = 0; i <= 2 * n - 1; i++) {
        for (let j = 0; j <= 2 * n - 1; j++) {
          let s = 0;
          for (let q = 0; q < r.count; q++) s += r.weights[q] * r.points[2 * q] ** i * r.points[2 * q + 1] ** j;
          expect(s).toBeCloseTo(lineMoment(i) * lineMoment(j), 13);
        }
      }
    });
  }
});

describe('triangle rules', () => {
  for (const n of [1, 3, 6, 7] as const) {
    it(`${n}-point rule is exact to its degree and inside the triangle`, () => {
      const r = gaussTriangle(n);
      for (let q = 0; q < r.count; q++) {
        const x = r.points[2 * q], y = r.points[2 * q + 1];
        expect(x).toBeGreaterThan(0);
        expect(y).toBeGreaterThan(0);
        expect(x + y).toBeLessThan(1);
      }
      for (let i = 0; i <= r.degree; i++) {
        for (let j = 0; i + j <= r.degree; j++) {
          let s = 0;
          for (let q = 0; q < r.count; q++) s += r.weights[q] * r.points[2 * q] ** i * r.points[2 * q + 1] ** j;
          expect(Math.abs(s - triangleMoment(i, j))).toBeLessThan(1e-14);
        }
      }
      // One degree higher is not integrated exactly (the rule is not better than claimed by luck).
      const d = r.degree + 1;
      let worst = 0;
      for (let i = 0; i <= d; i++) {
        let s = 0;
        for (let q = 0; q < r.count; q++) s += r.weights[q] * r.points[2 * q] ** i * r.points[2 * q + 1] ** (d - i);
        worst = Math.max(worst, Math.abs(s - triangleMoment(i, d - i)));
      }
      expect(worst).toBeGreaterThan(1e-8);
    });
  }
});
