/**
 * What the API itself needs from a study definition. The definition is an fe-core model
 * (`definition.model`, @phaseloop/shared model schema) whose `materials` entries may be library
 * references `{ materialVersionId }`, plus the editor's own keys (template, geometry, ...), which
 * are kept as they are. Older definitions list material assignments in `definition.materials`
 * instead; both kinds of reference are frozen into a run.
 */
import { z } from 'zod';
import { modelSize, referencedMaterialVersions, templateParamsSchema } from '@phaseloop/shared';

export const materialAssignmentSchema = z.object({
  /** Element set / region name of the template or mesh that gets this material. */
  region: z.string().min(1).default('all'),
  materialVersionId: z.string().uuid({ error: 'materialVersionId must be a material version id' }),
});

export const studyDefinitionEnvelope = z
  .looseObject({
    materials: z.array(materialAssignmentSchema).default([]),
    /** The fe-core model (validated in full by validateDefinition, where references are resolved). */
    model: z.looseObject({}).optional(),
    /** Nodes of the model, as estimated by the template or counted in the uploaded mesh. */
    estimatedNodes: z.number().int().positive().optional(),
    /** Template parameters the model was built from (the editor keeps them to rebuild the form). */
    params: z.looseObject({}).optional(),
  })
  .superRefine((d, ctx) => {
    if (d.model === undefined && d.materials.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['materials'], message: 'Assign at least one material' });
    }
    // Template parameters are checked here too, not only in the browser's form: a client that
    // posts directly must not store a negative width or zero increments beside a model.
    if (d.params !== undefined) {
      const parsed = templateParamsSchema.safeParse(d.params);
      if (!parsed.success) {
        for (const issue of parsed.error.issues) {
          ctx.addIssue({ code: 'custom', path: ['params', ...issue.path.map((k) => (typeof k === 'symbol' ? String(k) : k))], message: issue.message });
        }
      }
    }
  });

export type StudyDefinition = z.infer<typeof studyDefinitionEnvelope>;

export function materialVersionIdsOf(definition: StudyDefinition): string[] {
  return [...new Set([...definition.materials.map((m) => m.materialVersionId), ...referencedMaterialVersions(definition.model)])];
}

/** Node count checked against the user's quota: counted in the model, or the template's estimate. */
export function nodeCountOf(definition: StudyDefinition): number | undefined {
  if (definition.model !== undefined) return modelSize(definition.model).nodes;
  return definition.estimatedNodes;
}
