/**
 * Template parameter schemas: defaults form a complete parameter set, every number carries its
 * unit for the generated forms, bounds name the field, and the union converts to JSON Schema
 * (what a form generator reads).
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { templateParamsSchema, TEMPLATE_NAMES, strutEndTravel, tensileCouponParamsSchema, stentStrutParamsSchema } from './templates';

describe('template parameter schemas', () => {
  it('fill every field from demo defaults', () => {
    for (const template of TEMPLATE_NAMES) {
      const p = templateParamsSchema.parse({ template });
      expect(p.template).toBe(template);
      expect(p.history.length).toBeGreaterThan(0);
      for (const [key, value] of Object.entries(p)) expect(value, `${template}.${key}`).not.toBeUndefined();
    }
  });

  it('describe a unit on every numeric field', () => {
    for (const schema of templateParamsSchema.options) {
      for (const [key, field] of Object.entries(schema.shape)) {
        if (key === 'template') continue;
        expect(field.description, `${key} has no unit description`).toMatch(/^(mm|°C|N|N\/mm|%|°|count|choice|yes\/no|ratio|segments) · /);
      }
    }
  });

  it('refuse nonsense with the field named', () => {
    const issues = (input: unknown) => {
      const r = templateParamsSchema.safeParse(input);
      expect(r.success).toBe(false);
      return r.success ? [] : r.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
    };
    expect(issues({ template: 'tensile-coupon', gaugeWidth: -1 })).toEqual([{ path: 'gaugeWidth', message: 'gaugeWidth must be > 0 mm' }]);
    expect(issues({ template: 'wire-bending', beamElements: 2.5 })).toEqual([{ path: 'beamElements', message: 'beamElements must be a whole number' }]);
    expect(issues({ template: 'plate-with-hole', history: [{ name: 'pull', load: 10, increments: 0 }] })).toEqual([{ path: 'history.0.increments', message: 'increments must be ≥ 1' }]);
    expect(issues({ template: 'stent-strut', bodyTemperature: -300 })[0].path).toBe('bodyTemperature');
    expect(issues({ template: 'stent-strut', vesselDiameter: 9 })[0]).toEqual({ path: 'vesselDiameter', message: 'vesselDiameter must lie between crimpedDiameter and expandedDiameter' });
  });

  it('strut end travel is the ring circumference change shared by 2N struts', () => {
    const p = stentStrutParamsSchema.parse({ template: 'stent-strut', expandedDiameter: 8, crownsPerRing: 10 });
    // Circumference πD; 2N struts share its change equally.
    expect(strutEndTravel(p, 7)).toBeCloseTo(-Math.PI / 20, 14);
  });

  it('convert to JSON Schema with units and defaults for form generation', () => {
    const json = z.toJSONSchema(templateParamsSchema, { io: 'input', unrepresentable: 'any' }) as { oneOf?: { properties: Record<string, { description?: string; default?: unknown }> }[] };
    expect(json.oneOf).toHaveLength(TEMPLATE_NAMES.length);
    const coupon = json.oneOf![0].properties;
    expect(coupon.gaugeLength).toMatchObject({ default: 25 });
    expect(coupon.gaugeLength.description).toMatch(/^mm · /);
    expect(tensileCouponParamsSchema.shape.testTemperature.description).toMatch(/^°C · /);
  });
});
