import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { IdSchema } from '@shared/schemas/customers';
import {
  ApplyActualsSchema,
  BoardQuerySchema,
  BookingSchema,
  CreateJobSchema,
  ForecastQuerySchema,
  JobListQuerySchema,
  PolisherInputSchema,
  SessionDoneSchema,
  StockSchema,
  UpdateJobSchema,
  UpdatePolisherSchema,
} from '@shared/schemas/planning';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { bookJob, cancelJob, createJob, getBoard, getJob, listJobs, markSessionDone, previewBooking, readyToBook, updateJob } from '../services/planning';
import {
  actualsReport,
  applyActuals,
  createPolisher,
  listPolishers,
  listStock,
  materialForecast,
  setStock,
  updatePolisher,
} from '../services/planning-reports';

const IdParam = z.object({ id: IdSchema });
const SessionParam = z.object({ id: IdSchema, sessionId: IdSchema });
const MaterialParam = z.object({ materialId: IdSchema });

/** The board, jobs and polishers: every member of staff reads; planners write; finishers log progress. */
export function planningRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const p = secureRouter('/api/planning', table);
  p.get('/board', 'signed-in', async (req, res) => {
    res.json(await getBoard(parseOr400(BoardQuerySchema, req.query)));
  });
  p.get('/ready', 'signed-in', async (_req, res) => {
    res.json(await readyToBook());
  });
  p.get('/actuals', 'reviewActuals', async (_req, res) => {
    res.json(await actualsReport());
  });
  p.post('/actuals/apply', 'reviewActuals', async (req, res) => {
    res.json(await applyActuals(sequelize, req.user!.id, parseOr400(ApplyActualsSchema, req.body)));
  });
  p.get('/forecast', 'readForecast', async (req, res) => {
    res.json(await materialForecast(sequelize, parseOr400(ForecastQuerySchema, req.query)));
  });
  p.get('/stock', 'readForecast', async (_req, res) => {
    res.json(await listStock());
  });
  p.put('/stock/:materialId', 'editStock', async (req, res) => {
    const { materialId } = parseOr400(MaterialParam, req.params);
    res.json(await setStock(sequelize, req.user!.id, materialId, parseOr400(StockSchema, req.body).quantity));
  });

  const j = secureRouter('/api/jobs', table);
  j.get('', 'signed-in', async (req, res) => {
    res.json(await listJobs(parseOr400(JobListQuerySchema, req.query).state));
  });
  j.post('', 'planRoom', async (req, res) => {
    res.status(201).json(await createJob(sequelize, req.user!.id, parseOr400(CreateJobSchema, req.body)));
  });
  j.get('/:id', 'signed-in', async (req, res) => {
    res.json(await getJob(parseOr400(IdParam, req.params).id));
  });
  j.patch('/:id', 'planRoom', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateJob(sequelize, req.user!.id, id, parseOr400(UpdateJobSchema, req.body)));
  });
  // What a booking would do, before confirming it: a read, but it takes the booking's body.
  j.post('/:id/booking/preview', 'planRoom', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await previewBooking(id, parseOr400(BookingSchema, req.body)));
  });
  j.post('/:id/booking', 'planRoom', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await bookJob(sequelize, req.user!.id, id, parseOr400(BookingSchema, req.body)));
  });
  j.post('/:id/cancel', 'planRoom', async (req, res) => {
    res.json(await cancelJob(sequelize, req.user!.id, parseOr400(IdParam, req.params).id));
  });
  j.post('/:id/sessions/:sessionId/done', 'recordProgress', async (req, res) => {
    const { id, sessionId } = parseOr400(SessionParam, req.params);
    res.json(await markSessionDone(sequelize, req.user!.id, id, sessionId, parseOr400(SessionDoneSchema, req.body)));
  });

  const w = secureRouter('/api/polishers', table);
  w.get('', 'signed-in', async (_req, res) => {
    res.json(await listPolishers());
  });
  w.post('', 'planRoom', async (req, res) => {
    res.status(201).json(await createPolisher(sequelize, req.user!.id, parseOr400(PolisherInputSchema, req.body)));
  });
  w.patch('/:id', 'planRoom', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updatePolisher(sequelize, req.user!.id, id, parseOr400(UpdatePolisherSchema, req.body)));
  });

  return [p.router, j.router, w.router];
}
