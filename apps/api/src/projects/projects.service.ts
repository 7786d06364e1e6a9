import { Op, UniqueConstraintError, type Sequelize } from 'sequelize';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import { Project, ProjectMember } from './projects.model';
import { audit } from '../audit/audit.service';
import { User } from '../users/users.model';

export interface ProjectDto {
  id: string;
  name: string;
  description: string;
  createdAt: string;
}

export function toProjectDto(p: Project): ProjectDto {
  return { id: p.id, name: p.name, description: p.description, createdAt: p.createdAt.toISOString() };
}

/** Admins see every project; everyone else sees the projects they belong to. */
export async function visibleProjectIds(user: SessionUser): Promise<string[] | 'all'> {
  if (user.role === 'admin') return 'all';
  const rows = await ProjectMember.findAll({ where: { userId: user.id }, attributes: ['projectId'] });
  return rows.map((r) => r.projectId);
}

/**
 * Throws 404 (not 403) for projects the user does not belong to, so that ids of other teams'
 * projects cannot be probed.
 */
export async function requireProject(user: SessionUser, projectId: string): Promise<Project> {
  const project = await Project.findByPk(projectId);
  if (!project) throw notFound('Project');
  if (user.role !== 'admin') {
    const member = await ProjectMember.findOne({ where: { projectId, userId: user.id } });
    if (!member) throw notFound('Project');
  }
  return project;
}

export async function listProjects(user: SessionUser): Promise<ProjectDto[]> {
  const ids = await visibleProjectIds(user);
  const where = ids === 'all' ? {} : { id: { [Op.in]: ids } };
  const rows = await Project.findAll({ where, order: [['name', 'ASC']] });
  return rows.map(toProjectDto);
}

export async function createProject(
  sequelize: Sequelize,
  user: SessionUser,
  input: { name: string; description: string },
): Promise<ProjectDto> {
  try {
    const project = await sequelize.transaction(async (transaction) => {
      const p = await Project.create({ name: input.name, description: input.description, createdBy: user.id }, { transaction });
      await ProjectMember.create({ projectId: p.id, userId: user.id }, { transaction });
      await audit(sequelize, { userId: user.id, projectId: p.id, action: 'project.create', targetType: 'project', targetId: p.id }, transaction);
      return p;
    });
    return toProjectDto(project);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new HttpError(409, `A project named "${input.name}" already exists`);
    throw err;
  }
}

export interface MemberDto {
  userId: string;
  name: string;
  email: string;
  role: string;
}

export async function listMembers(projectId: string): Promise<MemberDto[]> {
  const members = await ProjectMember.findAll({ where: { projectId } });
  const users = await User.findAll({ where: { id: { [Op.in]: members.map((m) => m.userId) } }, order: [['name', 'ASC']] });
  return users.map((u) => ({ userId: u.id, name: u.name, email: u.email, role: u.role }));
}

export async function addMember(sequelize: Sequelize, actor: SessionUser, projectId: string, userId: string): Promise<void> {
  const user = await User.findByPk(userId);
  if (!user) throw notFound('User');
  await ProjectMember.findOrCreate({ where: { projectId, userId } });
  await audit(sequelize, { userId: actor.id, projectId, action: 'project.member-add', targetType: 'user', targetId: userId });
}

export async function removeMember(sequelize: Sequelize, actor: SessionUser, projectId: string, userId: string): Promise<void> {
  await ProjectMember.destroy({ where: { projectId, userId } });
  await audit(sequelize, { userId: actor.id, projectId, action: 'project.member-remove', targetType: 'user', targetId: userId });
}
