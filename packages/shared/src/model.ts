/**
 * The Phaseloop model format: one JSON document that fe-core solves (CLI, worker) and that the web
 * app and the API validate. It is our own format; docs/model-format.md explains every field and
 * docs/model.schema.json is generated from the zod schema below.
 *
 * Units are fixed: length mm, force N, stress MPa, time s, temperature °C. Ids of nodes and
 * elements are positive integers chosen by the author (not necessarily contiguous); sets,
 * sections, materials and loads are referred to by name.
 *
 * Validation happens in two steps: the zod schema checks shapes and ranges, then
 * `checkModelReferences` checks the cross references (element → nodes, sets, section, material;
 * segment targets → loads) and reports each problem with its JSON path.
 */
import { z } from 'zod';
import { materialParamsSchema } from './materials';

export const MODEL_FORMAT = 'phaseloop-model/1' as const;

const id = z.number({ error: 'an id must be a number' }).int({ error: 'an id must be an integer' }).positive({ error: 'an id must be ≥ 1' });
const coord = z.number({ error: 'a coordinate must be a number' }).finite();
const name = z.string().min(1, { error: 'a name must not be empty' });
const positive = (what: string) => z.number({ error: `${what} must be a number` }).positive({ error: `${what} must be > 0` });

export const unitsSchema = z
  .object({
    length: z.literal('mm'),
    force: z.literal('N'),
    stress: z.literal('MPa'),
    time: z.literal('s'),
    temperature: z.literal('°C'),
  })
  .describe('Fixed unit system; present only to make files self-describing.');

export const nodeSchema = z.object({ id, x: coord, y: coord });

/**
 * Element types. 2D continuum elements list corner nodes counter-clockwise, then mid-side nodes
 * (t6: 1-2, 2-3, 3-1; q8: 1-2, 2-3, 3-4, 4-1). q4-eas and q4-bbar are Q4 with a remedy for
 * volumetric and shear locking (enhanced assumed strain, or selective B-bar dilatation).
 */
export const ELEMENT_TYPES = ['bar2', 'beam2', 't3', 'q4', 'q4-eas', 'q4-bbar', 't6', 'q8'] as const;
export const elementTypeSchema = z.enum(ELEMENT_TYPES, {
  error: `element type must be one of ${ELEMENT_TYPES.join(', ')}`,
});
export type ElementType = z.infer<typeof elementTypeSchema>;

/** Node count per element type. */
export const ELEMENT_NODE_COUNT: Record<ElementType, number> = {
  bar2: 2,
  beam2: 2,
  t3: 3,
  q4: 4,
  'q4-eas': 4,
  'q4-bbar': 4,
  t6: 6,
  q8: 8,
};

export const elementSchema = z.object({
  id,
  type: elementTypeSchema,
  nodes: z.array(id).min(2),
  section: name,
  material: name,
});

export const ANALYSIS_KINDS = ['planeStress', 'planeStrain', 'axisymmetric'] as const;

export const continuumSectionSchema = z.object({
  kind: z.literal('continuum'),
  analysis: z.enum(ANALYSIS_KINDS),
  /** Out-of-plane thickness (mm); ignored for axisymmetric (a full 2π ring is modelled). */
  thickness: positive('thickness').default(1),
});

export const barSectionSchema = z.object({
  kind: z.literal('bar'),
  area: positive('area'),
});

export const beamShapeSchema = z.discriminatedUnion('shape', [
  z.object({ shape: z.literal('rectangle'), width: positive('width'), height: positive('height') }),
  z.object({ shape: z.literal('circle'), diameter: positive('diameter') }),
  z.object({
    shape: z.literal('tube'),
    outerDiameter: positive('outerDiameter'),
    wallThickness: positive('wallThickness'),
  }),
]);

export const beamSectionSchema = z.object({
  kind: z.literal('beam'),
  theory: z.enum(['euler-bernoulli', 'timoshenko']).default('euler-bernoulli'),
  crossSection: beamShapeSchema,
  /** Layers through the depth over which the material is integrated (nonlinear materials). */
  fibres: z.number().int().min(1).max(200).default(16),
});

export const sectionSchema = z.discriminatedUnion('kind', [continuumSectionSchema, barSectionSchema, beamSectionSchema]);
export type SectionSpec = z.infer<typeof sectionSchema>;

/** An edge of an element: local edge k (1-based) runs from corner k to the next corner. */
export const edgeRefSchema = z.object({ element: id, edge: z.number().int().min(1).max(4) });

export const DOFS = ['ux', 'uy', 'rz'] as const;
export const dofSchema = z.enum(DOFS, { error: 'dof must be ux, uy or rz' });
export type DofName = z.infer<typeof dofSchema>;

export const supportSchema = z.discriminatedUnion('type', [
  z.object({
    type: z.literal('fixed'),
    set: name,
    /** Directions held at zero; all of the node's directions when omitted. */
    dofs: z.array(dofSchema).min(1).optional(),
  }),
  z.object({
    type: z.literal('symmetry'),
    set: name,
    /** Normal of the symmetry line: 'x' holds ux (and rz), 'y' holds uy (and rz). */
    normal: z.enum(['x', 'y']),
  }),
]);
export type SupportSpec = z.infer<typeof supportSchema>;

const direction = z.tuple([coord, coord]);

export const loadSchema = z.discriminatedUnion('type', [
  z.object({
    type: z.literal('displacement'),
    name,
    set: name,
    /** ux, uy in mm; rz in radians. */
    dof: dofSchema,
  }),
  z.object({
    type: z.literal('force'),
    name,
    set: name,
    /** fx, fy in N; mz in N·mm. Applied at every node of the set. */
    dof: z.enum(['fx', 'fy', 'mz']),
  }),
  z.object({
    type: z.literal('pressure'),
    name,
    edgeSet: name,
    /* Positive pressure pushes on the edge against its outward normal (MPa). */
  }),
  z.object({
    type: z.literal('traction'),
    name,
    edgeSet: name,
    /** Direction of the traction; the segment target is its magnitude (MPa). */
    direction,
  }),
]);
export type LoadSpec = z.infer<typeof loadSchema>;

/** A temperature target: one value everywhere, or a base value with values on node sets. */
export const temperatureFieldSchema = z.union([
  z.number().finite(),
  z.object({
    base: z.number().finite(),
    nodeSets: z.record(z.string(), z.number().finite()).default({}),
    nodes: z.array(z.object({ id, value: z.number().finite() })).default([]),
  }),
]);
export type TemperatureField = z.infer<typeof temperatureFieldSchema>;

export const incrementControlSchema = z
  .object({
    /** Fractions of the segment. */
    initial: z.number().gt(0).max(1).default(0.1),
    min: z.number().gt(0).max(1).default(1e-4),
    max: z.number().gt(0).max(1).default(1),
    /** Newton iterations allowed before the increment is cut back. */
    maxIterations: z.number().int().min(1).max(200).default(15),
  })
  .refine((c) => c.min <= c.initial && c.initial <= c.max, {
    error: 'increments must satisfy min ≤ initial ≤ max',
  });

export const segmentSchema = z.object({
  name,
  duration: positive('duration (s)').default(1),
  /** Load name → value reached at the end of the segment (ramped linearly from the previous value). */
  targets: z.record(z.string(), z.number().finite()).default({}),
  /** Temperature at the end of the segment (ramped linearly); unchanged when omitted. */
  temperature: temperatureFieldSchema.optional(),
  increments: incrementControlSchema.default({ initial: 0.1, min: 1e-4, max: 1, maxIterations: 15 }),
  /** Frames kept: every converged increment, or only the end of the segment. */
  frames: z.enum(['every', 'end']).default('every'),
});
export type SegmentSpec = z.infer<typeof segmentSchema>;

export const FIELD_NAMES = [
  'displacement',
  'reaction',
  'temperature',
  'stress',
  'strain',
  'vonMises',
  'principalStress',
  'principalStrain',
  'martensiteFraction',
  'eqPlasticStrain',
  'transformationStrain',
] as const;
export const fieldNameSchema = z.enum(FIELD_NAMES);
export type FieldName = z.infer<typeof fieldNameSchema>;

export const outputSchema = z.object({
  fields: z.array(fieldNameSchema).default(['displacement', 'reaction', 'stress', 'vonMises']),
  points: z.array(z.object({ name, x: coord, y: coord })).default([]),
  reactionSums: z.array(z.object({ name, set: name })).default([]),
  /** Also write integration-point values of the fields to RESULT.json (large). */
  integrationPoints: z.boolean().default(false),
});

export const solverOptionsSchema = z.object({
  /** Relative force-residual tolerance (of the reaction / external force scale). */
  forceTolerance: z.number().gt(0).max(0.1).default(1e-6),
  /** Relative displacement-correction tolerance (of the increment's displacement). */
  displacementTolerance: z.number().gt(0).max(0.1).default(1e-6),
  lineSearch: z.boolean().default(false),
});

export const modelSchema = z.object({
  format: z.literal(MODEL_FORMAT).describe('Format tag and version of this document.'),
  title: z.string().default('').describe('Free text shown in results and reports.'),
  units: unitsSchema.optional(),
  nodes: z.array(nodeSchema).min(1, { error: 'a model needs nodes' }).describe('Nodes: id and coordinates (mm); axisymmetric models use x = r ≥ 0, y = z.'),
  elements: z.array(elementSchema).min(1, { error: 'a model needs elements' }).describe('Elements: id, type, node ids, section name and material name.'),
  sections: z.record(z.string(), sectionSchema).describe('Sections by name: continuum (analysis, thickness), bar (area) or beam (cross-section, fibres).'),
  materials: z.record(z.string(), materialParamsSchema).describe('Material parameter sets by name (MPa, °C).'),
  nodeSets: z.record(z.string(), z.array(id)).default({}).describe('Named lists of node ids.'),
  edgeSets: z.record(z.string(), z.array(edgeRefSchema)).default({}).describe('Named lists of element edges (element id, local edge 1…4).'),
  supports: z.array(supportSchema).default([]).describe('Directions held at zero for the whole analysis (fixed, symmetry).'),
  loads: z.array(loadSchema).default([]).describe('Named loads whose magnitudes the segments ramp: prescribed displacement/rotation, nodal force, edge pressure, edge traction.'),
  /** Temperature at the start of the first segment. */
  initialTemperature: temperatureFieldSchema.default(20).describe('Temperature (°C) at the start of the first segment.'),
  segments: z.array(segmentSchema).min(1, { error: 'a model needs at least one segment' }).describe('The load–temperature history, solved in order.'),
  output: outputSchema.default({ fields: ['displacement', 'reaction', 'stress', 'vonMises'], points: [], reactionSums: [], integrationPoints: false }),
  solver: solverOptionsSchema.default({ forceTolerance: 1e-6, displacementTolerance: 1e-6, lineSearch: false }),
});

/** A validated model (defaults filled in). */
export type Model = z.infer<typeof modelSchema>;
/** What an author may write (defaults optional). */
export type ModelInput = z.input<typeof modelSchema>;

export interface ModelIssue {
  /** JSON path, e.g. "elements[11].nodes[2]". */
  path: string;
  message: string;
}

export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out === '' ? '(root)' : out;
}

const CONTINUUM_TYPES: readonly ElementType[] = ['t3', 'q4', 'q4-eas', 'q4-bbar', 't6', 'q8'];

export function isContinuumType(type: ElementType): boolean {
  return CONTINUUM_TYPES.includes(type);
}

/** Number of corner edges of a 2D element type (0 for bars and beams). */
export function edgeCount(type: ElementType): number {
  if (type === 't3' || type === 't6') return 3;
  if (type === 'bar2' || type === 'beam2') return 0;
  return 4;
}

/** Cross-reference checks that a schema cannot express. Returns every problem found. */
export function checkModelReferences(model: Model): ModelIssue[] {
  const issues: ModelIssue[] = [];
  const add = (path: readonly PropertyKey[], message: string) => issues.push({ path: formatPath(path), message });

  const nodeIds = new Set<number>();
  model.nodes.forEach((n, i) => {
    if (nodeIds.has(n.id)) add(['nodes', i, 'id'], `node id ${n.id} is used twice`);
    nodeIds.add(n.id);
  });
  const elementTypes = new Map<number, ElementType>();
  model.elements.forEach((e, i) => {
    if (elementTypes.has(e.id)) add(['elements', i, 'id'], `element id ${e.id} is used twice`);
    elementTypes.set(e.id, e.type);
    const want = ELEMENT_NODE_COUNT[e.type];
    if (e.nodes.length !== want) add(['elements', i, 'nodes'], `element ${e.id} (${e.type}) needs ${want} nodes, has ${e.nodes.length}`);
    e.nodes.forEach((n, k) => {
      if (!nodeIds.has(n)) add(['elements', i, 'nodes', k], `element ${e.id} refers to node ${n}, which does not exist`);
    });
    if (new Set(e.nodes).size !== e.nodes.length) add(['elements', i, 'nodes'], `element ${e.id} lists a node twice`);
    const section = model.sections[e.section];
    if (!section) add(['elements', i, 'section'], `element ${e.id} refers to section "${e.section}", which is not defined in sections`);
    else checkSectionFits(e.type, section, e.id, (m) => add(['elements', i, 'section'], m));
    if (!model.materials[e.material]) add(['elements', i, 'material'], `element ${e.id} refers to material "${e.material}", which is not defined in materials`);
  });

  for (const [setName, ids] of Object.entries(model.nodeSets)) {
    ids.forEach((n, k) => {
      if (!nodeIds.has(n)) add(['nodeSets', setName, k], `node set "${setName}" lists node ${n}, which does not exist`);
    });
  }
  for (const [setName, edges] of Object.entries(model.edgeSets)) {
    edges.forEach((ref, k) => {
      const type = elementTypes.get(ref.element);
      if (type === undefined) add(['edgeSets', setName, k, 'element'], `edge set "${setName}" refers to element ${ref.element}, which does not exist`);
      else if (ref.edge > edgeCount(type)) add(['edgeSets', setName, k, 'edge'], `element ${ref.element} (${type}) has no edge ${ref.edge}`);
    });
  }

  const needNodeSet = (path: PropertyKey[], setName: string) => {
    if (!model.nodeSets[setName]) add(path, `node set "${setName}" is not defined in nodeSets`);
  };
  model.supports.forEach((s, i) => needNodeSet(['supports', i, 'set'], s.set));
  const loadNames = new Set<string>();
  model.loads.forEach((l, i) => {
    if (loadNames.has(l.name)) add(['loads', i, 'name'], `load name "${l.name}" is used twice`);
    loadNames.add(l.name);
    if (l.type === 'displacement' || l.type === 'force') needNodeSet(['loads', i, 'set'], l.set);
    else if (!model.edgeSets[l.edgeSet]) add(['loads', i, 'edgeSet'], `edge set "${l.edgeSet}" is not defined in edgeSets`);
    if (l.type === 'traction' && Math.hypot(l.direction[0], l.direction[1]) === 0) add(['loads', i, 'direction'], 'traction direction must not be zero');
  });
  model.segments.forEach((seg, i) => {
    for (const target of Object.keys(seg.targets)) {
      if (!loadNames.has(target)) add(['segments', i, 'targets', target], `segment "${seg.name}" sets a target for load "${target}", which is not defined in loads`);
    }
    if (seg.temperature !== undefined) checkTemperature(seg.temperature, ['segments', i, 'temperature']);
  });
  checkTemperature(model.initialTemperature, ['initialTemperature']);
  model.output.reactionSums.forEach((r, i) => needNodeSet(['output', 'reactionSums', i, 'set'], r.set));

  function checkTemperature(t: TemperatureField, path: PropertyKey[]) {
    if (typeof t === 'number') return;
    for (const setName of Object.keys(t.nodeSets)) needNodeSet([...path, 'nodeSets', setName], setName);
    t.nodes.forEach((n, k) => {
      if (!nodeIds.has(n.id)) add([...path, 'nodes', k, 'id'], `temperature given for node ${n.id}, which does not exist`);
    });
  }
  return issues;
}

function checkSectionFits(type: ElementType, section: SectionSpec, elementId: number, report: (m: string) => void): void {
  const want = type === 'bar2' ? 'bar' : type === 'beam2' ? 'beam' : 'continuum';
  if (section.kind !== want) report(`element ${elementId} (${type}) needs a ${want} section, got a ${section.kind} section`);
}

export type ParseModelResult = { ok: true; model: Model } | { ok: false; issues: ModelIssue[] };

/** Schema validation then cross-reference checks; never throws on bad input. */
export function parseModel(input: unknown): ParseModelResult {
  const parsed = modelSchema.safeParse(input);
  if (!parsed.success) {
    return {
      ok: false,
      issues: parsed.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })),
    };
  }
  const issues = checkModelReferences(parsed.data);
  return issues.length > 0 ? { ok: false, issues } : { ok: true, model: parsed.data };
}

/** JSON Schema of the model format (draft 2020-12), as written to docs/model.schema.json. */
export function modelJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(modelSchema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  return { ...schema, $id: 'https://phaseloop.invalid/schemas/model.schema.json', title: 'Phaseloop model' };
}
