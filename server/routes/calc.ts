import type { Sequelize } from 'sequelize';
import { secureRouter, type RouteInfo } from '../http/guard';
import { loadCatalog } from '../services/catalog';
import { estimateFromBody } from '../services/estimator';
import { cachesOf } from '../services/shared-caches';

export function calcRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/calc', table);

  /** Estimates a piece without saving anything: the result, the price list's version and what to fix in it. */
  r.post('/preview', 'signed-in', async (req, res) => {
    const { result, loaded } = await estimateFromBody(sequelize, req.body, { cache: cachesOf(req) });
    res.json({ ...result, priceListWarnings: loaded.warnings });
  });

  /** The catalog and settings the client needs to run the same engine live as the user types. */
  r.get('/catalog', 'signed-in', async (req, res) => {
    const { catalog, settings, warnings } = await loadCatalog(sequelize, { cache: cachesOf(req) });
    res.json({ catalog, settings, warnings });
  });
  return r.router;
}
