import { Op, type Sequelize } from 'sequelize';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import { requireProject, requireProjectOf } from '../projects/projects.service';
import type { Permission } from '../auth/permissions';
import { audit } from '../audit/audit.service';
import { Material, MaterialVersion } from '../materials/materials.model';
import { Study } from './studies.model';
import { User } from '../users/users.model';
import { materialVersionIdsOf, type StudyDefinition } from './study-definition';
import { meshStudySettingsSchema, resolveMaterialReferences, validateStudyModel, type StudyListQuery } from '@phaseloop/shared';
import { Mesh } from '../meshes/meshes.model';

export interface StudyDto {
  id: string;
  projectId: string;
  name: string;
  description: string;
  definition: StudyDefinition;
  revision: number;
  createdAt: string;
  updatedAt: string;
}

export function toStudyDto(s: Study): StudyDto {
  return {
    id: s.id, projectId: s.projectId, name: s.name, description: s.description, definition: s.definition,
    revision: s.revision, createdAt: s.createdAt.toISOString(), updatedAt: s.updatedAt.toISOString(),
  };
}

export async function requireStudy(user: SessionUser, id: string, permission: Permission = 'project:read'): Promise<Study> {
  const s = await Study.findByPk(id);
  if (!s || s.deletedAt) throw notFound('Study');
  await requireProjectOf(user, s.projectId, permission, 'Study');
  return s;
}

/** Every referenced material version must exist and belong to the study's project. */
export async function checkMaterialsBelong(projectId: string, definition: StudyDefinition): Promise<MaterialVersion[]> {
  const ids = materialVersionIdsOf(definition);
  const versions = await MaterialVersion.findAll({ where: { id: { [Op.in]: ids } } });
  const materials = await Material.findAll({ where: { id: { [Op.in]: versions.map((v) => v.materialId) }, projectId } });
  const ok = new Set(materials.map((m) => m.id));
  const missing = ids.filter((id) => !versions.some((v) => v.id === id && ok.has(v.materialId)));
  if (missing.length) {
    throw new HttpError(422, `Material version(s) not found in this project: ${missing.join(', ')}`, 'validation_failed', missing.map((id) => ({ path: referencePath(definition, id), message: `unknown material version ${id}` })));
  }
  return versions.filter((v) => ok.has(v.materialId));
}

/**
 * A study on an uploaded mesh keeps the builder's settings in `definition.mesh`. The model beside
 * them is checked in full anyway, but the settings are what the editor reopens, so a client that
 * posts directly must not store zero increments there, or a mesh of another project.
 */
async function checkMeshSettings(projectId: string, settings: unknown): Promise<void> {
  if (settings === undefined) return;
  const parsed = meshStudySettingsSchema.safeParse(settings);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => ({ path: ['definition', 'mesh', ...i.path.map(String)].join('.'), message: i.message }));
    throw new HttpError(422, `The mesh settings are not valid: ${issues.slice(0, 5).map((i) => `${i.path}: ${i.message}`).join('; ')}`, 'validation_failed', issues);
  }
  const mesh = await Mesh.findOne({ where: { id: parsed.data.meshId, projectId } });
  if (!mesh) {
    throw new HttpError(422, `Mesh ${parsed.data.meshId} is not in this project`, 'validation_failed', [{ path: 'definition.mesh.meshId', message: `unknown mesh ${parsed.data.meshId}` }]);
  }
}

/** JSON path of the first place a definition refers to a material version. */
function referencePath(definition: StudyDefinition, versionId: string): string {
  const index = definition.materials.findIndex((m) => m.materialVersionId === versionId);
  if (index >= 0) return `definition.materials[${index}].materialVersionId`;
  const materials = (definition.model as { materials?: Record<string, unknown> } | undefined)?.materials ?? {};
  const name = Object.entries(materials).find(([, v]) => (v as { materialVersionId?: unknown } | null)?.materialVersionId === versionId)?.[0];
  return name === undefined ? 'definition.materials' : `definition.model.materials.${name}.materialVersionId`;
}

/**
 * Everything checked before a study is saved or queued: material references (in this project),
 * then the model with references resolved against fe-core's schema and cross-reference checks.
 * Problems come back as 422 with one `{ path, message }` per problem, paths from the request root.
 */
export async function validateDefinition(projectId: string, definition: StudyDefinition): Promise<MaterialVersion[]> {
  await checkMeshSettings(projectId, (definition as { mesh?: unknown }).mesh);
  const versions = await checkMaterialsBelong(projectId, definition);
  if (definition.model !== undefined) {
    const params = new Map(versions.map((v) => [v.id, v.params]));
    const issues = validateStudyModel(resolveMaterialReferences(definition.model, (id) => params.get(id)));
    if (issues.length > 0) {
      const shown = issues.slice(0, 5).map((i) => `${i.path}: ${i.message}`).join('; ');
      throw new HttpError(422, `The model is not valid: ${shown}${issues.length > 5 ? ` (and ${issues.length - 5} more)` : ''}`, 'validation_failed', issues);
    }
  }
  return versions;
}

export interface StudySummaryDto {
  id: string;
  name: string;
  /** Template name, or "mesh" for an uploaded mesh. */
  template: string;
  description: string;
  isDemo: boolean;
  updatedAt: string;
  createdBy: { id: string; name: string } | null;
}

export async function listStudySummaries(user: SessionUser, projectId: string, filters: StudyListQuery = {}): Promise<StudySummaryDto[]> {
  await requireProject(user, projectId);
  const where: Record<string | symbol, unknown> = { projectId };
  if (!filters.includeDeleted) where.deletedAt = null;
  if (filters.createdBy) where.createdBy = filters.createdBy;
  if (filters.q) where[Op.or] = [{ name: { [Op.iLike]: `%${filters.q}%` } }, { description: { [Op.iLike]: `%${filters.q}%` } }];
  if (filters.template) where.definition = { template: filters.template };
  const studies = await Study.findAll({ where, order: [['updatedAt', 'DESC']] });
  const authors = await User.findAll({ where: { id: { [Op.in]: studies.map((s) => s.createdBy).filter((id): id is string => id !== null) } } });
  const nameOf = new Map(authors.map((u) => [u.id, u.name]));
  return studies.map((s) => {
    const def = s.definition as { template?: unknown; mesh?: unknown };
    const template = typeof def.template === 'string' ? def.template : def.mesh ? 'mesh' : '';
    return {
      id: s.id, name: s.name, template, description: s.description, isDemo: s.isDemo, updatedAt: s.updatedAt.toISOString(),
      createdBy: s.createdBy ? { id: s.createdBy, name: nameOf.get(s.createdBy) ?? '' } : null,
    };
  });
}

export async function createStudy(
  sequelize: Sequelize,
  user: SessionUser,
  projectId: string,
  input: { name: string; description: string; definition: StudyDefinition },
): Promise<StudyDto> {
  await requireProject(user, projectId, 'study:write');
  await validateDefinition(projectId, input.definition);
  const s = await Study.create({ projectId, ...input, createdBy: user.id });
  await audit(sequelize, { userId: user.id, projectId, action: 'study.create', targetType: 'study', targetId: s.id, detail: { name: s.name } });
  return toStudyDto(s);
}

export async function updateStudy(
  sequelize: Sequelize,
  user: SessionUser,
  id: string,
  patch: { name?: string; description?: string; definition?: StudyDefinition; revision: number },
): Promise<StudyDto> {
  const s = await requireStudy(user, id, 'study:write');
  // Optimistic concurrency: two analysts editing the same study must not silently overwrite.
  if (patch.revision !== s.revision) {
    throw new HttpError(409, `The study was changed by someone else (revision ${s.revision}); reload it first`, 'conflict');
  }
  if (patch.definition) await validateDefinition(s.projectId, patch.definition);
  const { revision: _r, ...fields } = patch;
  await s.update({ ...fields, revision: s.revision + 1 });
  await audit(sequelize, { userId: user.id, projectId: s.projectId, action: 'study.update', targetType: 'study', targetId: s.id, detail: { revision: s.revision } });
  return toStudyDto(s);
}

/** A copy of the study (same definition, revision 1) named "<name> (copy)" or as asked. */
export async function duplicateStudy(sequelize: Sequelize, user: SessionUser, id: string, name?: string): Promise<StudyDto> {
  const source = await requireStudy(user, id, 'study:write');
  let copyName = name ?? `${source.name} (copy)`;
  for (let n = 2; !name && (await Study.count({ where: { projectId: source.projectId, name: copyName, deletedAt: null } })) > 0; n++) {
    copyName = `${source.name} (copy ${n})`;
  }
  const copy = await Study.create({ projectId: source.projectId, name: copyName, description: source.description, definition: source.definition, createdBy: user.id });
  await audit(sequelize, { userId: user.id, projectId: source.projectId, action: 'study.duplicate', targetType: 'study', targetId: copy.id, detail: { from: source.id } });
  return toStudyDto(copy);
}

/** Soft delete: the study leaves lists and cannot be run; its runs and their snapshots stay. */
export async function deleteStudy(sequelize: Sequelize, user: SessionUser, id: string): Promise<void> {
  const s = await requireStudy(user, id, 'study:write');
  await s.update({ deletedAt: new Date(), deletedBy: user.id });
  await audit(sequelize, { userId: user.id, projectId: s.projectId, action: 'study.delete', targetType: 'study', targetId: s.id, detail: { name: s.name } });
}
