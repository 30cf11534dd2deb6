import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import {
  ArchiveSchema,
  CopySystemSchema,
  CreateSpeciesSchema,
  SpeciesListQuerySchema,
  SystemListQuerySchema,
  SystemUpdateSchema,
  UpdateSpeciesSchema,
} from '@shared/schemas/finishing-admin';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { archiveSystem, copySystem, createSpecies, getSystem, listSpecies, listSystems, updateSpecies, updateSystem } from '../services/finishing';

const IdParam = z.object({ id: z.coerce.number({ message: 'must be a number' }).int().positive().max(2_147_483_647) });
/** The estimator reads systems and species; the owner keeps them. */

export function finishingRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api', table);
  r.get('/finishing-systems', 'readFinishing', async (req, res) => {
    res.json(await listSystems(parseOr400(SystemListQuerySchema, req.query).archived));
  });
  r.post('/finishing-systems', 'editFinishing', async (req, res) => {
    res.status(201).json(await copySystem(sequelize, req.user!.id, parseOr400(CopySystemSchema, req.body)));
  });
  r.get('/finishing-systems/:id', 'readFinishing', async (req, res) => {
    res.json(await getSystem(parseOr400(IdParam, req.params).id));
  });
  r.put('/finishing-systems/:id', 'editFinishing', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateSystem(sequelize, req.user!.id, id, parseOr400(SystemUpdateSchema, req.body)));
  });
  r.patch('/finishing-systems/:id', 'editFinishing', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await archiveSystem(sequelize, req.user!.id, id, parseOr400(ArchiveSchema, req.body).archived));
  });

  r.get('/species', 'readFinishing', async (req, res) => {
    res.json(await listSpecies(parseOr400(SpeciesListQuerySchema, req.query)));
  });
  r.post('/species', 'editFinishing', async (req, res) => {
    res.status(201).json(await createSpecies(sequelize, req.user!.id, parseOr400(CreateSpeciesSchema, req.body)));
  });
  r.patch('/species/:id', 'editFinishing', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateSpecies(sequelize, req.user!.id, id, parseOr400(UpdateSpeciesSchema, req.body)));
  });
  return r.router;
}
