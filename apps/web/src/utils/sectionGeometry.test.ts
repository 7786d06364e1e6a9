import { describe, expect, it } from 'vitest';
import { buildExtrusion, lineSectionOf, placeExtrusion, sectionTemplate, type LineSection } from './sectionGeometry';

/** Largest distance of a template's vertices from the axis, in plane (a) and out of plane (b). */
function extent(section: LineSection): { a: number; b: number; r: number[] } {
  const t = sectionTemplate(section, 16);
  let a = 0, b = 0;
  const r: number[] = [];
  for (let v = 0; v < t.vertexCount; v++) {
    a = Math.max(a, Math.abs(t.offsets[2 * v]!));
    b = Math.max(b, Math.abs(t.offsets[2 * v + 1]!));
    r.push(Math.hypot(t.offsets[2 * v]!, t.offsets[2 * v + 1]!));
  }
  return { a, b, r };
}

describe('section outlines', () => {
  it('a bar is drawn as the circle of its area, a beam with its own cross-section', () => {
    const bar = lineSectionOf({ kind: 'bar', area: Math.PI });
    expect(bar?.shape).toBe('circle');
    expect(bar && bar.shape === 'circle' ? bar.diameter : 0).toBeCloseTo(2, 12); // A = π d² / 4
    expect(lineSectionOf({ kind: 'beam', crossSection: { shape: 'rectangle', width: 0.2, height: 0.15 } })).toEqual({ shape: 'rectangle', width: 0.2, height: 0.15 });
    expect(lineSectionOf({ kind: 'beam', crossSection: { shape: 'tube', outerDiameter: 2, wallThickness: 1 } })).toEqual({ shape: 'circle', diameter: 2 });
    expect(lineSectionOf({ kind: 'continuum', analysis: 'planeStress' })).toBeNull();
    expect(lineSectionOf({ kind: 'bar', area: -1 })).toBeNull();
    expect(lineSectionOf(null)).toBeNull();
  });
});

describe('section prisms', () => {
  it('circle: 4m + 2 vertices, 4m − 4 triangles, every vertex on the radius', () => {
    const t = sectionTemplate({ shape: 'circle', diameter: 0.5 }, 16);
    expect(t.vertexCount).toBe(4 * 16 + 2);
    expect(t.indices.length / 3).toBe(4 * 16 - 4);
    for (const r of extent({ shape: 'circle', diameter: 0.5 }).r) expect(r).toBeCloseTo(0.25, 6);
  });

  it('tube: 8m + 4 vertices, 8m triangles, vertices on the outer and the inner radius only', () => {
    const t = sectionTemplate({ shape: 'tube', outerDiameter: 2, wallThickness: 0.3 }, 16);
    expect(t.vertexCount).toBe(8 * 16 + 4);
    expect(t.indices.length / 3).toBe(8 * 16);
    const radii = new Set(extent({ shape: 'tube', outerDiameter: 2, wallThickness: 0.3 }).r.map((r) => r.toFixed(6)));
    expect([...radii].sort()).toEqual(['0.700000', '1.000000']);
  });

  it('rectangle: 24 vertices, 12 triangles; height across the axis in plane, width along z', () => {
    const t = sectionTemplate({ shape: 'rectangle', width: 0.2, height: 0.6 });
    expect(t.vertexCount).toBe(24);
    expect(t.indices.length / 3).toBe(12);
    const e = extent({ shape: 'rectangle', width: 0.2, height: 0.6 });
    expect(e.a).toBeCloseTo(0.3, 6);
    expect(e.b).toBeCloseTo(0.1, 6);
  });

  it('places prisms on the deformed axis: a vertical element of a circle spans the node heights, offset across x', () => {
    const ex = buildExtrusion([{ a: 0, b: 1, section: { shape: 'circle', diameter: 2 } }, { a: 1, b: 2, section: { shape: 'rectangle', width: 1, height: 1 } }], 8);
    expect(ex.solids).toBe(2);
    expect(ex.vertexCount).toBe(4 * 8 + 2 + 24);
    expect(Math.max(...ex.indices)).toBe(ex.vertexCount - 1);
    // Nodes (x, y, z): (5, 0), (5, 10), (15, 10): the first element is vertical, the second horizontal.
    const nodes = new Float32Array([5, 0, 0, 5, 10, 0, 15, 10, 0]);
    const pos = new Float32Array(3 * ex.vertexCount);
    const nor = new Float32Array(3 * ex.vertexCount);
    placeExtrusion(ex, nodes, pos, nor);
    const first = 4 * 8 + 2;
    let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
    for (let v = 0; v < first; v++) {
      minX = Math.min(minX, pos[3 * v]!); maxX = Math.max(maxX, pos[3 * v]!);
      minY = Math.min(minY, pos[3 * v + 1]!); maxY = Math.max(maxY, pos[3 * v + 1]!);
      expect(Math.hypot(nor[3 * v]!, nor[3 * v + 1]!, nor[3 * v + 2]!)).toBeCloseTo(1, 5);
    }
    expect([minX, maxX, minY, maxY]).toEqual([4, 6, 0, 10]);
    for (let v = first; v < ex.vertexCount; v++) {
      expect(pos[3 * v + 1]).toBeGreaterThanOrEqual(9.5 - 1e-6);
      expect(pos[3 * v + 1]).toBeLessThanOrEqual(10.5 + 1e-6);
      expect(Math.abs(pos[3 * v + 2]!)).toBeCloseTo(0.5, 6);
    }
  });
});
