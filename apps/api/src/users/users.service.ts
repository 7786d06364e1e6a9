import { Op, QueryTypes, type Sequelize } from 'sequelize';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import type { Role } from '../auth/permissions';
import { hashPassword, hashToken, newToken } from '../auth/password';
import type { Mailer } from '../mail/mailer';
import { audit } from '../audit/audit.service';
import { Project, ProjectMember } from '../projects/projects.model';
import { Invitation, PasswordReset, User } from './users.model';

export interface UserDto {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
  disabled: boolean;
  createdAt: string;
  lastLoginAt: string | null;
  maxActiveRuns?: number;
  maxNodes?: number;
}

export interface MembershipDto {
  projectId: string;
  projectName: string;
  role: Role;
}

export function toUserDto(u: User): UserDto {
  return {
    id: u.id, email: u.email, name: u.name, isAdmin: u.isAdmin, disabled: u.disabled,
    createdAt: u.createdAt.toISOString(), lastLoginAt: u.lastLoginAt ? u.lastLoginAt.toISOString() : null,
    maxActiveRuns: u.maxActiveRuns, maxNodes: u.maxNodes,
  };
}

export async function membershipsOf(sequelize: Sequelize, userIds: string[]): Promise<Map<string, MembershipDto[]>> {
  const out = new Map<string, MembershipDto[]>(userIds.map((id) => [id, []]));
  if (userIds.length === 0) return out;
  const rows = await sequelize.query<MembershipDto & { userId: string }>(
    `SELECT m.user_id AS "userId", m.project_id AS "projectId", p.name AS "projectName", m.role
       FROM project_members m JOIN projects p ON p.id = m.project_id
      WHERE m.user_id IN (:userIds) ORDER BY p.name`,
    { replacements: { userIds }, type: QueryTypes.SELECT },
  );
  for (const { userId, ...m } of rows) out.get(userId)?.push(m);
  return out;
}

export async function listAdminUsers(sequelize: Sequelize): Promise<(UserDto & { memberships: MembershipDto[] })[]> {
  const users = await User.findAll({ order: [['name', 'ASC']] });
  const memberships = await membershipsOf(sequelize, users.map((u) => u.id));
  return users.map((u) => ({ ...toUserDto(u), memberships: memberships.get(u.id) ?? [] }));
}

export async function updateUser(
  sequelize: Sequelize,
  actor: SessionUser,
  id: string,
  patch: { isAdmin?: boolean; disabled?: boolean; name?: string; maxActiveRuns?: number; maxNodes?: number },
): Promise<UserDto> {
  const user = await User.findByPk(id);
  if (!user) throw notFound('User');
  if (actor.id === id && (patch.isAdmin === false || patch.disabled === true)) {
    throw new HttpError(409, 'You cannot remove your own site-admin right or disable yourself');
  }
  await user.update(patch);
  if (patch.disabled === true) await endSessionsOf(sequelize, id);
  await audit(sequelize, { userId: actor.id, action: 'user.update', targetType: 'user', targetId: id, detail: { ...patch, email: user.email } });
  return toUserDto(user);
}

/** Signs a user out everywhere (sessions hold the user id under passport.user). */
export async function endSessionsOf(sequelize: Sequelize, userId: string): Promise<void> {
  await sequelize.query(`DELETE FROM "session" WHERE sess->'passport'->>'user' = :userId`, { replacements: { userId } });
}

// ---- invitations ---------------------------------------------------------------------------

const INVITE_DAYS = 7;
const RESET_HOURS = 1;

export interface InvitationDto {
  id: string;
  email: string;
  projectId: string;
  projectName: string;
  role: Role;
  expiresAt: string;
  acceptedAt: string | null;
}

export async function listInvitations(): Promise<InvitationDto[]> {
  const invitations = await Invitation.findAll({ where: { revokedAt: null }, order: [['createdAt', 'DESC']] });
  const projects = await Project.findAll({ where: { id: { [Op.in]: invitations.map((i) => i.projectId) } } });
  const nameOf = new Map(projects.map((p) => [p.id, p.name]));
  return invitations.map((i) => ({
    id: i.id, email: i.email, projectId: i.projectId, projectName: nameOf.get(i.projectId) ?? '', role: i.role,
    expiresAt: i.expiresAt.toISOString(), acceptedAt: i.acceptedAt ? i.acceptedAt.toISOString() : null,
  }));
}

export interface MailContext {
  sequelize: Sequelize;
  mailer: Mailer;
  appUrl: string;
}

export async function createInvitation(ctx: MailContext, actor: SessionUser, input: { email: string; projectId: string; role: Role }): Promise<InvitationDto> {
  const email = input.email.trim().toLowerCase();
  const project = await Project.findByPk(input.projectId);
  if (!project) throw notFound('Project');
  if (await User.findOne({ where: { email } })) {
    throw new HttpError(409, `${email} already has an account; add them from the project's member list instead`);
  }
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + INVITE_DAYS * 24 * 3600_000);
  const inv = await Invitation.create({ email, projectId: project.id, role: input.role, tokenHash: hash, expiresAt, invitedBy: actor.id });
  await ctx.mailer.send({
    to: email,
    subject: `You are invited to ${project.name} on Phaseloop`,
    text:
      `${actor.name} invited you to the Phaseloop project "${project.name}" as ${input.role}.\n\n` +
      `Choose your name and password here (the link works for ${INVITE_DAYS} days):\n${ctx.appUrl}/invite/${token}\n`,
  });
  await audit(ctx.sequelize, { userId: actor.id, projectId: project.id, action: 'invitation.create', targetType: 'invitation', targetId: inv.id, detail: { email, role: input.role } });
  return { id: inv.id, email, projectId: project.id, projectName: project.name, role: inv.role, expiresAt: expiresAt.toISOString(), acceptedAt: null };
}

export async function revokeInvitation(sequelize: Sequelize, actor: SessionUser, id: string): Promise<void> {
  const inv = await Invitation.findByPk(id);
  if (!inv || inv.revokedAt) throw notFound('Invitation');
  if (inv.acceptedAt) throw new HttpError(409, 'This invitation has already been accepted');
  await inv.update({ revokedAt: new Date() });
  await audit(sequelize, { userId: actor.id, projectId: inv.projectId, action: 'invitation.revoke', targetType: 'invitation', targetId: id, detail: { email: inv.email } });
}

/** Unknown token → 404; known but expired, used or revoked → 410 with a plain reason. */
async function usableInvitation(token: string): Promise<Invitation> {
  const inv = await Invitation.findOne({ where: { tokenHash: hashToken(token) } });
  if (!inv) throw new HttpError(404, 'This invitation link is not valid', 'not_found');
  if (inv.acceptedAt) throw new HttpError(410, 'This invitation has already been used; sign in instead', 'bad_request');
  if (inv.revokedAt) throw new HttpError(410, 'This invitation was withdrawn; ask an admin for a new one', 'bad_request');
  if (inv.expiresAt.getTime() <= Date.now()) throw new HttpError(410, 'This invitation has expired; ask an admin for a new one', 'bad_request');
  return inv;
}

export async function previewInvitation(token: string): Promise<{ email: string; projectName: string; role: Role; expiresAt: string }> {
  const inv = await usableInvitation(token);
  const project = await Project.findByPk(inv.projectId);
  return { email: inv.email, projectName: project?.name ?? '', role: inv.role, expiresAt: inv.expiresAt.toISOString() };
}

export async function acceptInvitation(sequelize: Sequelize, token: string, input: { name: string; password: string }): Promise<User> {
  const inv = await usableInvitation(token);
  const passwordHash = await hashPassword(input.password);
  const user = await sequelize.transaction(async (transaction) => {
    // Only one accept can win: the row is claimed before the account is created.
    const [claimed] = await Invitation.update({ acceptedAt: new Date() }, { where: { id: inv.id, acceptedAt: null, revokedAt: null }, transaction });
    if (claimed !== 1) throw new HttpError(410, 'This invitation has already been used; sign in instead', 'bad_request');
    if (await User.findOne({ where: { email: inv.email }, transaction })) {
      throw new HttpError(409, `${inv.email} already has an account; sign in instead`);
    }
    const u = await User.create({ email: inv.email, name: input.name, passwordHash, lastLoginAt: new Date() }, { transaction });
    await ProjectMember.create({ projectId: inv.projectId, userId: u.id, role: inv.role }, { transaction });
    await audit(sequelize, { userId: u.id, projectId: inv.projectId, action: 'invitation.accept', targetType: 'invitation', targetId: inv.id, detail: { email: inv.email, role: inv.role } }, transaction);
    return u;
  });
  return user;
}

// ---- password reset ------------------------------------------------------------------------

/** Always succeeds from the caller's point of view, so it cannot be used to find accounts. */
export async function requestPasswordReset(ctx: MailContext, emailRaw: string): Promise<void> {
  const email = emailRaw.trim().toLowerCase();
  const user = await User.findOne({ where: { email, disabled: false } });
  if (!user) return;
  const { token, hash } = newToken();
  await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_HOURS * 3600_000) });
  await ctx.mailer.send({
    to: email,
    subject: 'Phaseloop password reset',
    text:
      `Someone asked to reset the Phaseloop password of ${email}. If it was you, choose a new one here ` +
      `(the link works once, for ${RESET_HOURS} hour):\n${ctx.appUrl}/reset/${token}\n\nIf it was not you, ignore this mail.\n`,
  });
  await audit(ctx.sequelize, { userId: user.id, action: 'user.reset-request', targetType: 'user', targetId: user.id });
}

export async function resetPassword(sequelize: Sequelize, token: string, password: string): Promise<void> {
  const row = await PasswordReset.findOne({ where: { tokenHash: hashToken(token) } });
  if (!row) throw new HttpError(400, 'This reset link is not valid; ask for a new one');
  if (row.usedAt) throw new HttpError(400, 'This reset link has already been used; ask for a new one');
  if (row.expiresAt.getTime() <= Date.now()) throw new HttpError(400, 'This reset link has expired; ask for a new one');
  const user = await User.findByPk(row.userId);
  if (!user || user.disabled) throw new HttpError(400, 'This reset link is not valid; ask for a new one');
  const [claimed] = await PasswordReset.update({ usedAt: new Date() }, { where: { id: row.id, usedAt: null } });
  if (claimed !== 1) throw new HttpError(400, 'This reset link has already been used; ask for a new one');
  await user.update({ passwordHash: await hashPassword(password) });
  // A reset usually means the old password is not safe: end every session of the account.
  await endSessionsOf(sequelize, user.id);
  await audit(sequelize, { userId: user.id, action: 'user.reset-password', targetType: 'user', targetId: user.id });
}
