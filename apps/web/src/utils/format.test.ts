import { describe, expect, it } from 'vitest';
import { formatBytes, formatDuration, humanize, modelLabel } from './format';

describe('formatBytes', () => {
  // Reference: IEC 80000-13 binary prefixes: 1 KiB = 1024 B, 1 MiB = 1024² B.
  it('uses binary prefixes', () => {
    expect(formatBytes(812)).toBe('812 B');
    expect(formatBytes(1024)).toBe('1.0 KiB');
    expect(formatBytes(1536)).toBe('1.5 KiB');
    expect(formatBytes(3 * 1024 * 1024)).toBe('3.0 MiB');
    expect(formatBytes(-1)).toBe('—');
  });
});

describe('formatDuration', () => {
  // Reference: ISO 8601 instants; 3723 s = 1 h 2 min 3 s.
  it('counts whole seconds between two instants', () => {
    expect(formatDuration('2026-01-01T00:00:00Z', '2026-01-01T01:02:03Z')).toBe('1 h 02 min');
    expect(formatDuration('2026-01-01T00:00:00Z', '2026-01-01T00:03:05Z')).toBe('3 min 05 s');
    expect(formatDuration('2026-01-01T00:00:00Z', '2026-01-01T00:00:12Z')).toBe('12 s');
    expect(formatDuration(null, '2026-01-01T00:00:12Z')).toBe('—');
  });
});

describe('names', () => {
  // Reference: the published model names product.md asks for (Lagoudas 2012; Souza–Auricchio).
  it('writes model keys as the published model names', () => {
    expect(modelLabel('lagoudas2012')).toBe('Lagoudas 2012');
    expect(modelLabel('souza-auricchio')).toBe('Souza–Auricchio');
    expect(modelLabel('something-new')).toBe('something-new');
  });

  it('turns template keys into words', () => {
    expect(humanize('stent-strut-cell')).toBe('Stent strut cell');
    expect(humanize('tensile_coupon')).toBe('Tensile coupon');
    expect(humanize(null)).toBe('—');
  });
});
