import { Op, type Sequelize } from 'sequelize';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import type { Role } from '../auth/permissions';
import { hashPassword, hashToken, newToken } from '../auth/password';
import type { Mailer } from '../mail/mailer';
import { audit } from '../audit/audit.service';
import { User, UserToken } from './users.model';

export interface UserDto {
  id: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  /** false until an invitation has been accepted. */
  hasPassword: boolean;
  maxActiveRuns: number;
  maxNodes: number;
}

export function toUserDto(u: User): UserDto {
  return {
    id: u.id, email: u.email, name: u.name, role: u.role, active: u.active,
    hasPassword: u.passwordHash !== null, maxActiveRuns: u.maxActiveRuns, maxNodes: u.maxNodes,
  };
}

const INVITE_HOURS = 7 * 24;
const RESET_HOURS = 2;

export async function listUsers(): Promise<UserDto[]> {
  return (await User.findAll({ order: [['name', 'ASC']] })).map(toUserDto);
}

export async function inviteUser(
  ctx: { sequelize: Sequelize; mailer: Mailer; publicUrl: string; defaults: { maxActiveRuns: number; maxNodes: number } },
  actor: SessionUser,
  input: { email: string; name: string; role: Role },
): Promise<{ user: UserDto; expiresAt: string }> {
  const email = input.email.trim().toLowerCase();
  const existing = await User.findOne({ where: { email } });
  if (existing?.passwordHash) throw new HttpError(409, `${email} already has an account`);
  const user =
    existing ??
    (await User.create({ email, name: input.name, role: input.role, passwordHash: null, maxActiveRuns: ctx.defaults.maxActiveRuns, maxNodes: ctx.defaults.maxNodes }));
  if (existing) await existing.update({ name: input.name, role: input.role });
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + INVITE_HOURS * 3600_000);
  await UserToken.create({ kind: 'invite', userId: user.id, tokenHash: hash, expiresAt, usedAt: null, createdBy: actor.id });
  await ctx.mailer.send({
    to: email,
    subject: 'You are invited to Phaseloop',
    text:
      `${actor.name} invited you to Phaseloop as ${input.role}.\n\n` +
      `Choose your password here (the link works for 7 days):\n${ctx.publicUrl}/accept-invite?token=${token}\n`,
  });
  await audit(ctx.sequelize, { userId: actor.id, action: 'user.invite', targetType: 'user', targetId: user.id, detail: { email, role: input.role } });
  return { user: toUserDto(user), expiresAt: expiresAt.toISOString() };
}

/** Marks the token used and returns its user, or throws one message for every kind of bad link. */
async function consumeToken(kind: 'invite' | 'reset', token: string): Promise<User> {
  const row = await UserToken.findOne({ where: { kind, tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } } });
  const user = row ? await User.findByPk(row.userId) : null;
  if (!row || !user) throw new HttpError(400, 'This link is invalid or has expired; ask for a new one', 'bad-token');
  const [updated] = await UserToken.update({ usedAt: new Date() }, { where: { id: row.id, usedAt: null } });
  if (updated !== 1) throw new HttpError(400, 'This link has already been used', 'bad-token');
  return user;
}

export async function acceptInvitation(sequelize: Sequelize, token: string, password: string): Promise<User> {
  const user = await consumeToken('invite', token);
  await user.update({ passwordHash: await hashPassword(password), active: true });
  await audit(sequelize, { userId: user.id, action: 'user.accept-invite', targetType: 'user', targetId: user.id });
  return user;
}

/** Always succeeds from the caller's point of view, so it cannot be used to find accounts. */
export async function requestPasswordReset(ctx: { sequelize: Sequelize; mailer: Mailer; publicUrl: string }, emailRaw: string): Promise<void> {
  const email = emailRaw.trim().toLowerCase();
  const user = await User.findOne({ where: { email, active: true } });
  if (!user || !user.passwordHash) return;
  const { token, hash } = newToken();
  await UserToken.create({ kind: 'reset', userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_HOURS * 3600_000), usedAt: null, createdBy: null });
  await ctx.mailer.send({
    to: email,
    subject: 'Phaseloop password reset',
    text: `Someone asked to reset the Phaseloop password of ${email}. If it was you, choose a new one here (valid for 2 hours):\n` +
      `${ctx.publicUrl}/reset-password?token=${token}\n\nIf it was not you, ignore this mail.`,
  });
  await audit(ctx.sequelize, { userId: user.id, action: 'user.reset-request', targetType: 'user', targetId: user.id });
}

export async function resetPassword(sequelize: Sequelize, token: string, password: string): Promise<void> {
  const user = await consumeToken('reset', token);
  await user.update({ passwordHash: await hashPassword(password) });
  // Sign the account out everywhere: a reset usually means the old password is not safe.
  await sequelize.query(`DELETE FROM "session" WHERE sess->'passport'->>'user' = :id`, { replacements: { id: user.id } });
  await audit(sequelize, { userId: user.id, action: 'user.reset-password', targetType: 'user', targetId: user.id });
}

export async function updateUser(
  sequelize: Sequelize,
  actor: SessionUser,
  id: string,
  patch: { role?: Role; active?: boolean; name?: string; maxActiveRuns?: number; maxNodes?: number },
): Promise<UserDto> {
  const user = await User.findByPk(id);
  if (!user) throw notFound('User');
  if (actor.id === id && (patch.role && patch.role !== 'admin' || patch.active === false)) {
    throw new HttpError(409, 'You cannot remove your own admin role or deactivate yourself');
  }
  await user.update(patch);
  if (patch.active === false) {
    await sequelize.query(`DELETE FROM "session" WHERE sess->'passport'->>'user' = :id`, { replacements: { id } });
  }
  await audit(sequelize, { userId: actor.id, action: 'user.update', targetType: 'user', targetId: id, detail: patch });
  return toUserDto(user);
}
