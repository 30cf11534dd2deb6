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

/** How each kind of record is named (a number, a name) and where its page is, for the log's "what" column. */
const SUBJECTS: Record<string, { sql: string; path: (id: string, row: { ref: string | null }) => string }> = {
  estimate: { sql: `SELECT id::text AS id, number AS label, NULL AS ref FROM estimates WHERE id::text IN (:ids)`, path: (id) => `/estimates/${id}` },
  quote: { sql: `SELECT id::text AS id, number AS label, NULL AS ref FROM quotes WHERE id::text IN (:ids)`, path: (id) => `/quotes/${id}` },
  job: { sql: `SELECT id::text AS id, number AS label, NULL AS ref FROM jobs WHERE id::text IN (:ids)`, path: (id) => `/planning/jobs/${id}` },
  customer: { sql: `SELECT id::text AS id, name AS label, NULL AS ref FROM customers WHERE id::text IN (:ids)`, path: (id) => `/customers/${id}` },
  piece: { sql: `SELECT id::text AS id, description AS label, NULL AS ref FROM pieces WHERE id::text IN (:ids)`, path: (id) => `/pieces/${id}` },
  material: { sql: `SELECT id::text AS id, name AS label, NULL AS ref FROM materials WHERE id::text IN (:ids)`, path: (id) => `/price-list/materials/${id}` },
  pack: {
    sql: `SELECT p.id::text AS id, m.name AS label, m.id::text AS ref FROM material_packs p JOIN materials m ON m.id = p.material_id WHERE p.id::text IN (:ids)`,
    path: (_id, row) => `/price-list/materials/${row.ref}`,
  },
  'pack-price': {
    sql: `SELECT pp.id::text AS id, m.name AS label, m.id::text AS ref FROM pack_prices pp JOIN material_packs p ON p.id = pp.pack_id JOIN materials m ON m.id = p.material_id WHERE pp.id::text IN (:ids)`,
    path: (_id, row) => `/price-list/materials/${row.ref}`,
  },
  'finishing-system': { sql: `SELECT id::text AS id, name AS label, NULL AS ref FROM finishing_systems WHERE id::text IN (:ids)`, path: (id) => `/finishing-systems/${id}` },
  species: { sql: `SELECT id::text AS id, name AS label, NULL AS ref FROM species WHERE id::text IN (:ids)`, path: () => '/species' },
  user: { sql: `SELECT id::text AS id, name AS label, NULL AS ref FROM users WHERE id::text IN (:ids)`, path: () => '/users' },
  polisher: { sql: `SELECT id::text AS id, name AS label, NULL AS ref FROM polishers WHERE id::text IN (:ids)`, path: () => '/planning' },
  'labour-rate': { sql: `SELECT id::text AS id, name AS label, NULL AS ref FROM labour_rates WHERE id::text IN (:ids)`, path: () => '/settings' },
};

/** Each entry's record named as people name it (EST-…, Q-…, JOB-…, a name) with the page it lives on. */
async function subjectsOf(sequelize: Sequelize, rows: Row[]): Promise<Map<string, { label: string; path: string }>> {
  const found = new Map<string, { label: string; path: string }>();
  const byType = new Map<string, Set<string>>();
  for (const r of rows) {
    if (r.entity_id && SUBJECTS[r.entity_type]) byType.set(r.entity_type, (byType.get(r.entity_type) ?? new Set()).add(r.entity_id));
  }
  for (const [type, ids] of byType) {
    const subject = SUBJECTS[type]!;
    const named = await sequelize.query<{ id: string; label: string; ref: string | null }>(subject.sql, { replacements: { ids: [...ids] }, type: QueryTypes.SELECT });
    for (const n of named) found.set(`${type}:${n.id}`, { label: n.label, path: subject.path(n.id, n) });
  }
  return found;
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
  const subjects = await subjectsOf(sequelize, rows);
  return {
    rows: rows.map((r) => ({
      id: r.id,
      at: new Date(r.at).toISOString(),
      userId: r.user_id,
      userName: r.user_name,
      action: r.action,
      entityType: r.entity_type,
      entityId: r.entity_id,
      subject: (r.entity_id && subjects.get(`${r.entity_type}:${r.entity_id}`)) || null,
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
