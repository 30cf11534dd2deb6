import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { getChecklist, setChecklistDismissed } from '../services/checklist';

const DismissSchema = z.object({ dismissed: z.boolean({ message: 'must be true or false' }) }).strict();

/** The owner's first-run checklist (computed from the data) and putting it away. */
export function checklistRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/workshop/checklist', table);
  r.get('', 'editSettings', async (_req, res) => {
    res.json(await getChecklist(sequelize));
  });
  r.put('/dismissed', 'editSettings', async (req, res) => {
    const { dismissed } = parseOr400(DismissSchema, req.body);
    res.json(await setChecklistDismissed(sequelize, req.user!.id, dismissed));
  });
  return r.router;
}
