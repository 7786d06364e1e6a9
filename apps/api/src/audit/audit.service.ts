import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

export interface AuditEntry {
  userId: string | null;
  projectId?: string | null;
  /** Verb phrase, e.g. 'material.approve', 'run.submit'. */
  action: string;
  targetType: string;
  targetId: string;
  detail?: Record<string, unknown>;
}

export async function audit(sequelize: Sequelize, entry: AuditEntry, transaction?: Transaction): Promise<void> {
  await sequelize.query(
    `INSERT INTO audit_log (user_id, project_id, action, target_type, target_id, detail)
     VALUES (:userId, :projectId, :action, :targetType, :targetId, :detail)`,
    {
      replacements: {
        userId: entry.userId,
        projectId: entry.projectId ?? null,
        action: entry.action,
        targetType: entry.targetType,
        targetId: entry.targetId,
        detail: JSON.stringify(entry.detail ?? {}),
      },
      transaction,
    },
  );
}

export interface AuditDto {
  id: string;
  actor: { id: string; name: string; email: string } | null;
  action: string;
  /** `type:id`, e.g. `run:3f…`. */
  target: string | null;
  details: Record<string, unknown>;
  createdAt: string;
}

export async function listAudit(
  sequelize: Sequelize,
  filter: { projectId?: string; limit: number; before?: number },
): Promise<AuditDto[]> {
  const where: string[] = [];
  if (filter.projectId) where.push('a.project_id = :projectId');
  if (filter.before) where.push('a.id < :before');
  const rows = await sequelize.query<{
    id: number; at: Date; userId: string | null; userName: string | null; userEmail: string | null;
    action: string; targetType: string; targetId: string; detail: Record<string, unknown>;
  }>(
    `SELECT a.id, a.at, a.user_id AS "userId", u.name AS "userName", u.email AS "userEmail", a.action,
            a.target_type AS "targetType", a.target_id AS "targetId", a.detail
       FROM audit_log a LEFT JOIN users u ON u.id = a.user_id
      ${where.length ? 'WHERE ' + where.join(' AND ') : ''}
      ORDER BY a.id DESC LIMIT :limit`,
    { replacements: { projectId: filter.projectId ?? null, limit: filter.limit, before: filter.before ?? null }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: String(r.id),
    actor: r.userId ? { id: r.userId, name: r.userName ?? '', email: r.userEmail ?? '' } : null,
    action: r.action,
    target: r.targetType ? `${r.targetType}:${r.targetId}` : null,
    details: r.detail,
    createdAt: new Date(r.at).toISOString(),
  }));
}
