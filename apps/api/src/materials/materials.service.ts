import { UniqueConstraintError, type Sequelize } from 'sequelize';
import type { MaterialParams } from '@phaseloop/shared';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import { requireProject, requireProjectOf } from '../projects/projects.service';
import type { Permission } from '../auth/permissions';
import { audit } from '../audit/audit.service';
import { User } from '../users/users.model';
import { Material, MaterialVersion, type MaterialVersionStatus } from './materials.model';

export interface MaterialVersionDto {
  id: string;
  materialId: string;
  version: number;
  status: MaterialVersionStatus;
  params: MaterialParams;
  provenance: Record<string, unknown>;
  notes: string;
  createdAt: string;
  createdBy: string | null;
  /** Author's display name; null when the author's account is gone. */
  createdByName: string | null;
  reviewedBy: string | null;
  reviewedByName: string | null;
  reviewedAt: string | null;
  reviewReason: string;
}

export interface MaterialDto {
  id: string;
  projectId: string;
  name: string;
  description: string;
  latest: MaterialVersionDto | null;
}

/** Display names of the given user ids, read in one query (authors and reviewers of a list). */
export async function userNames(ids: readonly (string | null | undefined)[]): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((id): id is string => typeof id === 'string'))];
  if (wanted.length === 0) return new Map();
  const users = await User.findAll({ where: { id: wanted }, attributes: ['id', 'name'] });
  return new Map(users.map((u) => [u.id, u.name]));
}

export function toVersionDto(v: MaterialVersion, names: ReadonlyMap<string, string> = new Map()): MaterialVersionDto {
  return {
    id: v.id, materialId: v.materialId, version: v.version, status: v.status, params: v.params, provenance: v.provenance,
    notes: v.notes, createdAt: v.createdAt.toISOString(),
    createdBy: v.createdBy ?? null, createdByName: (v.createdBy && names.get(v.createdBy)) ?? null,
    reviewedBy: v.reviewedBy ?? null, reviewedByName: (v.reviewedBy && names.get(v.reviewedBy)) ?? null,
    reviewedAt: v.reviewedAt ? v.reviewedAt.toISOString() : null, reviewReason: v.reviewReason,
  };
}

/** A version with its author's and reviewer's names filled in. */
export async function versionWithNames(v: MaterialVersion): Promise<MaterialVersionDto> {
  return toVersionDto(v, await userNames([v.createdBy, v.reviewedBy]));
}

async function latestVersion(materialId: string): Promise<MaterialVersion | null> {
  return MaterialVersion.findOne({ where: { materialId }, order: [['version', 'DESC']] });
}

function toMaterialDto(m: Material, latest: MaterialVersion | null, names: ReadonlyMap<string, string> = new Map()): MaterialDto {
  return { id: m.id, projectId: m.projectId, name: m.name, description: m.description, latest: latest ? toVersionDto(latest, names) : null };
}

export async function requireMaterial(user: SessionUser, id: string, permission: Permission = 'project:read'): Promise<Material> {
  const m = await Material.findByPk(id);
  if (!m) throw notFound('Material');
  await requireProjectOf(user, m.projectId, permission, 'Material');
  return m;
}

export async function requireMaterialVersion(
  user: SessionUser,
  id: string,
  permission: Permission = 'project:read',
): Promise<{ version: MaterialVersion; material: Material; role: string }> {
  const version = await MaterialVersion.findByPk(id);
  const material = version ? await Material.findByPk(version.materialId) : null;
  if (!version || !material) throw notFound('Material version');
  const access = await requireProjectOf(user, material.projectId, permission, 'Material version');
  return { version, material, role: access.effectiveRole };
}

export interface MaterialSummaryDto {
  id: string;
  name: string;
  /** Latest version's number, id, status and model. */
  version: number;
  latestVersionId: string | null;
  status: MaterialVersionStatus;
  model: string;
  isDemo: boolean;
  updatedAt: string;
  /** Who last changed the material: the latest version's reviewer once reviewed, else its author. */
  updatedByName: string | null;
}

/** Newest version of each material, in one query instead of one per material. */
async function latestVersions(materialIds: string[]): Promise<Map<string, MaterialVersion>> {
  if (materialIds.length === 0) return new Map();
  const rows = await MaterialVersion.findAll({ where: { materialId: materialIds }, order: [['materialId', 'ASC'], ['version', 'DESC']] });
  const latest = new Map<string, MaterialVersion>();
  for (const v of rows) if (!latest.has(v.materialId)) latest.set(v.materialId, v);
  return latest;
}

export async function listMaterialSummaries(user: SessionUser, projectId: string): Promise<MaterialSummaryDto[]> {
  await requireProject(user, projectId);
  const materials = await Material.findAll({ where: { projectId }, order: [['name', 'ASC']] });
  const latest = await latestVersions(materials.map((m) => m.id));
  const names = await userNames([...latest.values()].flatMap((v) => [v.createdBy, v.reviewedBy]));
  return materials.map((m) => {
    const v = latest.get(m.id) ?? null;
    const updated = v && v.updatedAt > m.updatedAt ? v.updatedAt : m.updatedAt;
    const actor = v ? (v.reviewedBy ?? v.createdBy) : m.createdBy;
    return {
      id: m.id, name: m.name, version: v?.version ?? 0, latestVersionId: v?.id ?? null, status: v?.status ?? 'draft', model: v?.params.model ?? '',
      isDemo: m.isDemo, updatedAt: updated.toISOString(), updatedByName: (actor && names.get(actor)) ?? null,
    };
  });
}

export async function listMaterials(user: SessionUser, projectId: string): Promise<MaterialDto[]> {
  await requireProject(user, projectId);
  const materials = await Material.findAll({ where: { projectId }, order: [['name', 'ASC']] });
  return Promise.all(materials.map(async (m) => toMaterialDto(m, await latestVersion(m.id))));
}

export async function createMaterial(
  sequelize: Sequelize,
  user: SessionUser,
  projectId: string,
  input: { name: string; description: string; params: MaterialParams; provenance: Record<string, unknown>; notes: string },
): Promise<MaterialDto> {
  await requireProject(user, projectId, 'material:write');
  try {
    return await sequelize.transaction(async (transaction) => {
      const m = await Material.create({ projectId, name: input.name, description: input.description, createdBy: user.id }, { transaction });
      const v = await MaterialVersion.create(
        { materialId: m.id, version: 1, params: input.params, provenance: input.provenance, notes: input.notes, createdBy: user.id },
        { transaction },
      );
      await audit(sequelize, { userId: user.id, projectId, action: 'material.create', targetType: 'material', targetId: m.id, detail: { name: m.name } }, transaction);
      return toMaterialDto(m, v);
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new HttpError(409, `This project already has a material named "${input.name}"`);
    throw err;
  }
}

export async function getMaterial(user: SessionUser, id: string): Promise<MaterialDto & { versions: MaterialVersionDto[] }> {
  const m = await requireMaterial(user, id);
  const versions = await MaterialVersion.findAll({ where: { materialId: id }, order: [['version', 'DESC']] });
  const names = await userNames(versions.flatMap((v) => [v.createdBy, v.reviewedBy]));
  return { ...toMaterialDto(m, versions[0] ?? null, names), versions: versions.map((v) => toVersionDto(v, names)) };
}

/** New draft version after the latest one; approved versions are never edited in place. */
export async function addVersion(
  sequelize: Sequelize,
  user: SessionUser,
  materialId: string,
  input: { params: MaterialParams; provenance: Record<string, unknown>; notes: string },
): Promise<MaterialVersionDto> {
  const m = await requireMaterial(user, materialId, 'material:write');
  const v = await sequelize.transaction(async (transaction) => {
    // Lock the material row so two simultaneous saves cannot take the same number.
    await Material.findByPk(materialId, { transaction, lock: transaction.LOCK.UPDATE });
    const last = await MaterialVersion.max<number, MaterialVersion>('version', { where: { materialId }, transaction });
    const created = await MaterialVersion.create({ materialId, version: (last ?? 0) + 1, ...input, createdBy: user.id }, { transaction });
    await audit(sequelize, { userId: user.id, projectId: m.projectId, action: 'material.version-add', targetType: 'material-version', targetId: created.id, detail: { version: created.version } }, transaction);
    return created;
  });
  return versionWithNames(v);
}

export async function updateDraft(
  sequelize: Sequelize,
  user: SessionUser,
  versionId: string,
  patch: { params?: MaterialParams; provenance?: Record<string, unknown>; notes?: string },
): Promise<MaterialVersionDto> {
  const { version, material } = await requireMaterialVersion(user, versionId, 'material:write');
  if (version.status !== 'draft') throw new HttpError(409, `Version ${version.version} is ${version.status}; save a new version instead`);
  await version.update(patch);
  await audit(sequelize, { userId: user.id, projectId: material.projectId, action: 'material.version-edit', targetType: 'material-version', targetId: version.id });
  return versionWithNames(version);
}

export async function reviewVersion(
  sequelize: Sequelize,
  user: SessionUser,
  versionId: string,
  decision: 'approve' | 'reject',
  reason: string,
): Promise<MaterialVersionDto> {
  const { version, material, role } = await requireMaterialVersion(user, versionId, 'material:review');
  if (version.status !== 'draft') throw new HttpError(409, `Version ${version.version} has already been ${version.status}`);
  if (decision === 'reject' && !reason.trim()) {
    throw new HttpError(422, 'Say why the version is rejected', 'validation_failed', [{ path: 'reason', message: 'reason is required when rejecting: say what to change' }]);
  }
  // Four eyes: the author of a version does not approve it, unless they administer the project.
  if (version.createdBy === user.id && role !== 'admin') {
    throw new HttpError(403, 'A version is reviewed by someone other than its author');
  }
  await version.update({ status: decision === 'approve' ? 'approved' : 'rejected', reviewedBy: user.id, reviewedAt: new Date(), reviewReason: reason });
  await audit(sequelize, { userId: user.id, projectId: material.projectId, action: `material.${decision}`, targetType: 'material-version', targetId: version.id, detail: { reason } });
  return versionWithNames(version);
}
