import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { LabourRateUpdateSchema, WorkshopUpdateSchema } from '@shared/schemas/workshop-admin';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { getWorkshopForOwner, listRates, updateRate, updateWorkshop } from '../services/workshop-settings';

const IdParam = z.object({ id: z.coerce.number({ message: 'must be a number' }).int().positive().max(2_147_483_647) });

export function settingsRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api', table);
  r.get('/settings', 'editSettings', async (_req, res) => {
    res.json(await getWorkshopForOwner());
  });
  /** The whole settings page at once: the workshop's details and every setting, validated by the shared schema. */
  r.put('/settings', 'editSettings', async (req, res) => {
    res.json(await updateWorkshop(sequelize, req.user!.id, parseOr400(WorkshopUpdateSchema, req.body)));
  });
  r.get('/labour-rates', 'readLabourRates', async (_req, res) => {
    res.json(await listRates());
  });
  r.patch('/labour-rates/:id', 'editSettings', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateRate(sequelize, req.user!.id, id, parseOr400(LabourRateUpdateSchema, req.body)));
  });
  return r.router;
}
