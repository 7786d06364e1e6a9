/**
 * Uploaded meshes (Gmsh .msh, ASCII 2.2 and 4.1): what the API answers after an upload and what the
 * study builder reads back. The mesh itself is kept in the model format's shapes (nodes, elements,
 * named node/edge/element sets), so a study built on it is an ordinary model document.
 */
import { z } from 'zod';
import { edgeRefSchema, elementSchema, nodeSchema } from './model';

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
