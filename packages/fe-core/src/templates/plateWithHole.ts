/**
 * Plate with a central circular hole under remote tension (verification against Kirsch 1898):
 * quarter model, load along y on the top edge (`load` = remote stress in MPa), symmetry on
 * x = 0 and y = 0. Point outputs: `holeSide` at (a, 0), where σ_yy → 3σ in a wide plate, and
 * `holeTop` at (0, a), where σ_xx → −σ.
 */
import type { MaterialParams, Model, PlateWithHoleParams } from '@phaseloop/shared';
import { plateWithHoleParamsSchema } from '@phaseloop/shared';
import { quarterPlateWithHole } from '../mesh/structured';
import { blockNodes, cellsPerQuad, modelShell, parseParams, sideNodes, toModelSegments, type CurveSpec, type MeshSize } from './common';

/** Demo steel-like elastic plate: the verification is about geometry, not the alloy. */
export const PLATE_DEFAULT_MATERIAL: MaterialParams = { model: 'linear-elastic', E: 200000, nu: 0.3, alpha: 0, T_ref: 20 };

export function buildPlateWithHole(input: unknown, material: MaterialParams = PLATE_DEFAULT_MATERIAL): Model {
  const p = parseParams<PlateWithHoleParams>(plateWithHoleParamsSchema, input);
  const a = p.holeDiameter / 2;
  const mesh = quarterPlateWithHole(
    { radius: a, halfWidth: p.plateWidth / 2, halfHeight: p.plateHeight / 2, nAround: p.cellsAround, nRadial: p.cellsRadial, ratio: p.grading },
    { type: p.elementType, section: 'plate', material: 'plate' },
  );
  return modelShell({
    title: `Plate ${p.plateWidth} × ${p.plateHeight} mm with a Ø${p.holeDiameter} mm hole under remote tension (quarter model)`,
    ...mesh,
    sections: { plate: { kind: 'continuum', analysis: 'planeStress', thickness: p.thickness } },
    materials: { plate: material },
    supports: [
      { type: 'symmetry', set: 'left', normal: 'x' },
      { type: 'symmetry', set: 'bottom', normal: 'y' },
    ],
    loads: [{ type: 'traction', name: 'remoteStress', edgeSet: 'top', direction: [0, 1] }],
    initialTemperature: p.temperature,
    segments: toModelSegments(p.history, 'remoteStress', (s) => s),
    output: {
      fields: ['displacement', 'reaction', 'stress', 'vonMises', 'principalStress', 'martensiteFraction'],
      points: [
        { name: 'holeSide', x: a, y: 0 },
        { name: 'holeTop', x: 0, y: a },
      ],
      reactionSums: [{ name: 'bottom', set: 'bottom' }],
      integrationPoints: false,
    },
  });
}

export function estimatePlateWithHole(input: unknown): MeshSize {
  const p = parseParams<PlateWithHoleParams>(plateWithHoleParamsSchema, input);
  const t = p.elementType;
  const nodes = 2 * blockNodes(p.cellsAround, p.cellsRadial, t) - sideNodes(p.cellsRadial, t);
  return { nodes, elements: 2 * p.cellsAround * p.cellsRadial * cellsPerQuad(t), dofs: 2 * nodes };
}

export function plateWithHoleCurves(input: unknown): CurveSpec[] {
  const p = parseParams<PlateWithHoleParams>(plateWithHoleParamsSchema, input);
  return [
    {
      title: 'Stress at the hole vs remote stress',
      x: { key: 'bottom.Fy', scale: -1 / ((p.plateWidth / 2) * p.thickness), label: 'remote stress', unit: 'MPa' },
      y: { key: 'holeSide.syy', scale: 1, label: 'σ_yy at the hole side', unit: 'MPa' },
    },
  ];
}
