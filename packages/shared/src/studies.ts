/**
 * A study's definition: an fe-core model (model.ts) whose materials may be references into the
 * project's material library (`{ materialVersionId }`) instead of inline parameters. The API
 * resolves the references to the frozen parameter sets of those versions before validating and
 * queuing, and the worker solves the resolved model.
 */
import { z } from 'zod';
import { parseModel, type ModelIssue } from './model';
import type { MaterialParams } from './materials';

export const materialReferenceSchema = z.object({
  materialVersionId: z.string().uuid({ error: 'materialVersionId must be a material version id' }),
});
export type MaterialReference = z.infer<typeof materialReferenceSchema>;

export function isMaterialReference(value: unknown): value is MaterialReference {
  return materialReferenceSchema.safeParse(value).success;
}

/** Material version ids that a model's `materials` record refers to. */
export function referencedMaterialVersions(model: unknown): string[] {
  if (typeof model !== 'object' || model === null) return [];
  const materials = (model as { materials?: unknown }).materials;
  if (typeof materials !== 'object' || materials === null || Array.isArray(materials)) return [];
  const ids = Object.values(materials).filter(isMaterialReference).map((m) => m.materialVersionId);
  return [...new Set(ids)];
}

/** Copy of the model with every library reference replaced by that version's parameters. */
export function resolveMaterialReferences(model: unknown, paramsOf: (versionId: string) => MaterialParams | undefined): unknown {
  if (typeof model !== 'object' || model === null) return model;
  const source = (model as { materials?: unknown }).materials;
  if (typeof source !== 'object' || source === null || Array.isArray(source)) return model;
  const materials: Record<string, unknown> = {};
  for (const [name, value] of Object.entries(source)) {
    materials[name] = isMaterialReference(value) ? (paramsOf(value.materialVersionId) ?? value) : value;
  }
  return { ...(model as Record<string, unknown>), materials };
}

/** Size figures checked against the user's quota before a run is queued. */
export function modelSize(model: unknown): { nodes: number; elements: number } {
  const m = (typeof model === 'object' && model !== null ? model : {}) as { nodes?: unknown; elements?: unknown };
  return { nodes: Array.isArray(m.nodes) ? m.nodes.length : 0, elements: Array.isArray(m.elements) ? m.elements.length : 0 };
}

/**
 * Validates a resolved study model with fe-core's schema and cross-reference checks, with the
 * JSON paths prefixed by where the model sits in the request (e.g. "definition.model").
 */
export function validateStudyModel(resolved: unknown, prefix = 'definition.model'): ModelIssue[] {
  const parsed = parseModel(resolved);
  if (parsed.ok) return [];
  return parsed.issues.map((i) => ({ path: i.path === '(root)' ? prefix : `${prefix}.${i.path.replace(/^\[/, '[')}`.replace('.[', '['), message: i.message }));
}

/** Filters of the study list. */
export const studyListQuerySchema = z.object({
  q: z.string().max(200).optional(),
  createdBy: z.string().uuid().optional(),
  template: z.string().max(100).optional(),
  includeDeleted: z.coerce.boolean().optional(),
});
export type StudyListQuery = z.infer<typeof studyListQuerySchema>;
