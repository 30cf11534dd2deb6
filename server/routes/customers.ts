import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { CustomerInputSchema, CustomerListQuerySchema, IdSchema } from '@shared/schemas/customers';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { archiveCustomer, createCustomer, getCustomer, listCustomers, updateCustomer } from '../services/customers';

const IdParam = z.object({ id: IdSchema });

export function customerRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/customers', table);
  r.get('', 'signed-in', async (req, res) => {
    res.json(await listCustomers(sequelize, parseOr400(CustomerListQuerySchema, req.query)));
  });
  r.post('', 'editCustomers', async (req, res) => {
    res.status(201).json(await createCustomer(sequelize, req.user!.id, parseOr400(CustomerInputSchema, req.body)));
  });
  r.get('/:id', 'signed-in', async (req, res) => {
    res.json(await getCustomer(sequelize, parseOr400(IdParam, req.params).id));
  });
  r.patch('/:id', 'editCustomers', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateCustomer(sequelize, req.user!.id, id, parseOr400(CustomerInputSchema.partial(), req.body)));
  });
  r.post('/:id/archive', 'editCustomers', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await archiveCustomer(sequelize, req.user!.id, id, parseOr400(z.object({ archived: z.boolean() }).strict(), req.body).archived));
  });
  return r.router;
}
