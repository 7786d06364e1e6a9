import { describe, expect, it } from 'vitest';
import { stentStrutParamsSchema } from '@phaseloop/shared';
import { defaultParams, formFields, issuesByField, splitDescription, type ParamsSchema } from './schemaForm';

const schema = stentStrutParamsSchema as unknown as ParamsSchema;

describe('forms from the template schemas (packages/shared templates.ts)', () => {
  it('reads units and hints from the schema descriptions', () => {
    expect(splitDescription('mm · strut width in the cut pattern')).toEqual({ unit: 'mm', hint: 'strut width in the cut pattern' });
    const fields = formFields(stentStrutParamsSchema);
    const width = fields.find((f) => f.key === 'strutWidth');
    expect(width).toMatchObject({ kind: 'number', unit: 'mm' });
    expect(fields.find((f) => f.key === 'bodyTemperature')?.unit).toBe('°C');
    expect(fields.find((f) => f.key === 'elementType')).toMatchObject({ kind: 'choice', options: ['q4-eas', 'q8'] });
    expect(fields.some((f) => f.key === 'history' || f.key === 'template')).toBe(false);
  });

  it('fills the demo defaults and accepts them', () => {
    const params = defaultParams(schema, 'stent-strut');
    expect(params.strutWidth).toBe(0.12);
    expect(issuesByField(schema, params)).toEqual({});
  });

  it('names the field of a negative width and of zero increments', () => {
    const params = defaultParams(schema, 'stent-strut') as { history: { increments: number }[] } & Record<string, unknown>;
    expect(issuesByField(schema, { ...params, strutWidth: -0.1 }).strutWidth).toBe('strutWidth must be > 0 mm');
    const history = params.history.map((s, i) => (i === 1 ? { ...s, increments: 0 } : s));
    expect(issuesByField(schema, { ...params, history })['history.1.increments']).toBe('increments must be ≥ 1');
  });
});
