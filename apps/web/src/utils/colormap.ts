/**
 * Perceptually uniform colour maps for contours. Each map is a handful of anchor colours sampled
 * from the published map and interpolated linearly in sRGB, which stays within a few percent of the
 * full table — enough for a contour legend.
 */
export type ColormapName = 'viridis' | 'cividis' | 'diverging';

type Rgb = readonly [number, number, number];

const ANCHORS: Record<ColormapName, readonly Rgb[]> = {
  viridis: [
    [0.267, 0.005, 0.329], [0.283, 0.141, 0.458], [0.254, 0.265, 0.530], [0.207, 0.372, 0.553],
    [0.164, 0.471, 0.558], [0.128, 0.567, 0.551], [0.135, 0.659, 0.518], [0.267, 0.749, 0.441],
    [0.478, 0.821, 0.318], [0.741, 0.873, 0.150], [0.993, 0.906, 0.144],
  ],
  cividis: [
    [0.000, 0.135, 0.304], [0.121, 0.216, 0.420], [0.264, 0.303, 0.431], [0.373, 0.388, 0.444],
    [0.478, 0.477, 0.472], [0.589, 0.570, 0.467], [0.704, 0.666, 0.436], [0.825, 0.768, 0.378],
    [0.953, 0.876, 0.271], [0.996, 0.910, 0.220],
  ],
  // Blue – near-white – red, symmetric about the middle, for signed fields.
  diverging: [
    [0.230, 0.299, 0.754], [0.436, 0.571, 0.952], [0.667, 0.779, 0.993], [0.867, 0.867, 0.867],
    [0.969, 0.718, 0.600], [0.906, 0.455, 0.355], [0.706, 0.016, 0.150],
  ],
};

/** Colour of t ∈ [0, 1] (clamped) as RGB in [0, 1], written into `out` at `offset` (no allocation in render loops). */
export function sampleInto(name: ColormapName, t: number, out: Float32Array | number[], offset = 0): void {
  const anchors = ANCHORS[name];
  const clamped = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0;
  const scaled = clamped * (anchors.length - 1);
  const i = Math.min(anchors.length - 2, Math.floor(scaled));
  const f = scaled - i;
  const a = anchors[i]!;
  const b = anchors[i + 1]!;
  out[offset] = a[0] + (b[0] - a[0]) * f;
  out[offset + 1] = a[1] + (b[1] - a[1]) * f;
  out[offset + 2] = a[2] + (b[2] - a[2]) * f;
}

/** Levels in a lookup table: as many as the published 8-bit tables, finer than a legend can show. */
export const TABLE_SIZE = 256;

/**
 * The map sampled at `size` evenly spaced points (RGB triples), so a contour of a large mesh
 * colours each node with one table read instead of an interpolation.
 */
export function colormapTable(name: ColormapName, size = TABLE_SIZE): Float32Array {
  const table = new Float32Array(3 * size);
  for (let k = 0; k < size; k++) sampleInto(name, k / (size - 1), table, 3 * k);
  return table;
}

export function cssColor(name: ColormapName, t: number): string {
  const rgb = [0, 0, 0];
  sampleInto(name, t, rgb);
  return `rgb(${rgb.map((c) => Math.round(c * 255)).join(', ')})`;
}

/** CSS gradient of the map, for the legend bar (bottom = low). */
export function cssGradient(name: ColormapName): string {
  const stops = Array.from({ length: 11 }, (_, k) => `${cssColor(name, k / 10)} ${k * 10}%`);
  return `linear-gradient(to top, ${stops.join(', ')})`;
}
