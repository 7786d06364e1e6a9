import { describe, expect, it } from 'vitest';
import { describeDriverIssues, materialPointDriverSchema } from './materialPoint';

const souza = { model: 'souza-auricchio', E: 50000, nu: 0.3, h: 1500, beta: 6, T0: 0, R: 55, eps_L: 0.05 };
const path = [{ value: 0, temperature: 37 }, { value: 0.05, temperature: 37, increments: 50 }];

function issues(input: unknown): string[] {
  const r = materialPointDriverSchema.safeParse(input);
  return r.success ? [] : describeDriverIssues(r.error, input);
}

describe('material-point driver schema', () => {
  it('accepts the documented driver and fills defaults', () => {
    const r = materialPointDriverSchema.parse({ material: souza, control: 'strain', path });
    expect(r.material.model).toBe('souza-auricchio');
    if (r.material.model === 'souza-auricchio') expect(r.material.alpha).toBe(0);
  });

  it('names the field of every problem', () => {
    expect(issues({ material: { ...souza, model: 'nope' }, control: 'strain', path })).toEqual([
      'material.model: unknown model "nope" (expected one of linear-elastic, j2-plastic, lagoudas2012, souza-auricchio)',
    ]);
    expect(issues({ material: { ...souza, R: undefined }, control: 'strain', path })).toEqual(['material.R: R (elastic domain radius, MPa) is required']);
    expect(issues({ material: { ...souza, beta: '6' }, control: 'strain', path })).toEqual(['material.beta: beta (MPa/°C) must be a number']);
    expect(issues({ material: souza, control: 'strain', path: [path[0], { ...path[1], increments: 2.5 }] })).toEqual(['path[1].increments: increments must be a whole number']);
    expect(issues({ material: souza, control: 'force', path })[0]).toMatch(/^control: /);
    expect(issues({ material: souza, control: 'stress', path: [path[0]] })).toEqual(['path: path needs at least two points']);
    expect(issues({ material: souza, control: 'stress', path, extra: 1 })[0]).toMatch(/^\(root\)|extra/);
  });
});
