import type { Sequelize } from 'sequelize';
import { secureRouter, type RouteInfo } from '../http/guard';

/** Answers within a few seconds whether the server and its database are up. */
export function healthRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/health', table);
  r.get('', 'public', async (_req, res) => {
    try {
      await Promise.race([
        sequelize.query('SELECT 1'),
        new Promise((_, reject) => setTimeout(() => reject(new Error('database ping timed out')), 3_000).unref()),
      ]);
      res.json({ status: 'ok', db: 'ok' });
    } catch {
      res.status(503).json({ status: 'degraded', db: 'down' });
    }
  });
  return r.router;
}
