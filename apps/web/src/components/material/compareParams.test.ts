import { describe, expect, it } from 'vitest';
import { compareParams, countDifferences } from './compareParams';

const lagoudas = {
  model: 'lagoudas2012', E_A: 70_000, E_M: 30_000, nu: 0.33, alpha_A: 0, alpha_M: 0, T_ref: 20,
  Ms0: 18, Mf0: 5, As0: 22, Af0: 35, C_M: 7, C_A: 7, sigma_star: 100, H_min: 0.04, H_sat: 0.04, k_t: 0, n1: 1, n2: 1, n3: 1, n4: 1,
};

describe('compareParams', () => {
  it('marks exactly the parameters whose values differ, with their units, in schema order', () => {
    const rows = compareParams(lagoudas, { ...lagoudas, Af0: 38 });
    expect(rows.map((r) => r.key).slice(0, 4)).toEqual(['model', 'E_A', 'E_M', 'nu']);
    expect(rows.filter((r) => r.differs)).toEqual([{ key: 'Af0', unit: '°C', a: 35, b: 38, differs: true }]);
    expect(rows.find((r) => r.key === 'C_M')).toMatchObject({ unit: 'MPa/°C', differs: false });
    expect(countDifferences(rows)).toBe(1);
  });

  it('shows a parameter only one side has (nested groups too) as a difference', () => {
    const rows = compareParams(lagoudas, { ...lagoudas, plasticity: { sigma_y_A: 900, sigma_y_M: 700, H_iso: 0 } });
    const nested = rows.filter((r) => r.key.startsWith('plasticity.'));
    expect(nested.map((r) => [r.key, r.a, r.b, r.differs])).toEqual([
      ['plasticity.sigma_y_A', undefined, 900, true],
      ['plasticity.sigma_y_M', undefined, 700, true],
      ['plasticity.H_iso', undefined, 0, true],
    ]);
  });

  it('compares versions of two different models parameter by parameter', () => {
    const rows = compareParams({ model: 'linear-elastic', E: 60_000, nu: 0.3, alpha: 0, T_ref: 20 }, lagoudas);
    expect(rows[0]).toEqual({ key: 'model', unit: '', a: 'linear-elastic', b: 'lagoudas2012', differs: true });
    expect(rows.find((r) => r.key === 'nu')).toMatchObject({ a: 0.3, b: 0.33, differs: true });
    expect(rows.find((r) => r.key === 'E')).toMatchObject({ a: 60_000, b: undefined, differs: true });
    expect(rows.find((r) => r.key === 'T_ref')).toMatchObject({ differs: false });
  });
});
