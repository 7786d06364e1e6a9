/**
 * Stent strut cell: half of a V-shaped unit of a zig-zag ring in plane stress (the cut pattern
 * unrolled; x is circumferential, y axial). The V's axis is x = 0; the crown (a circular bend of
 * inner radius `crownRadius`, centred at the origin, apex at the bottom) turns into one straight
 * strut leaning by half the opening angle.
 *
 * Boundary conditions:
 * - symmetry on the apex section x = 0 (set `apex`): the V is mirror-symmetric about its axis;
 * - the strut's end section (set `strutEnd`), where the next (inverted) crown begins, moves
 *   circumferentially as one: ux prescribed on all its nodes, so it cannot rotate. By the
 *   ring's point symmetry about the strut's middle, that end carries the same moment as the
 *   crown end, and the strut bends in an S with its inflection at mid-length; the next crown's
 *   own compliance is left out. uy is held at the end's middle node only (set `anchor`), so the
 *   cell can shorten axially.
 * `load` = ring diameter (mm): the strut end travels π(D − D_expanded)/(2N) for N V units.
 * Small rotations: crimping far below the expanded diameter rotates the strut by large angles,
 * which this small-strain model does not follow.
 */
import type { MaterialParams, Model, StentStrutParams } from '@phaseloop/shared';
import { stentStrutParamsSchema, strutEndTravel } from '@phaseloop/shared';
import { arc, meshBlocks, straight, type Block, type MeshPart } from '../mesh/structured';
import { blockNodes, deg, DEMO_SUPERELASTIC, modelShell, parseParams, sideNodes, SMA_FIELDS, toModelSegments, type CurveSpec, type MeshSize } from './common';

const MATERIAL = 'niti';

interface StrutGeometry {
  /** Half opening angle (rad). */
  alpha: number;
  /** Crown centreline radius. */
  rc: number;
  /** Unit vectors along the strut and across it (outwards from the crown centre). */
  along: [number, number];
  across: [number, number];
  /** Strut start (centreline) and end (centreline). */
  start: [number, number];
  end: [number, number];
}

function geometry(p: StentStrutParams): StrutGeometry {
  const alpha = deg(p.openingAngle / 2);
  const rc = p.crownRadius + p.strutWidth / 2;
  const along: [number, number] = [Math.sin(alpha), Math.cos(alpha)];
  const across: [number, number] = [Math.cos(alpha), -Math.sin(alpha)];
  const start: [number, number] = [rc * across[0], rc * across[1]];
  const end: [number, number] = [start[0] + p.strutLength * along[0], start[1] + p.strutLength * along[1]];
  return { alpha, rc, along, across, start, end };
}

function strutMesh(p: StentStrutParams): MeshPart {
  const g = geometry(p);
  const ri = p.crownRadius;
  const ro = p.crownRadius + p.strutWidth;
  const edge = (base: [number, number], r: number): [number, number] => [base[0] + (r - g.rc) * g.across[0], base[1] + (r - g.rc) * g.across[1]];
  const crown: Block = {
    bottom: arc([0, 0], ri, -Math.PI / 2, -g.alpha),
    top: arc([0, 0], ro, -Math.PI / 2, -g.alpha),
    left: straight([0, -ri], [0, -ro]),
    right: straight(edge(g.start, ri), edge(g.start, ro)),
    nx: p.cellsAroundCrown,
    ny: p.cellsAcross,
    sides: { left: ['apex'] },
  };
  const strut: Block = {
    bottom: straight(edge(g.start, ri), edge(g.end, ri)),
    top: straight(edge(g.start, ro), edge(g.end, ro)),
    left: straight(edge(g.start, ri), edge(g.start, ro)),
    right: straight(edge(g.end, ri), edge(g.end, ro)),
    nx: p.cellsAlongStrut,
    ny: p.cellsAcross,
    sides: { right: ['strutEnd'], bottom: ['innerEdge'], top: ['outerEdge'] },
  };
  const part = meshBlocks([crown, strut], { type: p.elementType, section: 'strut', material: MATERIAL });
  part.nodeSets.anchor = [nearestInSet(part, part.nodeSets.strutEnd, g.end)];
  return part;
}

function nearestInSet(part: MeshPart, ids: readonly number[], at: readonly [number, number]): number {
  let best = ids[0];
  let bestD = Infinity;
  for (const id of ids) {
    const n = part.nodes[id - 1];
    const d = Math.hypot(n.x - at[0], n.y - at[1]);
    if (d < bestD) [best, bestD] = [id, d];
  }
  return best;
}

export function buildStentStrut(input: unknown, material: MaterialParams = DEMO_SUPERELASTIC): Model {
  const p = parseParams<StentStrutParams>(stentStrutParamsSchema, input);
  const g = geometry(p);
  const mesh = strutMesh(p);
  return modelShell({
    title: `Stent strut cell: ${p.strutWidth} × ${p.thickness} mm strut, ${p.strutLength} mm long, ${p.openingAngle}° opening, ${p.crownsPerRing} crowns, Ø${p.expandedDiameter} mm expanded`,
    ...mesh,
    sections: { strut: { kind: 'continuum', analysis: 'planeStress', thickness: p.thickness } },
    materials: { [MATERIAL]: material },
    supports: [
      { type: 'symmetry', set: 'apex', normal: 'x' },
      { type: 'fixed', set: 'anchor', dofs: ['uy'] },
    ],
    loads: [{ type: 'displacement', name: 'ringDiameter', set: 'strutEnd', dof: 'ux' }],
    initialTemperature: p.crimpTemperature,
    segments: toModelSegments(p.history, 'ringDiameter', (d) => strutEndTravel(p, d)),
    output: {
      fields: [...SMA_FIELDS, 'principalStrain'],
      points: [
        { name: 'crownInner', x: 0, y: -p.crownRadius },
        { name: 'crownOuter', x: 0, y: -(p.crownRadius + p.strutWidth) },
        { name: 'strutTip', x: g.end[0], y: g.end[1] },
      ],
      reactionSums: [
        { name: 'strutEnd', set: 'strutEnd' },
        { name: 'apex', set: 'apex' },
      ],
      integrationPoints: false,
    },
  });
}

export function estimateStentStrut(input: unknown): MeshSize {
  const p = parseParams<StentStrutParams>(stentStrutParamsSchema, input);
  const t = p.elementType;
  const nodes = blockNodes(p.cellsAroundCrown, p.cellsAcross, t) + blockNodes(p.cellsAlongStrut, p.cellsAcross, t) - sideNodes(p.cellsAcross, t);
  return { nodes, elements: (p.cellsAroundCrown + p.cellsAlongStrut) * p.cellsAcross, dofs: 2 * nodes };
}

export function stentStrutCurves(input: unknown): CurveSpec[] {
  const p = parseParams<StentStrutParams>(stentStrutParamsSchema, input);
  const perTravel = (2 * p.crownsPerRing) / Math.PI;
  return [
    {
      title: 'Ring radial force–diameter (lumped ring estimate)',
      x: { key: 'strutTip.ux', scale: perTravel, offset: p.expandedDiameter, label: 'ring diameter', unit: 'mm' },
      // Hoop force T of the ring = the strut end's circumferential force; outward radial force 2πT.
      y: { key: 'strutEnd.Fx', scale: -2 * Math.PI, label: 'radial force of one ring (outward +)', unit: 'N' },
    },
    {
      title: 'Crown martensite fraction–diameter',
      x: { key: 'strutTip.ux', scale: perTravel, offset: p.expandedDiameter, label: 'ring diameter', unit: 'mm' },
      y: { key: 'crownInner.xi', scale: 1, label: 'martensite fraction at the crown', unit: '–' },
    },
  ];
}
