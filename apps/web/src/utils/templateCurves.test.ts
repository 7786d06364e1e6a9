import { describe, expect, it } from 'vitest';
import { templates } from '@phaseloop/fe-core/templates/index';
import { snapshotDefinition, templateCurves } from './templateCurves';

describe('templateCurves', () => {
  const definition = { template: 'tensile-coupon', params: { template: 'tensile-coupon' } };
  const specs = templates['tensile-coupon'].curves(definition.params);

  it('scales and offsets the history columns each curve names', () => {
    const history: Record<string, number[]> = {};
    for (const c of specs) { history[c.x.key] = [0, 2]; history[c.y.key] = [0, 3]; }
    const curves = templateCurves(definition, history);
    expect(curves).toHaveLength(specs.length);
    const spec = specs[0]!;
    expect(curves[0]?.points[1]).toEqual([2 * spec.x.scale + (spec.x.offset ?? 0), 3 * spec.y.scale + (spec.y.offset ?? 0)]);
    expect(curves[0]?.xLabel).toBe(`${spec.x.label} (${spec.x.unit})`);
  });

  it('leaves out curves whose columns the result lacks, and studies without a template', () => {
    expect(templateCurves(definition, { time: [0, 1] })).toEqual([]);
    expect(templateCurves({ model: {} }, { time: [0, 1] })).toEqual([]);
    expect(templateCurves(definition, undefined)).toEqual([]);
  });
});

describe('snapshotDefinition', () => {
  it('reads the frozen study definition and nothing else', () => {
    expect(snapshotDefinition({ study: { definition: { template: 'x' } } })).toEqual({ template: 'x' });
    expect(snapshotDefinition({ study: 'nope' })).toBeUndefined();
    expect(snapshotDefinition(undefined)).toBeUndefined();
  });
});
