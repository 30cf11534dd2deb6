import { secureRouter, type RouteInfo } from '../http/guard';
import { problems } from '../http/problem';
import { currentWorkshop } from '../services/workshops';

export function workshopRoutes(table: RouteInfo[]) {
  const r = secureRouter('/api/workshop', table);
  r.get('', 'signed-in', async (_req, res) => {
    const workshop = await currentWorkshop();
    if (!workshop) throw problems.notFound('The workshop');
    res.json(workshop.toDto());
  });
  return r.router;
}
