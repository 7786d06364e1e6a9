/**
 * Material-point driver input (DRIVER.json of `npm run material-point`): a material, the control
 * variable and a path of points. `value` is the axial strain (strain control) or the axial stress
 * in MPa (stress control) at the end of each leg; temperature (°C) varies linearly along a leg.
 * `increments` per leg defaults to 100. The point starts virgin and stress-free at the first
 * point's temperature; strain is measured from that state; a non-zero first value is reached by
 * an extra first leg (its `increments`, default 20). Leg k spans time k−1 … k in the CSV.
 */
import { z } from 'zod';
import { materialParamsSchema } from './materials';

const driverNumber = (what: string) =>
  z
    .number({ error: (iss) => (iss.input === undefined ? `${what} is required` : `${what} must be a number`) })
    .finite({ error: `${what} must be finite` });

export const materialPointPointSchema = z
  .object({
    value: driverNumber('value'),
    temperature: driverNumber('temperature (°C)').gt(-273.15, { error: 'temperature must be above −273.15 °C' }),
    increments: z
      .number({ error: 'increments must be a whole number' })
      .int({ error: 'increments must be a whole number' })
      .min(1, { error: 'increments must be ≥ 1' })
      .max(1_000_000, { error: 'increments must be ≤ 1000000' })
      .optional(),
  })
  .strict();

export const materialPointDriverSchema = z
  .object({
    material: materialParamsSchema,
    control: z.enum(['strain', 'stress'], { error: 'control must be "strain" or "stress"' }),
    path: z.array(materialPointPointSchema, { error: 'path must be a list of points' }).min(2, { error: 'path needs at least two points' }),
  })
  .strict();

export type MaterialPointDriver = z.infer<typeof materialPointDriverSchema>;

/** One readable line per problem, each starting with the field path (e.g. "material.E_A: …"). */
export function describeDriverIssues(error: z.ZodError, input: unknown): string[] {
  return error.issues.map((issue) => {
    const path = issue.path.map((p) => (typeof p === 'number' ? `[${p}]` : `.${String(p)}`)).join('').replace(/^\./, '');
    if (issue.code === 'invalid_union' && path.endsWith('model')) {
      const given = readModel(input);
      return `${path}: unknown model ${JSON.stringify(given)} (expected one of ${materialParamsSchema.options.map((o) => o.shape.model.value).join(', ')})`;
    }
    return `${path || '(root)'}: ${issue.message}`;
  });
}

function readModel(input: unknown): unknown {
  if (input && typeof input === 'object' && 'material' in input) {
    const m = (input as { material: unknown }).material;
    if (m && typeof m === 'object' && 'model' in m) return (m as { model: unknown }).model;
  }
  return undefined;
}
