import { describe, expect, it } from 'vitest';
import { colormapTable, sampleInto } from './colormap';

const hex = (rgb: number[]) => '#' + rgb.map((c) => Math.round(c * 255).toString(16).padStart(2, '0')).join('');

describe('colour maps', () => {
  it('viridis ends at the published end colours #440154 and #fde725', () => {
    // Reference: the viridis map of van der Walt & Smith (matplotlib, 2015): first entry #440154, last #fde725.
    const low = [0, 0, 0];
    const high = [0, 0, 0];
    sampleInto('viridis', 0, low);
    sampleInto('viridis', 1, high);
    expect(hex(low)).toBe('#440154');
    expect(hex(high)).toBe('#fde725');
  });

  it('viridis lightness rises monotonically (perceptually ordered, so higher values read lighter)', () => {
    // Relative luminance per ITU-R BT.709 coefficients on the sRGB components.
    let previous = -1;
    for (let k = 0; k <= 50; k++) {
      const c = [0, 0, 0];
      sampleInto('viridis', k / 50, c);
      const y = 0.2126 * c[0]! + 0.7152 * c[1]! + 0.0722 * c[2]!;
      expect(y).toBeGreaterThan(previous);
      previous = y;
    }
  });

  it('clamps values outside [0, 1] and NaN to the ends', () => {
    const a = [0, 0, 0];
    const b = [0, 0, 0];
    sampleInto('cividis', -3, a);
    sampleInto('cividis', 0, b);
    expect(a).toEqual(b);
    sampleInto('cividis', Number.NaN, a);
    expect(a).toEqual(b);
  });

  it('the lookup table holds the map at evenly spaced points, ends included', () => {
    const table = colormapTable('viridis', 5);
    expect(table.length).toBe(15);
    for (const [k, t] of [[0, 0], [2, 0.5], [4, 1]] as const) {
      const rgb = [0, 0, 0];
      sampleInto('viridis', t, rgb);
      expect(Array.from(table.subarray(3 * k, 3 * k + 3))).toEqual(rgb.map((c) => Math.fround(c)));
    }
  });
});
