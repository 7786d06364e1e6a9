/**
 * Uploaded meshes (Gmsh .msh, ASCII 2.2 and 4.1): what the API answers after an upload and what the
 * study builder reads back. The mesh itself is kept in the model format's shapes (nodes, elements,
 * named node/edge/element sets), so a study built on it is an ordinary model document.
 */
import { z } from 'zod';
import { edgeRefSchema, elementSchema, MODEL_FORMAT, nodeSchema } from './model';

/** Largest .msh file the API accepts (bytes). Shared so the upload form can say it before sending. */
export const MAX_MESH_BYTES = 20 * 1024 * 1024;

/**
 * The kind of a physical group, from the sets it produced: surface groups hold elements (and give
 * them their material region), curve groups hold element edges, point groups only nodes.
 */
export const MESH_GROUP_KINDS = ['surface', 'curve', 'point'] as const;
export type MeshGroupKind = (typeof MESH_GROUP_KINDS)[number];

export const meshGroupSchema = z.object({
  name: z.string(),
  kind: z.enum(MESH_GROUP_KINDS),
  nodes: z.number().int().nonnegative(),
  edges: z.number().int().nonnegative(),
  elements: z.number().int().nonnegative(),
});
export type MeshGroup = z.infer<typeof meshGroupSchema>;

export const meshBoundsSchema = z.object({ minX: z.number(), maxX: z.number(), minY: z.number(), maxY: z.number() });

export const meshSummarySchema = z.object({
  id: z.string(),
  projectId: z.string(),
  name: z.string(),
  fileName: z.string(),
  /** Gmsh format version of the uploaded file. */
  format: z.enum(['2.2', '4.1']),
  /** Bytes of the uploaded file. */
  size: z.number().int().nonnegative(),
  nodeCount: z.number().int().nonnegative(),
  elementCount: z.number().int().nonnegative(),
  /** Model element type → count (t3, q4, t6, q8). */
  elementTypes: z.record(z.string(), z.number().int()),
  bounds: meshBoundsSchema,
  groups: z.array(meshGroupSchema),
  /** Changes made on import that the analyst should know of (dropped nodes, converted elements). */
  warnings: z.array(z.string()),
  uploadedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  createdAt: z.string(),
});
export type MeshSummary = z.infer<typeof meshSummarySchema>;

/** The imported mesh in model-format shapes; elements carry their surface group as section and material. */
export const meshPartSchema = z.object({
  nodes: z.array(nodeSchema),
  elements: z.array(elementSchema),
  nodeSets: z.record(z.string(), z.array(z.number().int())),
  edgeSets: z.record(z.string(), z.array(edgeRefSchema)),
  elementSets: z.record(z.string(), z.array(z.number().int())),
});
export type MeshPartData = z.infer<typeof meshPartSchema>;

export const meshDetailSchema = meshSummarySchema.extend({ mesh: meshPartSchema });
export type MeshDetail = z.infer<typeof meshDetailSchema>;

/** Kind of every physical group of an imported mesh, and how many nodes, edges and elements it holds. */
export function meshGroups(mesh: Pick<MeshPartData, 'nodeSets' | 'edgeSets' | 'elementSets'>): MeshGroup[] {
  const names = new Set([...Object.keys(mesh.nodeSets), ...Object.keys(mesh.edgeSets), ...Object.keys(mesh.elementSets)]);
  return [...names].sort().map((name) => {
    const elements = mesh.elementSets[name]?.length ?? 0;
    const edges = mesh.edgeSets[name]?.length ?? 0;
    const kind: MeshGroupKind = elements > 0 ? 'surface' : edges > 0 ? 'curve' : 'point';
    return { name, kind, nodes: mesh.nodeSets[name]?.length ?? 0, edges, elements };
  });
}

// ---------------------------------------------------------------------------------------------
// A study on an uploaded mesh: the builder's settings and the model document built from them.

/** What a boundary condition does to the nodes of a physical group. */
export const MESH_CONDITION_KINDS = ['fixed-x', 'fixed-y', 'fixed-xy', 'displacement-x', 'displacement-y', 'force-x', 'force-y'] as const;
export type MeshConditionKind = (typeof MESH_CONDITION_KINDS)[number];

/** Conditions whose magnitude follows the history's load factor (value × factor). */
export function isDrivenCondition(kind: MeshConditionKind): boolean {
  return kind.startsWith('displacement') || kind.startsWith('force');
}

export const meshConditionSchema = z.object({
  group: z.string({ error: 'group must be text' }).min(1, { error: 'choose a group' }),
  kind: z.enum(MESH_CONDITION_KINDS, { error: `kind must be one of ${MESH_CONDITION_KINDS.join(', ')}` }),
  /** mm for a displacement, N per node for a force, at load factor 1; unused for fixed directions. */
  value: z.number({ error: 'value must be a number' }).finite({ error: 'value must be finite' }).default(0),
});
export type MeshCondition = z.infer<typeof meshConditionSchema>;

const factorSegment = z.object({
  name: z.string({ error: 'segment name must be text' }).min(1, { error: 'segment name must not be empty' }),
  duration: z.number({ error: 'duration must be a number' }).finite().positive({ error: 'duration must be > 0 s' }).default(1),
  /** Load factor at the end of the segment; omitted = unchanged. */
  load: z.number({ error: 'load must be a number' }).finite({ error: 'load must be finite' }).optional(),
  temperature: z.number({ error: 'temperature must be a number' }).min(-273.15, { error: 'temperature must be above absolute zero (−273.15 °C)' }).optional(),
  increments: z
    .number({ error: 'increments must be a number' })
    .int({ error: 'increments must be a whole number' })
    .min(1, { error: 'increments must be ≥ 1' })
    .max(5000, { error: 'increments must be ≤ 5000' })
    .default(20),
});

export const meshStudySettingsSchema = z.object({
  meshId: z.string().uuid({ error: 'meshId must be a mesh id' }),
  analysis: z.enum(['planeStress', 'planeStrain', 'axisymmetric'], { error: 'analysis must be planeStress, planeStrain or axisymmetric' }).default('planeStress'),
  /** Out-of-plane thickness (mm) for plane stress and plane strain. */
  thickness: z.number({ error: 'thickness must be a number' }).finite().positive({ error: 'thickness must be > 0 mm' }).default(1),
  /** Formulation given to 4-node quadrilaterals (other element types keep theirs). */
  quadType: z.enum(['q4', 'q4-eas', 'q4-bbar'], { error: 'quadType must be q4, q4-eas or q4-bbar' }).default('q4-eas'),
  /** Material region (surface group, or "default") → library material id. */
  regionMaterials: z.record(z.string(), z.string().min(1, { error: 'choose a material' })),
  conditions: z.array(meshConditionSchema).min(1, { error: 'add at least one boundary condition' }),
  initialTemperature: z.number({ error: 'initialTemperature must be a number' }).min(-273.15, { error: 'initialTemperature must be above absolute zero (−273.15 °C)' }).default(20),
  history: z.array(factorSegment).min(1, { error: 'history needs at least one segment' }).max(2000, { error: 'history must have ≤ 2000 segments' }),
});
export type MeshStudySettings = z.infer<typeof meshStudySettingsSchema>;
export type MeshStudySettingsInput = z.input<typeof meshStudySettingsSchema>;

/** Material regions of a mesh: the names its elements carry (surface groups, "default" outside them). */
export function meshRegions(mesh: Pick<MeshPartData, 'elements'>): string[] {
  return [...new Set(mesh.elements.map((e) => e.material))].sort();
}

/** Problems between the settings and the mesh that the schema cannot see, keyed like schema issues. */
export function meshSettingsIssues(mesh: MeshPartData, settings: MeshStudySettings): Record<string, string> {
  const issues: Record<string, string> = {};
  for (const region of meshRegions(mesh)) {
    if (!settings.regionMaterials[region]) issues[`regionMaterials.${region}`] = `choose a material for region "${region}"`;
  }
  settings.conditions.forEach((c, i) => {
    if (!mesh.nodeSets[c.group]) issues[`conditions.${i}.group`] = `group "${c.group}" is not in the mesh`;
  });
  if (settings.analysis === 'axisymmetric') {
    const minX = Math.min(...mesh.nodes.map((n) => n.x));
    // A small negative round-off on the axis is still on the axis.
    if (minX < -1e-9) issues.analysis = `axisymmetric models need x = r ≥ 0 at every node; the mesh reaches x = ${minX}`;
  }
  return issues;
}

/** Fraction of a segment the driver may cut an increment back to (as the templates do). */
const CUT_BACK_DEPTH = 256;

const CONDITION_DOF = { x: { displacement: 'ux', force: 'fx' }, y: { displacement: 'uy', force: 'fy' } } as const;

/**
 * The model document of a study on an uploaded mesh. `materials` maps each region to what the
 * model's materials record holds for it (inline parameters, or a library reference). Supports and
 * loads act on the node sets of the physical groups; driven loads reach value × load factor.
 */
export function buildMeshModel<M>(mesh: MeshPartData, settings: MeshStudySettings, materials: Record<string, M>, title = '') {
  const elements = mesh.elements.map((e) => ({ ...e, type: e.type === 'q4' ? settings.quadType : e.type }));
  const regions = meshRegions(mesh);
  const section = { kind: 'continuum' as const, analysis: settings.analysis, thickness: settings.thickness };
  const supports: { type: 'fixed'; set: string; dofs: ('ux' | 'uy')[] }[] = [];
  const loads: ({ type: 'displacement'; name: string; set: string; dof: 'ux' | 'uy' } | { type: 'force'; name: string; set: string; dof: 'fx' | 'fy' })[] = [];
  const scales: Record<string, number> = {};
  settings.conditions.forEach((c, i) => {
    if (c.kind === 'fixed-x' || c.kind === 'fixed-y' || c.kind === 'fixed-xy') {
      supports.push({ type: 'fixed', set: c.group, dofs: c.kind === 'fixed-x' ? ['ux'] : c.kind === 'fixed-y' ? ['uy'] : ['ux', 'uy'] });
      return;
    }
    const [what, axis] = c.kind.split('-') as ['displacement' | 'force', 'x' | 'y'];
    const name = `${c.kind} ${c.group} ${i + 1}`;
    if (what === 'displacement') loads.push({ type: 'displacement', name, set: c.group, dof: CONDITION_DOF[axis].displacement });
    else loads.push({ type: 'force', name, set: c.group, dof: CONDITION_DOF[axis].force });
    scales[name] = c.value;
  });
  const segments = settings.history.map((s) => {
    const step = 1 / s.increments;
    const targets: Record<string, number> = {};
    if (s.load !== undefined) for (const [name, scale] of Object.entries(scales)) targets[name] = scale * s.load;
    return {
      name: s.name, duration: s.duration, targets,
      ...(s.temperature === undefined ? {} : { temperature: s.temperature }),
      increments: { initial: step, min: step / CUT_BACK_DEPTH, max: step, maxIterations: 20 },
      frames: 'every' as const,
    };
  });
  return {
    format: MODEL_FORMAT,
    title,
    units: { length: 'mm', force: 'N', stress: 'MPa', time: 's', temperature: '°C' } as const,
    nodes: mesh.nodes,
    elements,
    sections: Object.fromEntries(regions.map((r) => [r, section])),
    materials: Object.fromEntries(regions.map((r) => [r, materials[r]])) as Record<string, M>,
    nodeSets: mesh.nodeSets,
    edgeSets: mesh.edgeSets,
    supports,
    loads,
    initialTemperature: settings.initialTemperature,
    segments,
    output: {
      fields: ['displacement', 'reaction', 'temperature', 'stress', 'strain', 'vonMises', 'martensiteFraction'] as ('displacement' | 'reaction' | 'temperature' | 'stress' | 'strain' | 'vonMises' | 'martensiteFraction')[],
      points: [],
      reactionSums: settings.conditions.filter((c) => c.kind !== 'force-x' && c.kind !== 'force-y').map((c) => c.group).filter((g, i, all) => all.indexOf(g) === i).map((g) => ({ name: g, set: g })),
      integrationPoints: false,
    },
  };
}
