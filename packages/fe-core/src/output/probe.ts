/**
 * Point probes: where a requested (x, y) lies in the mesh, as node weights. Inside a 2D continuum
 * element the weights are the element's shape functions at the point, found by inverting the
 * isoparametric map with Newton's method; elsewhere (outside the mesh, bar and beam models) the
 * nearest node takes the whole weight. Nodal fields are then interpolated as Σ N_a v_a.
 */
import type { Problem } from '../assembly/problem';
import { nearestNode } from './frame';

export interface Probe {
  /** Node indices and their weights (sum 1). */
  nodes: Int32Array;
  weights: Float64Array;
  /** Element id containing the point, or 0 when the nearest node was used. */
  element: number;
}

const INSIDE_TOL = 1e-7;

function insideReference(cell: 'triangle' | 'quad', xi: number, eta: number): boolean {
  if (cell === 'quad') return Math.abs(xi) <= 1 + INSIDE_TOL && Math.abs(eta) <= 1 + INSIDE_TOL;
  return xi >= -INSIDE_TOL && eta >= -INSIDE_TOL && xi + eta <= 1 + INSIDE_TOL;
}

/** Shape-function weights of (x, y) in element e, or null when the point lies outside it. */
function weightsIn(problem: Problem, e: number, x: number, y: number): Float64Array | null {
  const el = problem.elements[e];
  const shape = el.kernel.shape;
  if (!shape) return null;
  const n = shape.nodes;
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (let a = 0; a < n; a++) {
    minX = Math.min(minX, el.coords[2 * a]);
    maxX = Math.max(maxX, el.coords[2 * a]);
    minY = Math.min(minY, el.coords[2 * a + 1]);
    maxY = Math.max(maxY, el.coords[2 * a + 1]);
  }
  const pad = 1e-6 * Math.max(maxX - minX, maxY - minY);
  if (x < minX - pad || x > maxX + pad || y < minY - pad || y > maxY + pad) return null;
  const N = new Float64Array(n);
  const dN = new Float64Array(2 * n);
  let xi = shape.cell === 'quad' ? 0 : 1 / 3;
  let eta = shape.cell === 'quad' ? 0 : 1 / 3;
  for (let it = 0; it < 25; it++) {
    shape.evaluate(xi, eta, N, dN);
    let px = 0, py = 0, j00 = 0, j01 = 0, j10 = 0, j11 = 0;
    for (let a = 0; a < n; a++) {
      const xa = el.coords[2 * a], ya = el.coords[2 * a + 1];
      px += N[a] * xa;
      py += N[a] * ya;
      j00 += dN[2 * a] * xa;
      j10 += dN[2 * a] * ya;
      j01 += dN[2 * a + 1] * xa;
      j11 += dN[2 * a + 1] * ya;
    }
    const rx = x - px, ry = y - py;
    const det = j00 * j11 - j01 * j10;
    if (Math.abs(det) < 1e-300) return null;
    const dxi = (j11 * rx - j01 * ry) / det;
    const deta = (-j10 * rx + j00 * ry) / det;
    xi += dxi;
    eta += deta;
    if (Math.abs(dxi) + Math.abs(deta) < 1e-13) break;
  }
  if (!insideReference(shape.cell, xi, eta)) return null;
  shape.evaluate(xi, eta, N, dN);
  return N;
}

export function locatePoint(problem: Problem, x: number, y: number): Probe {
  for (let e = 0; e < problem.elements.length; e++) {
    const N = weightsIn(problem, e, x, y);
    if (N) return { nodes: problem.elements[e].nodes, weights: N, element: problem.elements[e].id };
  }
  return { nodes: Int32Array.of(nearestNode(problem, x, y)), weights: Float64Array.of(1), element: 0 };
}

/** Σ N_a v_a of component c of a node-major field with `width` components. */
export function interpolate(probe: Probe, field: ArrayLike<number>, width: number, c: number): number {
  let v = 0;
  for (let k = 0; k < probe.nodes.length; k++) v += probe.weights[k] * field[probe.nodes[k] * width + c];
  return v;
}
