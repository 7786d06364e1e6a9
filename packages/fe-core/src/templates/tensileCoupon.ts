/**
 * Tensile coupon under a displacement-controlled load/unload (ASTM F2516-like sequence).
 *
 * - wire / tube: one straight bar of bar2 elements along x, held at x = 0, pulled at x = L.
 *   `load` = strain over the bar (%), so the end displacement is load/100 · L.
 * - strip: a flat dogbone in plane stress, quarter model (symmetry on the mid-length section
 *   x = 0 and on the centreline y = 0): gauge, circular fillet tangent to the gauge edge, grip.
 *   The grip end face is pulled; `load` = nominal strain (%) over the effective length
 *   (half gauge + fillet), i.e. end displacement = load/100 · (gaugeLength/2 + fillet length).
 *   The extensometer (point output at x = gaugeLength/4 on the centreline) gives the actual
 *   gauge strain; with a quarter model the coupon force is twice the grip reaction.
 */
import type { MaterialParams, Model, TensileCouponParams } from '@phaseloop/shared';
import { tensileCouponParamsSchema } from '@phaseloop/shared';
import { arc, line, meshBlocks, straight, type Block, type MeshPart } from '../mesh/structured';
import { blockNodes, circleArea, DEMO_SUPERELASTIC, modelShell, parseParams, sideNodes, SMA_FIELDS, toModelSegments, type CurveSpec, type MeshSize } from './common';

const MATERIAL = 'niti';

interface StripLayout {
  halfGauge: number;
  filletLength: number;
  halfGaugeWidth: number;
  halfGripWidth: number;
  end: number;
  cells: { gauge: number; fillet: number; grip: number; across: number };
}

/** Fillet: arc of radius R tangent to the gauge edge, rising by (gripWidth − gaugeWidth)/2. */
function stripLayout(p: TensileCouponParams): StripLayout {
  const halfGauge = p.gaugeLength / 2;
  const rise = (p.gripWidth - p.gaugeWidth) / 2;
  const filletLength = Math.sqrt(p.filletRadius ** 2 - (p.filletRadius - rise) ** 2);
  const h = p.gaugeWidth / 2 / p.cellsAcross;
  const hGrip = p.gripWidth / 2 / p.cellsAcross;
  return {
    halfGauge,
    filletLength,
    halfGaugeWidth: p.gaugeWidth / 2,
    halfGripWidth: p.gripWidth / 2,
    end: halfGauge + filletLength + p.gripLength,
    cells: {
      gauge: Math.max(1, Math.round(halfGauge / h)),
      fillet: Math.max(2, Math.round(filletLength / h)),
      grip: Math.max(1, Math.round(p.gripLength / hGrip)),
      across: p.cellsAcross,
    },
  };
}

function stripMesh(p: TensileCouponParams): MeshPart {
  const s = stripLayout(p);
  const x1 = s.halfGauge;
  const x2 = x1 + s.filletLength;
  const wg = s.halfGaugeWidth;
  const wr = s.halfGripWidth;
  const R = p.filletRadius;
  const sweep = Math.asin(Math.min(1, s.filletLength / R));
  const rect = (xa: number, xb: number, ya: number, yb: number, nx: number, sides: Block['sides']): Block => ({
    bottom: straight([xa, 0], [xb, 0]),
    top: straight([xa, ya], [xb, yb]),
    left: straight([xa, 0], [xa, ya]),
    right: straight([xb, 0], [xb, yb]),
    nx,
    ny: s.cells.across,
    sides,
  });
  const gauge = rect(0, x1, wg, wg, s.cells.gauge, { left: ['midSection'], bottom: ['centreline'] });
  const fillet: Block = {
    ...rect(x1, x2, wg, wr, s.cells.fillet, { bottom: ['centreline'] }),
    top: arc([x1, wg + R], R, -Math.PI / 2, -Math.PI / 2 + sweep),
  };
  const grip = rect(x2, s.end, wr, wr, s.cells.grip, { right: ['grip'], bottom: ['centreline'] });
  return meshBlocks([gauge, fillet, grip], { type: p.elementType, section: 'strip', material: MATERIAL });
}

export function buildTensileCoupon(input: unknown, material: MaterialParams = DEMO_SUPERELASTIC): Model {
  const p = parseParams<TensileCouponParams>(tensileCouponParamsSchema, input);
  return p.form === 'strip' ? buildStrip(p, material) : buildBar(p, material);
}

function buildBar(p: TensileCouponParams, material: MaterialParams): Model {
  const L = p.gaugeLength;
  const mesh = line({ from: [0, 0], to: [L, 0], n: p.barElements }, { type: 'bar2', section: p.form, material: MATERIAL });
  const area = circleArea(p.diameter, p.form === 'tube' ? p.wallThickness : undefined);
  return modelShell({
    title: `Tensile coupon: NiTi ${p.form}, Ø${p.diameter} mm, ${L} mm long, at ${p.testTemperature} °C`,
    ...mesh,
    nodeSets: { ...mesh.nodeSets, fixedEnd: mesh.nodeSets.start, pulledEnd: mesh.nodeSets.end },
    sections: { [p.form]: { kind: 'bar', area } },
    materials: { [MATERIAL]: material },
    supports: [
      { type: 'fixed', set: 'fixedEnd' },
      { type: 'fixed', set: 'all', dofs: ['uy'] },
    ],
    loads: [{ type: 'displacement', name: 'stretch', set: 'pulledEnd', dof: 'ux' }],
    initialTemperature: p.testTemperature,
    segments: toModelSegments(p.history, 'stretch', (strain) => (strain / 100) * L),
    output: {
      fields: SMA_FIELDS,
      points: [{ name: 'extensometer', x: L, y: 0 }],
      reactionSums: [{ name: 'pull', set: 'pulledEnd' }],
      integrationPoints: false,
    },
  });
}

function buildStrip(p: TensileCouponParams, material: MaterialParams): Model {
  const s = stripLayout(p);
  const mesh = stripMesh(p);
  return modelShell({
    title: `Tensile coupon: NiTi strip dogbone ${p.gaugeWidth} × ${p.thickness} mm, gauge ${p.gaugeLength} mm, at ${p.testTemperature} °C (quarter model)`,
    ...mesh,
    sections: { strip: { kind: 'continuum', analysis: 'planeStress', thickness: p.thickness } },
    materials: { [MATERIAL]: material },
    supports: [
      { type: 'symmetry', set: 'midSection', normal: 'x' },
      { type: 'symmetry', set: 'centreline', normal: 'y' },
    ],
    loads: [{ type: 'displacement', name: 'stretch', set: 'grip', dof: 'ux' }],
    initialTemperature: p.testTemperature,
    segments: toModelSegments(p.history, 'stretch', (strain) => (strain / 100) * (s.halfGauge + s.filletLength)),
    output: {
      fields: SMA_FIELDS,
      points: [
        { name: 'extensometer', x: s.halfGauge / 2, y: 0 },
        { name: 'gauge', x: 0, y: 0 },
        { name: 'gripEnd', x: s.end, y: 0 },
      ],
      reactionSums: [{ name: 'grip', set: 'grip' }],
      integrationPoints: false,
    },
  });
}

export function estimateTensileCoupon(input: unknown): MeshSize {
  const p = parseParams<TensileCouponParams>(tensileCouponParamsSchema, input);
  if (p.form !== 'strip') return { nodes: p.barElements + 1, elements: p.barElements, dofs: 2 * (p.barElements + 1) };
  const c = stripLayout(p).cells;
  const nodes = blockNodes(c.gauge, c.across, p.elementType) + blockNodes(c.fillet, c.across, p.elementType) + blockNodes(c.grip, c.across, p.elementType) - 2 * sideNodes(c.across, p.elementType);
  return { nodes, elements: (c.gauge + c.fillet + c.grip) * c.across, dofs: 2 * nodes };
}

export function tensileCouponCurves(input: unknown): CurveSpec[] {
  const p = parseParams<TensileCouponParams>(tensileCouponParamsSchema, input);
  if (p.form !== 'strip') {
    const area = circleArea(p.diameter, p.form === 'tube' ? p.wallThickness : undefined);
    return [
      {
        title: 'Stress–strain',
        x: { key: 'extensometer.ux', scale: 100 / p.gaugeLength, label: 'strain', unit: '%' },
        y: { key: 'pull.Fx', scale: 1 / area, label: 'engineering stress', unit: 'MPa' },
      },
      {
        title: 'Force–displacement',
        x: { key: 'extensometer.ux', scale: 1, label: 'displacement', unit: 'mm' },
        y: { key: 'pull.Fx', scale: 1, label: 'force', unit: 'N' },
      },
    ];
  }
  const s = stripLayout(p);
  return [
    {
      title: 'Stress–strain (extensometer)',
      x: { key: 'extensometer.ux', scale: 100 / (s.halfGauge / 2), label: 'gauge strain', unit: '%' },
      y: { key: 'grip.Fx', scale: 2 / (p.gaugeWidth * p.thickness), label: 'engineering stress', unit: 'MPa' },
    },
    {
      title: 'Force–displacement',
      x: { key: 'gripEnd.ux', scale: 2, label: 'grip separation change', unit: 'mm' },
      y: { key: 'grip.Fx', scale: 2, label: 'force', unit: 'N' },
    },
  ];
}
