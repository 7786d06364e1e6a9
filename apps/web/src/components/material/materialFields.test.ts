import { describe, expect, it } from 'vitest';
import { materialParamsSchema } from '@phaseloop/shared';
import { buildParams, errorsByField, flattenParams, MATERIAL_MODELS, materialFields } from './materialFields';

describe('materialFields', () => {
  it('lists every model of the shared schema', () => {
    expect(MATERIAL_MODELS).toEqual(['linear-elastic', 'j2-plastic', 'lagoudas2012', 'souza-auricchio']);
  });

  it('reads keys, required-ness, units and hints of a model from the schema', () => {
    const fields = materialFields('lagoudas2012');
    const byKey = Object.fromEntries(fields.map((f) => [f.key, f]));
    expect(byKey.E_A).toEqual({ key: 'E_A', unit: 'MPa', hint: 'austenite modulus', required: true, group: '' });
    expect(byKey.Ms0).toMatchObject({ unit: '°C', required: true });
    expect(byKey.C_M).toMatchObject({ unit: 'MPa/°C', required: true });
    expect(byKey.alpha_A).toMatchObject({ unit: '1/°C', required: false });
    expect(byKey.n1).toMatchObject({ unit: '–', required: false });
    expect(byKey['plasticity.sigma_y_A']).toMatchObject({ unit: 'MPa', required: true, group: 'plasticity' });
    expect(materialFields('no-such-model')).toEqual([]);
    // Superseded keys are not offered for new versions; their replacements are.
    expect(materialFields('souza-auricchio').map((f) => f.key)).toEqual(expect.arrayContaining(['tc_ratio', 'lode_shape']));
    expect(materialFields('souza-auricchio').map((f) => f.key)).not.toContain('asymmetry');
  });

  it('turns form values back into a parameter set the shared schema accepts, leaving out empty groups', () => {
    const params = { model: 'j2-plastic', E: 200_000, nu: 0.3, alpha: 0, T_ref: 20, sigma_y: 250, H_iso: 1000, H_kin: 0 };
    const values = flattenParams(params);
    expect(materialParamsSchema.parse(buildParams('j2-plastic', values))).toEqual(params);

    const lagoudas = flattenParams({ model: 'lagoudas2012', E_A: 70_000, plasticity: { sigma_y_A: 900 } });
    expect(lagoudas['plasticity.sigma_y_A']).toBe(900);
    expect(buildParams('lagoudas2012', { E_A: 70_000, 'plasticity.sigma_y_A': undefined })).toEqual({ model: 'lagoudas2012', E_A: 70_000 });
  });

  it('maps the API validation details onto form keys', () => {
    const details = [{ path: 'params.E', message: 'E (Young modulus, MPa) must be > 0' }, { path: 'params.plasticity.sigma_y_M', message: 'sigma_y_M is required' }, { path: 'notes', message: 'too long' }];
    expect(errorsByField(details)).toEqual({ E: 'E (Young modulus, MPa) must be > 0', 'plasticity.sigma_y_M': 'sigma_y_M is required', notes: 'too long' });
    expect(errorsByField(undefined)).toEqual({});
  });
});
