import { describe, expect, it } from 'vitest';
import { createRunLogBuffer } from './runLogLines';

const line = (seq: number | undefined, message: string) => ({ ...(seq === undefined ? {} : { seq }), level: 'info' as const, message, at: '2026-01-01T12:00:00.000Z' });

describe('run log buffer', () => {
  it('merges stored and live lines by seq, each line once', () => {
    const log = createRunLogBuffer();
    // A live line arrives while the stored ones are loading; the stored page repeats it.
    expect(log.add([line(2, 'cut back')])).toBe(true);
    expect(log.add([line(0, 'Model: 33 nodes'), line(1, 'first'), line(2, 'cut back')])).toBe(true);
    expect(log.add([line(1, 'first')])).toBe(false);
    expect(log.lines.map((l) => l.message)).toEqual(['Model: 33 nodes', 'first', 'cut back']);
    expect(new Set(log.lines.map((l) => l.key)).size).toBe(3);
  });

  it('keeps unstored live lines after the stored line they followed, in arrival order', () => {
    const log = createRunLogBuffer();
    log.add([line(0, 'a'), line(1, 'notice')]);
    log.add([line(undefined, 'late 1')]);
    log.add([line(undefined, 'late 2')]);
    log.add([line(2, 'next attempt')]);
    expect(log.lines.map((l) => l.message)).toEqual(['a', 'notice', 'late 1', 'late 2', 'next attempt']);
  });

  it('shows at most the newest lines when over its limit', () => {
    const log = createRunLogBuffer(3);
    log.add([0, 1, 2, 3, 4].map((s) => line(s, `l${s}`)));
    expect(log.lines.map((l) => l.message)).toEqual(['l2', 'l3', 'l4']);
  });
});
