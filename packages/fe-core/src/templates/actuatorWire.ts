/**
 * Actuator wire: a NiTi wire (bar2 elements along x, held at x = 0) carries a hanging weight at
 * x = L while its temperature is cycled. `load` = the weight (N).
 *
 * Optional bias spring: one linear-elastic bar from the wire end to a fixed anchor further along
 * x, so it resists the wire's extension with the given stiffness (EA/L of the spring bar). Its
 * preload — the force it exerts on the wire when the wire has not moved — is added to the weight
 * force, since a linear spring's force is preload − k·u.
 */
import type { ActuatorWireParams, MaterialParams, Model } from '@phaseloop/shared';
import { actuatorWireParamsSchema } from '@phaseloop/shared';
import { line } from '../mesh/structured';
import { circleArea, DEMO_ACTUATOR, modelShell, parseParams, SMA_FIELDS, toModelSegments, type CurveSpec, type MeshSize } from './common';

const MATERIAL = 'niti';
/** Spring bar: unit area, length equal to the wire's; E chosen to give the stiffness. */
const SPRING_AREA = 1;

export function buildActuatorWire(input: unknown, material: MaterialParams = DEMO_ACTUATOR): Model {
  const p = parseParams<ActuatorWireParams>(actuatorWireParamsSchema, input);
  const L = p.length;
  const mesh = line({ from: [0, 0], to: [L, 0], n: p.barElements }, { type: 'bar2', section: 'wire', material: MATERIAL });
  const endNode = mesh.nodeSets.end[0];
  const nodeSets: Record<string, number[]> = { ...mesh.nodeSets, support: mesh.nodeSets.start, wireEnd: [endNode] };
  const sections: Model['sections'] = { wire: { kind: 'bar', area: circleArea(p.diameter) } };
  const materials: Model['materials'] = { [MATERIAL]: material };
  if (p.biasSpring) {
    const anchor = mesh.nodes.length + 1;
    mesh.nodes.push({ id: anchor, x: 2 * L, y: 0 });
    mesh.elements.push({ id: mesh.elements.length + 1, type: 'bar2', nodes: [endNode, anchor], section: 'spring', material: 'spring' });
    nodeSets.springAnchor = [anchor];
    nodeSets.all = [...nodeSets.all, anchor];
    sections.spring = { kind: 'bar', area: SPRING_AREA };
    materials.spring = { model: 'linear-elastic', E: (p.springStiffness * L) / SPRING_AREA, nu: 0.3, alpha: 0, T_ref: 20 };
  }
  const preload = p.biasSpring ? p.springPreload : 0;
  return modelShell({
    title: `Actuator wire Ø${p.diameter} mm × ${L} mm, ${p.weight} N weight${p.biasSpring ? `, bias spring ${p.springStiffness} N/mm` : ''}, ${p.lowTemperature}–${p.highTemperature} °C`,
    nodes: mesh.nodes,
    elements: mesh.elements,
    nodeSets,
    edgeSets: {},
    sections,
    materials,
    supports: [
      { type: 'fixed', set: 'support' },
      { type: 'fixed', set: 'all', dofs: ['uy'] },
      ...(p.biasSpring ? [{ type: 'fixed' as const, set: 'springAnchor' }] : []),
    ],
    loads: [{ type: 'force', name: 'weight', set: 'wireEnd', dof: 'fx' }],
    initialTemperature: p.highTemperature,
    segments: toModelSegments(p.history, 'weight', (w) => w + preload),
    output: {
      fields: SMA_FIELDS,
      points: [{ name: 'stroke', x: L, y: 0 }],
      reactionSums: [{ name: 'support', set: 'support' }],
      integrationPoints: false,
    },
  });
}

export function estimateActuatorWire(input: unknown): MeshSize {
  const p = parseParams<ActuatorWireParams>(actuatorWireParamsSchema, input);
  const extra = p.biasSpring ? 1 : 0;
  const nodes = p.barElements + 1 + extra;
  return { nodes, elements: p.barElements + extra, dofs: 2 * nodes };
}

export function actuatorWireCurves(input: unknown): CurveSpec[] {
  const p = parseParams<ActuatorWireParams>(actuatorWireParamsSchema, input);
  return [
    {
      title: 'Stroke–temperature',
      x: { key: 'stroke.temperature', scale: 1, label: 'temperature', unit: '°C' },
      y: { key: 'stroke.ux', scale: 1, label: 'stroke', unit: 'mm' },
    },
    {
      title: 'Strain–temperature',
      x: { key: 'stroke.temperature', scale: 1, label: 'temperature', unit: '°C' },
      y: { key: 'stroke.ux', scale: 100 / p.length, label: 'wire strain', unit: '%' },
    },
    {
      title: 'Wire force–temperature',
      x: { key: 'stroke.temperature', scale: 1, label: 'temperature', unit: '°C' },
      y: { key: 'support.Fx', scale: -1, label: 'wire force', unit: 'N' },
    },
  ];
}
