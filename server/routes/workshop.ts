import { secureRouter, type RouteInfo } from '../http/guard';
import { problems } from '../http/problem';
import { Workshop } from '../models';

export function workshopRoutes(table: RouteInfo[]) {
  const r = secureRouter('/api/workshop', table);
  r.get('', 'signed-in', async (_req, res) => {
    const workshop = await Workshop.findOne({ order: [['id', 'ASC']] });
    if (!workshop) throw problems.notFound('The workshop');
    res.json(workshop.toDto());
  });
  return r.router;
}
