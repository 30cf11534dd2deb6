/** Reading the audit log: who changed what, from what to what, when; filtered and paged on the server. */
import { QueryTypes, type Sequelize } from 'sequelize';
import type { AuditEntryDto, AuditFilters, AuditQuery } from '@shared/schemas/audit';
import type { Page } from '@shared/schemas/auth';

interface Row {
  id: string;
  at: Date;
  user_id: number | null;
  user_name: string | null;
  action: string;
  entity_type: string;
  entity_id: string | null;
  before: unknown;
  after: unknown;
  total: string;
}

export async function listAudit(sequelize: Sequelize, query: AuditQuery): Promise<Page<AuditEntryDto>> {
  const where: string[] = [];
  const replacements: Record<string, unknown> = { limit: query.pageSize, offset: (query.page - 1) * query.pageSize };
  if (query.entityType) {
    where.push('a.entity_type = :entityType');
    replacements.entityType = query.entityType;
  }
  if (query.userId) {
    where.push('a.user_id = :userId');
    replacements.userId = query.userId;
  }
  // Dates are whole days: from the start of `from` to the end of `to` (UTC, as stored).
  if (query.from) {
    where.push(`a.at >= (:from)::date`);
    replacements.from = query.from;
  }
  if (query.to) {
    where.push(`a.at < (:to)::date + 1`);
    replacements.to = query.to;
  }
  const rows = await sequelize.query<Row>(
    `SELECT a.id::text AS id, a.at, a.user_id, u.name AS user_name, a.action, a.entity_type, a.entity_id, a.before, a.after,
            count(*) OVER () AS total
       FROM audit_log a LEFT JOIN users u ON u.id = a.user_id
      ${where.length ? `WHERE ${where.join(' AND ')}` : ''}
      ORDER BY a.at ${query.dir === 'asc' ? 'ASC' : 'DESC'}, a.id ${query.dir === 'asc' ? 'ASC' : 'DESC'}
      LIMIT :limit OFFSET :offset`,
    { replacements, type: QueryTypes.SELECT },
  );
  let total = rows[0] ? Number(rows[0].total) : 0;
  if (rows.length === 0 && query.page > 1) {
    const [{ count }] = await sequelize.query<{ count: string }>(
      `SELECT count(*) AS count FROM audit_log a ${where.length ? `WHERE ${where.join(' AND ')}` : ''}`,
      { replacements, type: QueryTypes.SELECT },
    ) as [{ count: string }];
    total = Number(count);
  }
  return {
    rows: rows.map((r) => ({
      id: r.id,
      at: new Date(r.at).toISOString(),
      userId: r.user_id,
      userName: r.user_name,
      action: r.action,
      entityType: r.entity_type,
      entityId: r.entity_id,
      before: r.before,
      after: r.after,
    })),
    total,
    page: query.page,
    pageSize: query.pageSize,
  };
}

export async function auditFilters(sequelize: Sequelize): Promise<AuditFilters> {
  const types = await sequelize.query<{ entity_type: string }>('SELECT DISTINCT entity_type FROM audit_log ORDER BY entity_type', { type: QueryTypes.SELECT });
  const users = await sequelize.query<{ id: number; name: string }>(
    'SELECT u.id, u.name FROM users u WHERE EXISTS (SELECT 1 FROM audit_log a WHERE a.user_id = u.id) ORDER BY u.name',
    { type: QueryTypes.SELECT },
  );
  return { entityTypes: types.map((t) => t.entity_type), users };
}
