/**
 * Quadrature rules on the reference line [−1, 1], square [−1, 1]² and triangle
 * {ξ ≥ 0, η ≥ 0, ξ + η ≤ 1} (area 1/2).
 *
 * Gauss–Legendre abscissae are computed once at module load by Newton iteration on the Legendre
 * polynomial, so they are correct to round-off without long literal tables. Triangle rules are
 * the symmetric ones of degree 1, 2, 4 and 5 (1, 3, 6 and 7 points).
 */

export interface QuadratureRule {
  /** Spatial dimension of the reference cell (1 or 2). */
  readonly dim: 1 | 2;
  /** Points, point-major (ξ) or (ξ, η): length count·dim. */
  readonly points: Float64Array;
  readonly weights: Float64Array;
  readonly count: number;
  /** Highest total polynomial degree integrated exactly. */
  readonly degree: number;
}

/** Legendre P_n(x) and its derivative by the three-term recurrence. */
function legendre(n: number, x: number): [number, number] {
  let p0 = 1;
  let p1 = x;
  if (n === 0) return [1, 0];
  for (let k = 2; k <= n; k++) {
    const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
    p0 = p1;
    p1 = p2;
  }
  // P_n'(x) = n (x P_n − P_{n−1}) / (x² − 1); Gauss points never sit at ±1.
  return [p1, (n * (x * p1 - p0)) / (x * x - 1)];
}

function computeGaussLegendre(n: number): QuadratureRule {
  const points = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // Chebyshev-like start lands in the basin of the i-th root.
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    for (let it = 0; it < 100; it++) {
      const [p, dp] = legendre(n, x);
      const dx = p / dp;
      x -= dx;
      if (Math.abs(dx) < 1e-16) break;
    }
    const [, dp] = legendre(n, x);
    points[n - 1 - i] = x;
    weights[n - 1 - i] = 2 / ((1 - x * x) * dp * dp);
  }
  return { dim: 1, points, weights, count: n, degree: 2 * n - 1 };
}

export const MAX_GAUSS_POINTS = 5;
const LINE_RULES: QuadratureRule[] = [];
for (let n = 1; n <= MAX_GAUSS_POINTS; n++) LINE_RULES.push(computeGaussLegendre(n));

/** n-point Gauss–Legendre rule on [−1, 1] (exact to degree 2n − 1), n = 1..5. */
export function gaussLine(n: number): QuadratureRule {
  if (!Number.isInteger(n) || n < 1 || n > MAX_GAUSS_POINTS) {
    throw new Error(`Gauss line rule with ${n} points is not available (1..${MAX_GAUSS_POINTS})`);
  }
  return LINE_RULES[n - 1];
}

/**
 * n-point Gauss–Lobatto rule on [−1, 1] (end points included, exact to degree 2n − 3), n = 2..5.
 * Closed forms: interior points are the roots of P'_{n−1}, weights 2/(n(n−1) P_{n−1}(x)²).
 */
export function gaussLobattoLine(n: number): QuadratureRule {
  const rule = LOBATTO_RULES[n];
  if (!rule) throw new Error(`Gauss–Lobatto rule with ${n} points is not available (2..5)`);
  return rule;
}

function lobatto(points: number[], weights: number[]): QuadratureRule {
  const n = points.length;
  return { dim: 1, points: Float64Array.from(points), weights: Float64Array.from(weights), count: n, degree: 2 * n - 3 };
}

const LOBATTO_RULES: Record<number, QuadratureRule> = {
  2: lobatto([-1, 1], [1, 1]),
  3: lobatto([-1, 0, 1], [1 / 3, 4 / 3, 1 / 3]),
  4: lobatto([-1, -1 / Math.sqrt(5), 1 / Math.sqrt(5), 1], [1 / 6, 5 / 6, 5 / 6, 1 / 6]),
  5: lobatto([-1, -Math.sqrt(3 / 7), 0, Math.sqrt(3 / 7), 1], [1 / 10, 49 / 90, 32 / 45, 49 / 90, 1 / 10]),
};

/** Tensor-product n×n Gauss rule on [−1, 1]², ordered η-major (ξ runs fastest). */
export function gaussQuad(n: number): QuadratureRule {
  const line = gaussLine(n);
  const points = new Float64Array(2 * n * n);
  const weights = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const k = j * n + i;
      points[2 * k] = line.points[i];
      points[2 * k + 1] = line.points[j];
      weights[k] = line.weights[i] * line.weights[j];
    }
  }
  return { dim: 2, points, weights, count: n * n, degree: 2 * n - 1 };
}

/** Builds a symmetric triangle rule from orbits: centroid, and (a, a, 1 − 2a) permutations. */
function triangleRule(degree: number, centroidWeight: number, orbits: readonly [number, number][]): QuadratureRule {
  const xs: number[] = [];
  const ws: number[] = [];
  if (centroidWeight > 0) {
    xs.push(1 / 3, 1 / 3);
    ws.push(centroidWeight);
  }
  for (const [a, w] of orbits) {
    const b = 1 - 2 * a;
    xs.push(a, a, b, a, a, b);
    ws.push(w, w, w);
  }
  return { dim: 2, points: Float64Array.from(xs), weights: Float64Array.from(ws), count: ws.length, degree };
}

const SQRT15 = Math.sqrt(15);
const TRIANGLE_RULES: Record<number, QuadratureRule> = {
  1: triangleRule(1, 0.5, []),
  3: triangleRule(2, 0, [[1 / 6, 1 / 6]]),
  // Degree-4 six-point rule; abscissae and weights to 15 digits (weights here already halved).
  6: triangleRule(4, 0, [
    [0.445948490915965, 0.223381589678011 / 2],
    [0.091576213509771, 0.109951743655322 / 2],
  ]),
  // Degree-5 seven-point rule, closed forms in √15.
  7: triangleRule(5, 9 / 80, [
    [(6 + SQRT15) / 21, (155 + SQRT15) / 2400],
    [(6 - SQRT15) / 21, (155 - SQRT15) / 2400],
  ]),
};

/** Symmetric triangle rule with 1, 3, 6 or 7 points (degree 1, 2, 4, 5); weights sum to 1/2. */
export function gaussTriangle(n: 1 | 3 | 6 | 7): QuadratureRule {
  const rule = TRIANGLE_RULES[n];
  if (!rule) throw new Error(`triangle rule with ${n} points is not available (1, 3, 6, 7)`);
  return rule;
}
