import type { Sequelize } from 'sequelize';
import { AuditQuerySchema } from '@shared/schemas/audit';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { auditFilters, listAudit } from '../services/audit-log';

export function auditRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/audit', table);
  r.get('', 'readAuditLog', async (req, res) => {
    res.json(await listAudit(sequelize, parseOr400(AuditQuerySchema, req.query)));
  });
  r.get('/filters', 'readAuditLog', async (_req, res) => {
    res.json(await auditFilters(sequelize));
  });
  return r.router;
}
