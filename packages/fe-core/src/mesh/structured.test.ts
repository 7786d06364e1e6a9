/**
 * Structured meshers: exact areas of the meshed regions (closed forms of rectangles, circles and
 * ellipses), positive orientation of every element, set contents and edge sets whose lengths add
 * up to the boundary lengths.
 */
import { describe, expect, it } from 'vitest';
import { edgeCount } from '@phaseloop/shared';
import { ellipticRing, line, mergeParts, quarterDisc, quarterPlateWithHole, rectangle, type MeshPart } from './structured';

/** Area of the corner polygon of every element (mid-side nodes of straight edges add nothing). */
function cornerAreas(part: MeshPart): number[] {
  const byId = new Map(part.nodes.map((n) => [n.id, n]));
  return part.elements.map((e) => {
    const corners = edgeCount(e.type);
    let a = 0;
    for (let k = 0; k < corners; k++) {
      const p = byId.get(e.nodes[k])!;
      const q = byId.get(e.nodes[(k + 1) % corners])!;
      a += p.x * q.y - q.x * p.y;
    }
    return a / 2;
  });
}

function edgeLength(part: MeshPart, set: string): number {
  const byId = new Map(part.nodes.map((n) => [n.id, n]));
  const els = new Map(part.elements.map((e) => [e.id, e]));
  let L = 0;
  for (const ref of part.edgeSets[set]) {
    const e = els.get(ref.element)!;
    const corners = edgeCount(e.type);
    const p = byId.get(e.nodes[ref.edge - 1])!;
    const q = byId.get(e.nodes[ref.edge % corners])!;
    L += Math.hypot(q.x - p.x, q.y - p.y);
  }
  return L;
}

describe('structured meshers', () => {
  it('rectangle: area, counts, orientation and sets for every element type', () => {
    for (const type of ['t3', 'q4', 't6', 'q8'] as const) {
      const part = rectangle({ x0: 1, y0: 2, width: 6, height: 3, nx: 4, ny: 3 }, { type });
      const areas = cornerAreas(part);
      expect(areas.every((a) => a > 0)).toBe(true);
      expect(areas.reduce((s, a) => s + a, 0)).toBeCloseTo(18, 12);
      const expectNodes = { t3: 20, q4: 20, t6: 63, q8: 63 - 12 }[type];
      expect(part.nodes.length).toBe(expectNodes);
      expect(edgeLength(part, 'right')).toBeCloseTo(3, 12);
      expect(edgeLength(part, 'bottom')).toBeCloseTo(6, 12);
      expect(part.nodeSets.left.length).toBe(type === 't3' || type === 'q4' ? 4 : 7);
      expect(new Set(part.nodes.map((n) => `${n.x},${n.y}`)).size).toBe(part.nodes.length);
    }
  });

  it('quarter plate with a hole: area W·H − πa²/4 (quadratic edges follow the arc)', () => {
    const part = quarterPlateWithHole({ radius: 2, halfWidth: 10, halfHeight: 8, nAround: 16, nRadial: 6, ratio: 3 }, { type: 'q8' });
    const areas = cornerAreas(part);
    expect(areas.every((a) => a > 0)).toBe(true);
    // Corner polygons under-estimate the hole's arc by O(h²): compare loosely; nodes on the arc exactly.
    expect(areas.reduce((s, a) => s + a, 0)).toBeCloseTo(80 - Math.PI, 1);
    for (const id of part.nodeSets.hole) {
      const n = part.nodes[id - 1];
      expect(Math.hypot(n.x, n.y)).toBeCloseTo(2, 12);
    }
    expect(edgeLength(part, 'right')).toBeCloseTo(8, 12);
    expect(edgeLength(part, 'top')).toBeCloseTo(10, 12);
    expect(edgeLength(part, 'left')).toBeCloseTo(6, 12);
    expect(edgeLength(part, 'bottom')).toBeCloseTo(8, 12);
  });

  it('elliptic ring: nodes on both ellipses, sets on the cut lines', () => {
    const part = ellipticRing({ inner: { a: 2, b: 1 }, outer: { a: 3.25, b: 2.75 }, nAround: 6, nRadial: 3 }, { type: 't6' });
    for (const id of part.nodeSets.inner) {
      const n = part.nodes[id - 1];
      expect((n.x / 2) ** 2 + n.y ** 2).toBeCloseTo(1, 12);
    }
    for (const id of part.nodeSets.outer) {
      const n = part.nodes[id - 1];
      expect((n.x / 3.25) ** 2 + (n.y / 2.75) ** 2).toBeCloseTo(1, 12);
    }
    expect(part.nodeSets.start.every((id) => part.nodes[id - 1].y === 0)).toBe(true);
    expect(part.nodeSets.end.every((id) => Math.abs(part.nodes[id - 1].x) < 1e-12)).toBe(true);
    expect(cornerAreas(part).every((a) => a > 0)).toBe(true);
  });

  it('quarter disc and plate with hole glue into one conforming mesh', () => {
    const disc = quarterDisc({ radius: 1, n: 4 }, { type: 'q4', material: 'in' });
    const plate = quarterPlateWithHole({ radius: 1, halfWidth: 5, halfHeight: 5, nAround: 4, nRadial: 4 }, { type: 'q4', material: 'out' });
    const both = mergeParts([disc, plate]);
    // Nodes on the shared arc (2·4 + 1) are merged once.
    expect(both.nodes.length).toBe(disc.nodes.length + plate.nodes.length - 9);
    const total = cornerAreas(both).reduce((s, a) => s + a, 0);
    expect(total).toBeCloseTo(25, 10);
    expect(both.elements.filter((e) => e.material === 'in').length).toBe(disc.elements.length);
  });

  it('line of beams: n elements, end sets', () => {
    const part = line({ from: [0, 0], to: [10, 5], n: 5 }, { type: 'beam2' });
    expect(part.elements.length).toBe(5);
    expect(part.nodeSets.end).toEqual([6]);
    expect(part.nodes[5]).toMatchObject({ x: 10, y: 5 });
  });
});
