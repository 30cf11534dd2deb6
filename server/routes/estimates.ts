import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { IdSchema } from '@shared/schemas/customers';
import { ArchiveSchema, CreateEstimateSchema, CreateRevisionSchema, DuplicateSchema, EstimateListQuerySchema, SetStateSchema } from '@shared/schemas/estimates';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import {
  archiveEstimate,
  createEstimate,
  duplicateEstimate,
  getEstimate,
  getRevision,
  listEstimates,
  repriceCandidates,
  repriceEstimate,
  reviseEstimate,
  setEstimateState,
} from '../services/estimates';

const IdParam = z.object({ id: IdSchema });
const RevisionParam = z.object({ id: IdSchema, number: z.coerce.number().int().min(1).max(100_000) });
const RepriceSchema = z.object({ ids: z.array(IdSchema).min(1).max(500) }).strict();

export function estimateRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/estimates', table);
  r.get('', 'signed-in', async (req, res) => {
    res.json(await listEstimates(parseOr400(EstimateListQuerySchema, req.query)));
  });
  r.post('', 'editEstimates', async (req, res) => {
    res.status(201).json(await createEstimate(sequelize, req.user!.id, parseOr400(CreateEstimateSchema, req.body)));
  });
  // Repricing after a price change: which open estimates move, and by how much; then reprice the chosen ones.
  r.get('/reprice', 'repriceEstimates', async (_req, res) => {
    res.json(await repriceCandidates(sequelize));
  });
  r.post('/reprice', 'repriceEstimates', async (req, res) => {
    const { ids } = parseOr400(RepriceSchema, req.body);
    const done = [];
    for (const id of ids) done.push(await repriceEstimate(sequelize, req.user!.id, id));
    res.json({
      repriced: done.filter((e) => e.changed).map((e) => ({ id: e.id, number: e.number, total: e.total, revision: e.revisionCount })),
      // Estimates today's price list leaves exactly as they were: no new revision.
      unchanged: done.filter((e) => !e.changed).map((e) => ({ id: e.id, number: e.number, total: e.total, revision: e.revisionCount })),
    });
  });
  r.get('/:id', 'signed-in', async (req, res) => {
    res.json(await getEstimate(parseOr400(IdParam, req.params).id));
  });
  r.post('/:id/revisions', 'editEstimates', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await reviseEstimate(sequelize, req.user!.id, id, parseOr400(CreateRevisionSchema, req.body)));
  });
  r.get('/:id/revisions/:number', 'signed-in', async (req, res) => {
    const { id, number } = parseOr400(RevisionParam, req.params);
    res.json(await getRevision(id, number));
  });
  r.post('/:id/state', 'editEstimates', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await setEstimateState(sequelize, req.user!.id, id, parseOr400(SetStateSchema, req.body).state));
  });
  r.post('/:id/archive', 'editEstimates', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await archiveEstimate(sequelize, req.user!.id, id, parseOr400(ArchiveSchema, req.body).archived));
  });
  r.post('/:id/duplicate', 'editEstimates', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await duplicateEstimate(sequelize, req.user!.id, id, parseOr400(DuplicateSchema, req.body).pieceId));
  });
  return r.router;
}
