/**
 * Wire bending with fibre beams (beam2, circular section integrated over `fibres` layers):
 * - three-point: simply supported over `span` (pin at x = 0, roller at x = span), the middle
 *   node pushed down by `load` mm;
 * - cantilever: clamped at x = 0, the tip (x = span) pushed down by `load` mm.
 * Displacement control, so the response stays stable on the transformation plateau.
 * Small rotations: keep deflections a small fraction of the span.
 */
import type { MaterialParams, Model, WireBendingParams } from '@phaseloop/shared';
import { wireBendingParamsSchema } from '@phaseloop/shared';
import { line } from '../mesh/structured';
import { DEMO_SUPERELASTIC, modelShell, parseParams, SMA_FIELDS, toModelSegments, type CurveSpec, type MeshSize } from './common';

const MATERIAL = 'niti';

/** Three-point bending needs a node at mid-span: an odd element count is raised by one. */
function elementCount(p: WireBendingParams): number {
  return p.layout === 'three-point' ? p.beamElements + (p.beamElements % 2) : p.beamElements;
}

export function buildWireBending(input: unknown, material: MaterialParams = DEMO_SUPERELASTIC): Model {
  const p = parseParams<WireBendingParams>(wireBendingParamsSchema, input);
  const n = elementCount(p);
  const mesh = line({ from: [0, 0], to: [p.span, 0], n }, { type: 'beam2', section: 'wire', material: MATERIAL });
  const threePoint = p.layout === 'three-point';
  const loadNode = threePoint ? n / 2 + 1 : n + 1;
  const nodeSets: Record<string, number[]> = { ...mesh.nodeSets, loadPoint: [loadNode] };
  const supports: Model['supports'] = threePoint
    ? [
        { type: 'fixed', set: 'start', dofs: ['ux', 'uy'] },
        { type: 'fixed', set: 'end', dofs: ['uy'] },
      ]
    : [{ type: 'fixed', set: 'start' }];
  const loadX = threePoint ? p.span / 2 : p.span;
  return modelShell({
    title: `Wire Ø${p.diameter} mm, ${threePoint ? 'three-point bending over' : 'cantilever of'} ${p.span} mm, at ${p.testTemperature} °C`,
    ...mesh,
    nodeSets,
    sections: { wire: { kind: 'beam', theory: p.theory, crossSection: { shape: 'circle', diameter: p.diameter }, fibres: p.fibres } },
    materials: { [MATERIAL]: material },
    supports,
    loads: [{ type: 'displacement', name: 'deflection', set: 'loadPoint', dof: 'uy' }],
    initialTemperature: p.testTemperature,
    segments: toModelSegments(p.history, 'deflection', (d) => -d),
    output: {
      fields: SMA_FIELDS,
      points: [{ name: 'loadPoint', x: loadX, y: 0 }],
      reactionSums: [
        { name: 'load', set: 'loadPoint' },
        { name: 'support', set: 'start' },
      ],
      integrationPoints: false,
    },
  });
}

export function estimateWireBending(input: unknown): MeshSize {
  const p = parseParams<WireBendingParams>(wireBendingParamsSchema, input);
  const n = elementCount(p);
  return { nodes: n + 1, elements: n, dofs: 3 * (n + 1) };
}

export function wireBendingCurves(): CurveSpec[] {
  return [
    {
      title: 'Force–deflection',
      x: { key: 'loadPoint.uy', scale: -1, label: 'deflection', unit: 'mm' },
      y: { key: 'load.Fy', scale: -1, label: 'force', unit: 'N' },
    },
  ];
}
