import { describe, expect, it } from 'vitest';
import { defaultPair, pairHistory, scalarQuantities, type ScalarQuantity } from './resultFile';

// Reference: plain bookkeeping of the RESULT.json field layout (docs/model-format.md): a node row
// holds every component of every field, and a point's stress–strain curve pairs them frame by frame.
const fields = { displacement: ['ux', 'uy'], strain: ['xx', 'yy', 'xy'], stress: ['xx', 'yy', 'xy'], vonMises: ['value'], martensiteFraction: ['value'] };
const quantities = scalarQuantities({ fields });
const byKey = (key: string): ScalarQuantity => {
  const q = quantities.find((c) => c.key === key);
  if (!q) throw new Error(`no quantity ${key}`);
  return q;
};

describe('values at a point against each other', () => {
  it('starts a stress–strain plot with the first strain and stress components', () => {
    expect(defaultPair(quantities)).toEqual({ x: 'strain:xx', y: 'stress:xx' });
    expect(defaultPair(scalarQuantities({ fields: { vonMises: ['value'], temperature: ['value'] } }))).toEqual({ x: 'vonMises', y: 'vonMises' });
  });

  it('pairs the chosen components frame by frame and leaves out frames where either is missing', () => {
    const rows = [
      { strain: [0, 0, 0], stress: [0, 0, 0] },
      { strain: [0.01, -0.004, 0], stress: [520, 0, 1] },
      undefined, // a frame not read yet
      { strain: [0.02, -0.008, 0], stress: [Number.NaN, 0, 0] },
      { strain: [0.04, -0.015, 0], stress: [560, 0, 2] },
    ];
    expect(pairHistory(rows, byKey('strain:xx'), byKey('stress:xx'))).toEqual([[0, 0], [0.01, 520], [0.04, 560]]);
    expect(pairHistory(rows, byKey('strain:yy'), byKey('stress:xy'))).toEqual([[0, 0], [-0.004, 1], [-0.008, 0], [-0.015, 2]]);
  });
});
