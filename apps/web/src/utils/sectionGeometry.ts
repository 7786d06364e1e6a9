/**
 * Bars and beams drawn as solids: each line element becomes a prism of its cross-section
 * (circle, tube or rectangle) along its deformed axis, so a wire looks like a wire. All prisms
 * share one vertex buffer; a frame change only re-places the vertices (`placeExtrusion`), it
 * never rebuilds the geometry.
 *
 * Plane models lie in x–y. A section's depth (a rectangle's height, the direction its fibres are
 * layered in) lies in the model plane, across the axis; its width is out of plane, along z.
 */

export type LineSection =
  | { shape: 'circle'; diameter: number }
  | { shape: 'tube'; outerDiameter: number; wallThickness: number }
  | { shape: 'rectangle'; width: number; height: number };

const positive = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v) && v > 0;

/**
 * The drawable outline of a model section: a beam's cross-section as given; a bar knows only
 * its area, so it is drawn as the circle of that area (d = √(4A/π)). Continuum sections and
 * anything malformed give null (the element is then drawn as before).
 */
export function lineSectionOf(spec: unknown): LineSection | null {
  const s = spec as { kind?: unknown; area?: unknown; crossSection?: Record<string, unknown> } | null;
  if (!s || typeof s !== 'object') return null;
  if (s.kind === 'bar') return positive(s.area) ? { shape: 'circle', diameter: Math.sqrt((4 * s.area) / Math.PI) } : null;
  if (s.kind !== 'beam' || !s.crossSection) return null;
  const c = s.crossSection;
  if (c.shape === 'circle' && positive(c.diameter)) return { shape: 'circle', diameter: c.diameter };
  if (c.shape === 'rectangle' && positive(c.width) && positive(c.height)) return { shape: 'rectangle', width: c.width, height: c.height };
  if (c.shape === 'tube' && positive(c.outerDiameter) && positive(c.wallThickness)) {
    // A wall as thick as the radius is a solid bar.
    return c.wallThickness * 2 >= c.outerDiameter ? { shape: 'circle', diameter: c.outerDiameter } : { shape: 'tube', outerDiameter: c.outerDiameter, wallThickness: c.wallThickness };
  }
  return null;
}

/** Largest extent of the section across the axis (mm), e.g. for camera fitting and probe markers. */
export function sectionSize(section: LineSection): number {
  if (section.shape === 'circle') return section.diameter;
  if (section.shape === 'tube') return section.outerDiameter;
  return Math.max(section.width, section.height);
}

/**
 * One prism in local terms. Per vertex: the offset across the axis in the plane (`a`) and out
 * of plane (`b`), the normal's components along the in-plane normal, z and the axis, and which
 * end of the element it sits at. Smooth sides (circle, tube) share normals around the loop;
 * flat faces (rectangle sides, end caps) have vertices of their own so edges stay sharp.
 */
export interface SectionTemplate {
  vertexCount: number;
  /** a, b per vertex. */
  offsets: Float32Array;
  /** normal along (in-plane normal, z, axis) per vertex. */
  normals: Float32Array;
  /** 0 at the element's first node, 1 at its second. */
  ends: Uint8Array;
  /** Triangles, local vertex numbers. */
  indices: Uint32Array;
}

interface LoopPoint { a: number; b: number; na: number; nb: number }

class TemplateBuilder {
  readonly offsets: number[] = [];
  readonly normals: number[] = [];
  readonly ends: number[] = [];
  readonly indices: number[] = [];
  get count(): number { return this.ends.length; }
  vertex(a: number, b: number, na: number, nb: number, nt: number, end: number): number {
    this.offsets.push(a, b);
    this.normals.push(na, nb, nt);
    this.ends.push(end);
    return this.ends.length - 1;
  }
  /** Side band along the axis through an open strip of points. */
  side(strip: readonly LoopPoint[]): void {
    const base = this.count;
    for (const p of strip) { this.vertex(p.a, p.b, p.na, p.nb, 0, 0); this.vertex(p.a, p.b, p.na, p.nb, 0, 1); }
    for (let k = 0; k + 1 < strip.length; k++) {
      const a0 = base + 2 * k, a1 = a0 + 1, b0 = a0 + 2, b1 = a0 + 3;
      this.indices.push(a0, b0, a1, a1, b0, b1);
    }
  }
  /** Flat end caps: the same polygon at both ends, with its triangles given in polygon numbers. */
  caps(points: readonly { a: number; b: number }[], triangles: readonly number[]): void {
    for (const end of [0, 1]) {
      const base = this.count;
      for (const p of points) this.vertex(p.a, p.b, 0, 0, end === 0 ? -1 : 1, end);
      for (const t of triangles) this.indices.push(base + t);
    }
  }
  build(): SectionTemplate {
    return {
      vertexCount: this.count,
      offsets: new Float32Array(this.offsets),
      normals: new Float32Array(this.normals),
      ends: new Uint8Array(this.ends),
      indices: new Uint32Array(this.indices),
    };
  }
}

function ring(radius: number, segments: number, inward: boolean): LoopPoint[] {
  const out: LoopPoint[] = [];
  for (let k = 0; k <= segments; k++) {
    const t = (2 * Math.PI * k) / segments;
    const c = Math.cos(t), s = Math.sin(t);
    out.push({ a: radius * c, b: radius * s, na: inward ? -c : c, nb: inward ? -s : s });
  }
  return out;
}

/**
 * The prism of a section. `segments` is the number of facets around a circle. Vertex counts:
 * circle 4m + 2 (side 2(m + 1), caps 2m), tube 8m + 4, rectangle 24 (each face its own).
 */
export function sectionTemplate(section: LineSection, segments = 16): SectionTemplate {
  const m = Math.max(3, Math.floor(segments));
  const t = new TemplateBuilder();
  if (section.shape === 'rectangle') {
    const h = section.height / 2; // in plane (depth)
    const w = section.width / 2; // out of plane
    const faces: [LoopPoint, LoopPoint][] = [
      [{ a: h, b: -w, na: 1, nb: 0 }, { a: h, b: w, na: 1, nb: 0 }],
      [{ a: h, b: w, na: 0, nb: 1 }, { a: -h, b: w, na: 0, nb: 1 }],
      [{ a: -h, b: w, na: -1, nb: 0 }, { a: -h, b: -w, na: -1, nb: 0 }],
      [{ a: -h, b: -w, na: 0, nb: -1 }, { a: h, b: -w, na: 0, nb: -1 }],
    ];
    for (const f of faces) t.side(f);
    t.caps([{ a: h, b: -w }, { a: h, b: w }, { a: -h, b: w }, { a: -h, b: -w }], [0, 1, 2, 0, 2, 3]);
    return t.build();
  }
  const outer = section.shape === 'circle' ? section.diameter / 2 : section.outerDiameter / 2;
  t.side(ring(outer, m, false));
  if (section.shape === 'circle') {
    const fan: number[] = [];
    for (let k = 1; k + 1 < m; k++) fan.push(0, k, k + 1);
    t.caps(ring(outer, m, false).slice(0, m), fan);
    return t.build();
  }
  const inner = outer - section.wallThickness;
  t.side(ring(inner, m, true));
  // Annulus: outer points 0…m−1, then inner points m…2m−1.
  const annulus: number[] = [];
  for (let k = 0; k < m; k++) {
    const o0 = k, o1 = (k + 1) % m, i0 = m + k, i1 = m + ((k + 1) % m);
    annulus.push(o0, o1, i0, i0, o1, i1);
  }
  t.caps([...ring(outer, m, false).slice(0, m), ...ring(inner, m, true).slice(0, m)], annulus);
  return t.build();
}

/** One line element to draw as a solid: its two node indices, its section and its position in the mesh. */
export interface LineSolid { a: number; b: number; section: LineSection; element?: number }

/** All prisms of a model merged into one indexed buffer. */
export interface Extrusion {
  solids: number;
  vertexCount: number;
  indices: Uint32Array;
  /** Node whose value colours each vertex (the element end it sits at). */
  vertexNode: Uint32Array;
  /** Solid each vertex belongs to. */
  vertexSolid: Uint32Array;
  offsets: Float32Array;
  localNormals: Float32Array;
  /** Node indices of each solid's ends (2 per solid). */
  ends: Uint32Array;
  /** Mesh element each solid draws. */
  solidElement: Uint32Array;
  /** Per solid scratch: axis tangent (tx, ty), written by `placeExtrusion`. */
  axes: Float32Array;
}

export function buildExtrusion(solids: readonly LineSolid[], segments = 16): Extrusion {
  const templates = new Map<string, SectionTemplate>();
  const templateOf = (s: LineSection) => {
    const key = JSON.stringify(s);
    let tpl = templates.get(key);
    if (!tpl) { tpl = sectionTemplate(s, segments); templates.set(key, tpl); }
    return tpl;
  };
  let vertexCount = 0;
  let indexCount = 0;
  for (const s of solids) { const tpl = templateOf(s.section); vertexCount += tpl.vertexCount; indexCount += tpl.indices.length; }
  const ex: Extrusion = {
    solids: solids.length, vertexCount,
    indices: new Uint32Array(indexCount), vertexNode: new Uint32Array(vertexCount), vertexSolid: new Uint32Array(vertexCount),
    offsets: new Float32Array(2 * vertexCount), localNormals: new Float32Array(3 * vertexCount),
    ends: new Uint32Array(2 * solids.length), solidElement: new Uint32Array(solids.length), axes: new Float32Array(2 * solids.length),
  };
  let v = 0;
  let i = 0;
  solids.forEach((s, k) => {
    const tpl = templateOf(s.section);
    ex.ends[2 * k] = s.a;
    ex.ends[2 * k + 1] = s.b;
    ex.solidElement[k] = s.element ?? k;
    for (let j = 0; j < tpl.indices.length; j++) ex.indices[i + j] = v + tpl.indices[j]!;
    for (let j = 0; j < tpl.vertexCount; j++) {
      ex.vertexSolid[v + j] = k;
      ex.vertexNode[v + j] = tpl.ends[j] === 0 ? s.a : s.b;
      ex.offsets[2 * (v + j)] = tpl.offsets[2 * j]!;
      ex.offsets[2 * (v + j) + 1] = tpl.offsets[2 * j + 1]!;
      ex.localNormals.set(tpl.normals.subarray(3 * j, 3 * j + 3), 3 * (v + j));
    }
    v += tpl.vertexCount;
    i += tpl.indices.length;
  });
  return ex;
}

/**
 * Places every prism on the deformed axis: `nodes` holds x, y, z per node (stride 3, the face
 * geometry's position array). Writes positions and normals (3 per vertex); allocates nothing.
 */
export function placeExtrusion(ex: Extrusion, nodes: Float32Array, positions: Float32Array, normals: Float32Array): void {
  for (let k = 0; k < ex.solids; k++) {
    const a = ex.ends[2 * k]!, b = ex.ends[2 * k + 1]!;
    const dx = nodes[3 * b]! - nodes[3 * a]!, dy = nodes[3 * b + 1]! - nodes[3 * a + 1]!;
    const len = Math.hypot(dx, dy);
    ex.axes[2 * k] = len > 0 ? dx / len : 1;
    ex.axes[2 * k + 1] = len > 0 ? dy / len : 0;
  }
  for (let v = 0; v < ex.vertexCount; v++) {
    const k = ex.vertexSolid[v]!;
    const tx = ex.axes[2 * k]!, ty = ex.axes[2 * k + 1]!;
    // In-plane normal of the axis: the tangent turned by +90°.
    const nx = -ty, ny = tx;
    const p = ex.vertexNode[v]!;
    const oa = ex.offsets[2 * v]!, ob = ex.offsets[2 * v + 1]!;
    positions[3 * v] = nodes[3 * p]! + oa * nx;
    positions[3 * v + 1] = nodes[3 * p + 1]! + oa * ny;
    positions[3 * v + 2] = nodes[3 * p + 2]! + ob;
    const na = ex.localNormals[3 * v]!, nb = ex.localNormals[3 * v + 1]!, nt = ex.localNormals[3 * v + 2]!;
    normals[3 * v] = na * nx + nt * tx;
    normals[3 * v + 1] = na * ny + nt * ty;
    normals[3 * v + 2] = nb;
  }
}
