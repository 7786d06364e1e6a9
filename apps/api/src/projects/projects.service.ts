import { Op, QueryTypes, UniqueConstraintError, type Sequelize } from 'sequelize';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import { can, type Permission, type Role } from '../auth/permissions';
import { Project, ProjectMember } from './projects.model';
import { audit } from '../audit/audit.service';
import { User } from '../users/users.model';

export interface ProjectDto {
  id: string;
  name: string;
  description: string;
  /** The caller's role; null for a site admin who is not a member. */
  role: Role | null;
  memberCount: number;
  isDemo: boolean;
}

export interface ProjectAccess {
  project: Project;
  /** Membership role, or null for a site admin who is not a member. */
  memberRole: Role | null;
  /** Role whose permissions apply: site admins act as project admins. */
  effectiveRole: Role;
}

async function memberCounts(sequelize: Sequelize, ids: string[]): Promise<Map<string, number>> {
  if (ids.length === 0) return new Map();
  const rows = await sequelize.query<{ projectId: string; n: number }>(
    `SELECT project_id AS "projectId", count(*) AS n FROM project_members WHERE project_id IN (:ids) GROUP BY project_id`,
    { replacements: { ids }, type: QueryTypes.SELECT },
  );
  return new Map(rows.map((r) => [r.projectId, Number(r.n)]));
}

export async function toProjectDto(sequelize: Sequelize, p: Project, role: Role | null): Promise<ProjectDto> {
  const counts = await memberCounts(sequelize, [p.id]);
  return { id: p.id, name: p.name, description: p.description, role, memberCount: counts.get(p.id) ?? 0, isDemo: p.isDemo };
}

/**
 * The project and the caller's role in it. Non-members get 404 (not 403) so that ids of other
 * teams' projects cannot be probed; members whose role lacks `permission` get 403.
 */
export async function requireProject(user: SessionUser, projectId: string, permission: Permission = 'project:read'): Promise<ProjectAccess> {
  const project = await Project.findByPk(projectId);
  if (!project) throw notFound('Project');
  const member = await ProjectMember.findOne({ where: { projectId, userId: user.id } });
  if (!member && !user.isAdmin) throw notFound('Project');
  const memberRole = member?.role ?? null;
  const effectiveRole: Role = user.isAdmin ? 'admin' : (memberRole as Role);
  if (!can(effectiveRole, permission)) {
    throw new HttpError(403, `Your role in this project (${effectiveRole}) does not allow this`);
  }
  return { project, memberRole, effectiveRole };
}

/** Re-labels a project 404 as the child's 404 ("Run not found"); a 403 stays a 403. */
export async function requireProjectOf(user: SessionUser, projectId: string, permission: Permission, what: string): Promise<ProjectAccess> {
  try {
    return await requireProject(user, projectId, permission);
  } catch (err) {
    if (err instanceof HttpError && err.status === 404) throw notFound(what);
    throw err;
  }
}

/** Ids of the projects the user belongs to, or 'all' for site admins. */
export async function visibleProjectIds(user: SessionUser): Promise<string[] | 'all'> {
  if (user.isAdmin) return 'all';
  const rows = await ProjectMember.findAll({ where: { userId: user.id }, attributes: ['projectId'] });
  return rows.map((r) => r.projectId);
}

export async function listProjects(sequelize: Sequelize, user: SessionUser): Promise<ProjectDto[]> {
  const memberships = await ProjectMember.findAll({ where: { userId: user.id } });
  const roleOf = new Map(memberships.map((m) => [m.projectId, m.role]));
  const where = user.isAdmin ? {} : { id: { [Op.in]: [...roleOf.keys()] } };
  const rows = await Project.findAll({ where, order: [['name', 'ASC']] });
  const counts = await memberCounts(sequelize, rows.map((p) => p.id));
  return rows.map((p) => ({
    id: p.id, name: p.name, description: p.description, role: roleOf.get(p.id) ?? null, memberCount: counts.get(p.id) ?? 0, isDemo: p.isDemo,
  }));
}

export async function createProject(sequelize: Sequelize, user: SessionUser, input: { name: string; description: string }): Promise<ProjectDto> {
  try {
    const project = await sequelize.transaction(async (transaction) => {
      const p = await Project.create({ name: input.name, description: input.description, createdBy: user.id }, { transaction });
      await ProjectMember.create({ projectId: p.id, userId: user.id, role: 'admin' }, { transaction });
      await audit(sequelize, { userId: user.id, projectId: p.id, action: 'project.create', targetType: 'project', targetId: p.id, detail: { name: p.name } }, transaction);
      return p;
    });
    return toProjectDto(sequelize, project, 'admin');
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new HttpError(409, `A project named "${input.name}" already exists`);
    throw err;
  }
}

export async function updateProject(
  sequelize: Sequelize,
  user: SessionUser,
  projectId: string,
  patch: { name?: string; description?: string },
): Promise<ProjectDto> {
  const { project, memberRole } = await requireProject(user, projectId, 'project:manage');
  try {
    await project.update(patch);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new HttpError(409, `A project named "${patch.name ?? ''}" already exists`);
    throw err;
  }
  await audit(sequelize, { userId: user.id, projectId, action: 'project.update', targetType: 'project', targetId: projectId, detail: patch });
  return toProjectDto(sequelize, project, memberRole);
}

export interface MemberDto {
  userId: string;
  name: string;
  email: string;
  role: Role;
}

export async function listMembers(projectId: string): Promise<MemberDto[]> {
  const members = await ProjectMember.findAll({ where: { projectId } });
  const users = await User.findAll({ where: { id: { [Op.in]: members.map((m) => m.userId) } }, order: [['name', 'ASC']] });
  const roleOf = new Map(members.map((m) => [m.userId, m.role]));
  return users.map((u) => ({ userId: u.id, name: u.name, email: u.email, role: roleOf.get(u.id) as Role }));
}

/** A project must keep at least one admin member, or nobody but site admins could manage it. */
async function assertKeepsAnAdmin(projectId: string, changingUserId: string, newRole: Role | null): Promise<void> {
  if (newRole === 'admin') return;
  const admins = await ProjectMember.findAll({ where: { projectId, role: 'admin' } });
  if (admins.length === 1 && admins[0]?.userId === changingUserId) {
    throw new HttpError(409, 'A project needs at least one admin; make someone else admin first');
  }
}

export async function setMemberRole(sequelize: Sequelize, actor: SessionUser, projectId: string, userId: string, role: Role): Promise<MemberDto> {
  await requireProject(actor, projectId, 'project:manage');
  const user = await User.findByPk(userId);
  if (!user) throw notFound('User');
  await assertKeepsAnAdmin(projectId, userId, role);
  const [member, created] = await ProjectMember.findOrCreate({ where: { projectId, userId }, defaults: { projectId, userId, role } });
  if (!created) await member.update({ role });
  await audit(sequelize, { userId: actor.id, projectId, action: created ? 'project.member-add' : 'project.member-role', targetType: 'user', targetId: userId, detail: { role, email: user.email } });
  return { userId, name: user.name, email: user.email, role };
}

export async function removeMember(sequelize: Sequelize, actor: SessionUser, projectId: string, userId: string): Promise<void> {
  await requireProject(actor, projectId, 'project:manage');
  const member = await ProjectMember.findOne({ where: { projectId, userId } });
  if (!member) throw notFound('Member');
  await assertKeepsAnAdmin(projectId, userId, null);
  await member.destroy();
  await audit(sequelize, { userId: actor.id, projectId, action: 'project.member-remove', targetType: 'user', targetId: userId });
}
