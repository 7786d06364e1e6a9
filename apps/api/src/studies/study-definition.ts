/**
 * What the API itself needs from a study definition: the material versions it uses (to freeze them
 * into a run) and a size estimate (for the quota). The rest of the definition (template, geometry,
 * mesh, history segments, outputs) is validated by the study schema of @phaseloop/shared where one
 * exists, and always again by the worker before it solves; unknown keys are kept as they are.
 */
import { z } from 'zod';

export const materialAssignmentSchema = z.object({
  /** Element set / region name of the template or mesh that gets this material. */
  region: z.string().min(1).default('all'),
  materialVersionId: z.string().uuid({ error: 'materialVersionId must be a material version id' }),
});

export const studyDefinitionEnvelope = z.looseObject({
  materials: z.array(materialAssignmentSchema).min(1, { error: 'Assign at least one material' }),
  /** Nodes of the model, as estimated by the template or counted in the uploaded mesh. */
  estimatedNodes: z.number().int().positive().optional(),
});

export type StudyDefinition = z.infer<typeof studyDefinitionEnvelope>;

export function materialVersionIdsOf(definition: StudyDefinition): string[] {
  return [...new Set(definition.materials.map((m) => m.materialVersionId))];
}
