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

export interface AuditRow {
  id: number;
  at: string;
  userId: string | null;
  userName: string | null;
  projectId: string | null;
  action: string;
  targetType: string;
  targetId: string;
  detail: Record<string, unknown>;
}

export async function listAudit(
  sequelize: Sequelize,
  filter: { projectId?: string; projectIds?: string[]; limit: number; before?: number },
): Promise<AuditRow[]> {
  const where: string[] = [];
  if (filter.projectId) where.push('a.project_id = :projectId');
  if (filter.projectIds) where.push('a.project_id = ANY(CAST(:projectIds AS uuid[]))');
  if (filter.before) where.push('a.id < :before');
  return sequelize.query<AuditRow>(
    `SELECT a.id, a.at, a.user_id AS "userId", u.name AS "userName", a.project_id AS "projectId", a.action,
            a.target_type AS "targetType", a.target_id AS "targetId", a.detail
       FROM audit_log a LEFT JOIN users u ON u.id = a.user_id
      ${where.length ? 'WHERE ' + where.join(' AND ') : ''}
      ORDER BY a.id DESC LIMIT :limit`,
    {
      replacements: { projectId: filter.projectId, projectIds: filter.projectIds ? `{${filter.projectIds.join(',')}}` : null, limit: filter.limit, before: filter.before },
      type: QueryTypes.SELECT,
    },
  );
}
