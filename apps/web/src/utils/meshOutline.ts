/**
 * Outline geometry of a 2D model for previews and the results viewer: element corner polygons
 * (mid-side nodes of quadratic elements are skipped: the straight-sided outline is what a preview
 * needs) and the node pairs of named edge sets.
 */

export interface OutlineNode { id: number; x: number; y: number }
export interface OutlineElement { id: number; type: string; nodes: number[] }

export function cornerCount(type: string): number {
  if (type === 'bar2' || type === 'beam2') return 2;
  if (type === 't3' || type === 't6') return 3;
  return 4;
}

export function isLineElement(type: string): boolean {
  return type === 'bar2' || type === 'beam2';
}

/** Node ids of edge `edge` (1-based, corner k to corner k+1) of an element. */
export function edgeNodes(element: OutlineElement, edge: number): [number, number] | null {
  const n = cornerCount(element.type);
  const a = element.nodes[edge - 1];
  const b = element.nodes[edge % n];
  return a === undefined || b === undefined ? null : [a, b];
}

export interface Bounds { minX: number; maxX: number; minY: number; maxY: number }

export function boundsOf(points: Iterable<{ x: number; y: number }>): Bounds {
  const b = { minX: Infinity, maxX: -Infinity, minY: Infinity, maxY: -Infinity };
  for (const p of points) {
    b.minX = Math.min(b.minX, p.x); b.maxX = Math.max(b.maxX, p.x);
    b.minY = Math.min(b.minY, p.y); b.maxY = Math.max(b.maxY, p.y);
  }
  if (!Number.isFinite(b.minX)) return { minX: 0, maxX: 1, minY: 0, maxY: 1 };
  return b;
}
