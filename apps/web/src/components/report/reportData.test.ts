import { describe, expect, it } from 'vitest';
import type { FrameMeta } from '../../utils/resultFile';
import {
  elementTypeSummary, formatNumber, historyColumns, historyTimeCurves, historyUnit, materialParamRows, peakValues, runStatisticRows,
  segmentEndRows, segmentRows, templateParamRows,
} from './reportData';

function frame(index: number, segment: number, time: number, extra: Partial<FrameMeta> = {}): FrameMeta {
  return { index, segment, segmentName: `s${segment}`, increment: index, time, history: { time, 'tip.ux': time * 2 }, ...extra };
}

describe('segmentEndRows', () => {
  it('keeps the last frame of every segment, in segment order', () => {
    const rows = segmentEndRows([frame(0, 0, 0), frame(1, 0, 0.5), frame(2, 0, 1), frame(3, 1, 1.5), frame(4, 1, 2)]);
    expect(rows.map((r) => [r.segment, r.frame, r.time])).toEqual([[0, 2, 1], [1, 4, 2]]);
    expect(rows[1]?.values['tip.ux']).toBe(4);
  });

  it('gives no rows for no frames', () => {
    expect(segmentEndRows([])).toEqual([]);
  });
});

describe('peakValues', () => {
  it('takes the largest upper bound over the frames and says where it was', () => {
    const frames = [
      frame(0, 0, 0, { ranges: { vonMises: [[0, 120]], martensiteFraction: [[0, 0]] } }),
      frame(1, 0, 1, { ranges: { vonMises: [[5, 480]], martensiteFraction: [[0, 0.7]] } }),
      frame(2, 1, 2, { ranges: { vonMises: [[0, 300]], martensiteFraction: [[0, 0.2]] } }),
    ];
    const peaks = peakValues(frames);
    expect(peaks.map((p) => [p.field, p.value, p.frame])).toEqual([['vonMises', 480, 1], ['martensiteFraction', 0.7, 1]]);
    expect(peaks[0]?.unit).toBe('MPa');
  });

  it('leaves out a field no frame has and skips frames whose range is empty', () => {
    const peaks = peakValues([frame(0, 0, 0, { ranges: { vonMises: [[null, null]] } }), frame(1, 0, 1, { ranges: { vonMises: [[1, 2]] } })]);
    expect(peaks).toHaveLength(1);
    expect(peaks[0]).toMatchObject({ field: 'vonMises', value: 2, frame: 1, time: 1 });
  });

  it('gives nothing when frames carry no ranges (whole RESULT.json)', () => {
    expect(peakValues([frame(0, 0, 0), frame(1, 0, 1, { ranges: { vonMises: [[0, 9]] } })])).toEqual([]);
  });
});

describe('historyColumns', () => {
  it('puts the curve keys first, drops time and keeps to the limit', () => {
    expect(historyColumns(['time', 'a', 'b', 'c', 'd'], ['c', 'missing'], 3)).toEqual(['c', 'a', 'b']);
  });
});

describe('historyUnit', () => {
  it('reads the unit from the key suffix and leaves unknown keys without one', () => {
    expect(historyUnit('time')).toBe('s');
    expect(historyUnit('right.Fx')).toBe('N');
    expect(historyUnit('tip.ux')).toBe('mm');
    expect(historyUnit('tip.temperature')).toBe('°C');
    expect(historyUnit('something')).toBe('');
  });
});

describe('templateParamRows', () => {
  it('lists the template parameters with the schema units', () => {
    const rows = templateParamRows('stent-strut', { template: 'stent-strut', strutWidth: 0.12, crownsPerRing: 10, openingAngle: 40 });
    expect(rows.find((r) => r.label === 'strutWidth')).toEqual({ label: 'strutWidth', value: '0.12', unit: 'mm' });
    expect(rows.find((r) => r.label === 'openingAngle')?.unit).toBe('°');
    // Counts carry no unit in a table.
    expect(rows.find((r) => r.label === 'crownsPerRing')?.unit).toBe('');
  });

  it('gives nothing for a study without a template', () => {
    expect(templateParamRows(undefined, { a: 1 })).toEqual([]);
    expect(templateParamRows('not-a-template', { a: 1 })).toEqual([]);
  });
});

describe('materialParamRows', () => {
  it('gives each parameter its unit, nested groups by dotted path, unknown keys last', () => {
    const rows = materialParamRows('linear-elastic', { model: 'linear-elastic', E: 60000, nu: 0.33, extra: 2 });
    expect(rows.find((r) => r.label === 'E')).toEqual({ label: 'E', value: '60000', unit: 'MPa' });
    expect(rows.at(-1)?.label).toBe('extra');
  });
});

describe('segmentRows', () => {
  it('describes targets, temperature and increment control', () => {
    const rows = segmentRows([
      { name: 'load', duration: 2, targets: { pull: 0.4 }, increments: { initial: 0.1, min: 0.0001, max: 1 } },
      { name: 'heat', temperature: 80 },
      { name: 'hold' },
    ]);
    expect(rows[0]).toEqual({ name: 'load', duration: 2, endValues: 'pull = 0.4', increments: 'first 0.1, min 1.000e-4, max 1 of the segment' });
    expect(rows[1]?.endValues).toBe('T = 80 °C');
    expect(rows[1]?.duration).toBe(1);
    expect(rows[2]?.endValues).toBe('unchanged');
  });

  it('reads nothing out of a missing list', () => {
    expect(segmentRows(undefined)).toEqual([]);
  });
});

describe('runStatisticRows', () => {
  it('lists the stored statistics in order with the wall time in seconds', () => {
    const rows = runStatisticRows({ iterations: 31, increments: 12, cutBacks: 1, wallSeconds: 0.82, other: 5 }, 13);
    expect(rows.map((r) => r.label)).toEqual(['Frames', 'Increments', 'Iterations', 'Cut-backs', 'Wall time']);
    expect(rows.at(-1)).toEqual({ label: 'Wall time', value: '0.82', unit: 's' });
  });

  it('still gives the frame count without statistics', () => {
    expect(runStatisticRows(undefined, 4)).toEqual([{ label: 'Frames', value: '4', unit: '' }]);
  });
});

describe('historyTimeCurves', () => {
  it('plots each history column against time with its unit', () => {
    const curves = historyTimeCurves({ time: [0, 1, 2], 'right.Fx': [0, 5, Number.NaN], 'tip.ux': [0, 0.1, 0.2] }, 1);
    expect(curves).toHaveLength(1);
    expect(curves[0]).toMatchObject({ yLabel: 'right.Fx (N)', points: [[0, 0], [1, 5]] });
  });

  it('leaves out columns that never change', () => {
    const curves = historyTimeCurves({ time: [0, 1, 2], 'tip.temperature': [37, 37, 37], 'tip.rz': [0, 0, 0], 'tip.uy': [0, -0.1, 0] });
    expect(curves.map((c) => c.title)).toEqual(['tip.uy against time']);
  });
});

describe('formatNumber and elementTypeSummary', () => {
  it('formats numbers for tables', () => {
    expect(formatNumber(412.3456)).toBe('412.3');
    expect(formatNumber(0)).toBe('0');
    expect(formatNumber(Number.NaN)).toBe('—');
    expect(formatNumber(123456)).toBe('1.235e+5');
  });

  it('counts element types', () => {
    expect(elementTypeSummary([{ type: 'q4' }, { type: 'q4' }, { type: 'bar2' }])).toBe('q4 × 2, bar2 × 1');
    expect(elementTypeSummary([])).toBe('—');
  });
});
