import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { CreateUserSchema, ResetPasswordSchema, UpdateUserSchema, UserListQuerySchema } from '@shared/schemas/auth';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { createUser, listUsers, resetPassword, updateUser } from '../services/users';

const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });

export function userRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/users', table);
  r.get('', 'manageUsers', async (req, res) => {
    res.json(await listUsers(parseOr400(UserListQuerySchema, req.query)));
  });
  r.post('', 'manageUsers', async (req, res) => {
    res.status(201).json(await createUser(sequelize, req.user!.id, parseOr400(CreateUserSchema, req.body)));
  });
  r.patch('/:id', 'manageUsers', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateUser(sequelize, req.user!.id, id, parseOr400(UpdateUserSchema, req.body)));
  });
  r.post('/:id/password', 'manageUsers', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    await resetPassword(sequelize, req.user!.id, id, parseOr400(ResetPasswordSchema, req.body).password);
    res.status(204).end();
  });
  return r.router;
}
