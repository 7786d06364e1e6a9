/**
 * Fibre (layer) discretisation of beam cross-sections for plane frames.
 *
 * The depth is cut into n equal layers (n rounded up to an even number so layers pair
 * symmetrically about the centroid). Each layer becomes one fibre with the layer's exact area
 * A_i and a lever arm chosen as y_i = ±√(I_i / A_i), where I_i = ∫ y² dA over the layer. Then
 * Σ A_i = A, Σ A_i y_i = 0 and Σ A_i y_i² = I hold EXACTLY for any n, so elastic axial and
 * bending stiffness carry no layering error; only nonlinear (e.g. partly plastic) sections
 * depend on n, converging like the midpoint rule (error ∝ 1/n²).
 */
import type { BeamSection, BeamShape, Section } from './types';

export interface FibreLayout {
  /** Lever arm of each fibre from the centroidal axis (local y). */
  readonly y: Float64Array;
  readonly area: Float64Array;
  readonly count: number;
  /** Exact section properties. */
  readonly A: number;
  readonly I: number;
  readonly depth: number;
  /** Default shear correction factor for the shape. */
  readonly shearCorrection: number;
}

export const DEFAULT_FIBRES = 16;

/** Area and second moment of the part of the shape between y = a and y = b (a < b). */
function strip(shape: BeamShape, a: number, b: number): { area: number; second: number } {
  switch (shape.type) {
    case 'rectangle':
      return { area: shape.b * (b - a), second: (shape.b * (b ** 3 - a ** 3)) / 3 };
    case 'circle':
      return discStrip(shape.d / 2, a, b);
    case 'tube': {
      const outer = discStrip(shape.do / 2, a, b);
      const inner = discStrip(shape.di / 2, a, b);
      return { area: outer.area - inner.area, second: outer.second - inner.second };
    }
  }
}

/** Closed-form strip of a disc of radius R: width 2√(R² − y²), clipped to |y| ≤ R. */
function discStrip(R: number, a: number, b: number): { area: number; second: number } {
  const lo = Math.max(-R, Math.min(R, a));
  const hi = Math.max(-R, Math.min(R, b));
  // Antiderivatives of 2√(R²−y²) and 2y²√(R²−y²).
  const F0 = (y: number): number => y * Math.sqrt(R * R - y * y) + R * R * Math.asin(y / R);
  const F2 = (y: number): number => (y * (2 * y * y - R * R) * Math.sqrt(R * R - y * y)) / 4 + ((R ** 4) / 4) * Math.asin(y / R);
  return { area: F0(hi) - F0(lo), second: F2(hi) - F2(lo) };
}

function depthOf(shape: BeamShape): number {
  switch (shape.type) {
    case 'rectangle':
      return shape.h;
    case 'circle':
      return shape.d;
    case 'tube':
      return shape.do;
  }
}

function validate(shape: BeamShape): void {
  const bad = (msg: string): never => {
    throw new Error(`beam section: ${msg}`);
  };
  if (shape.type === 'rectangle' && !(shape.b > 0 && shape.h > 0)) bad('rectangle needs b > 0 and h > 0');
  if (shape.type === 'circle' && !(shape.d > 0)) bad('circle needs d > 0');
  if (shape.type === 'tube' && !(shape.do > shape.di && shape.di >= 0)) bad('tube needs do > di ≥ 0');
}

const cache = new WeakMap<BeamSection, FibreLayout>();

export function fibreLayout(section: BeamSection): FibreLayout {
  const hit = cache.get(section);
  if (hit) return hit;
  const shape = section.shape;
  validate(shape);
  let n = Math.max(2, Math.ceil(section.fibres ?? DEFAULT_FIBRES));
  if (n % 2 === 1) n += 1;
  const depth = depthOf(shape);
  const y = new Float64Array(n);
  const area = new Float64Array(n);
  let A = 0;
  let I = 0;
  for (let i = 0; i < n; i++) {
    const a = -depth / 2 + (i * depth) / n;
    const b = a + depth / n;
    const s = strip(shape, a, b);
    area[i] = s.area;
    y[i] = s.area > 0 ? Math.sign(a + b) * Math.sqrt(s.second / s.area) : 0;
    A += s.area;
    I += s.second;
  }
  const shearCorrection = shape.type === 'rectangle' ? 5 / 6 : shape.type === 'circle' ? 0.9 : 0.5;
  const layout: FibreLayout = { y, area, count: n, A, I, depth, shearCorrection };
  cache.set(section, layout);
  return layout;
}

export function asBeam(section: Section, element: string): BeamSection {
  if (section.kind !== 'beam') throw new Error(`element ${element} needs a beam section, got '${section.kind}'`);
  return section;
}
