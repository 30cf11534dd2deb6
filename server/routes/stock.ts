import type { Response } from 'express';
import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { IdSchema } from '@shared/schemas/customers';
import {
  LowStockQuerySchema,
  MovementsQuerySchema,
  OrderListQuerySchema,
  OrdersFromForecastSchema,
  ReceiveOrderSchema,
  SendOrderSchema,
  StockCountSchema,
} from '@shared/schemas/stock';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { jobCosting } from '../services/costing/job-costing';
import { movementsCsv } from '../services/reports/exports';
import { listMovements, recordCount, sessionMaterials } from '../services/stock/ledger';
import { stockOverview } from '../services/stock/levels';
import { cancelOrder, getOrder, listOrders, orderPdf, ordersFromForecast, receiveOrder, sendOrder } from '../services/stock/orders';

const IdParam = z.object({ id: IdSchema });
const SessionParam = z.object({ id: IdSchema, sessionId: IdSchema });
/** Money, margins and the business's figures: the owner only. */

export function csvResponse(res: Response, name: string, csv: string): void {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${name.replace(/[^\w.-]/g, '_')}.csv"`);
  res.setHeader('Cache-Control', 'private, no-store');
  // A byte-order mark, so that a spreadsheet reads the file as UTF-8.
  res.send(`\ufeff${csv}`);
}

/** Stock and its ledger, purchase orders and job costing. */
export function stockRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const s = secureRouter('/api/stock', table);
  s.get('', 'keepStock', async (req, res) => {
    res.json(await stockOverview(parseOr400(LowStockQuerySchema, req.query)));
  });
  s.get('/movements', 'keepStock', async (req, res) => {
    res.json(await listMovements(parseOr400(MovementsQuerySchema, req.query)));
  });
  s.get('/movements.csv', 'readReports', async (req, res) => {
    const q = parseOr400(MovementsQuerySchema.omit({ page: true, pageSize: true }), req.query);
    const page = await listMovements({ ...q, page: 1, pageSize: 10_000 });
    csvResponse(res, 'stock-ledger', movementsCsv(page.items));
  });
  s.post('/counts', 'keepStock', async (req, res) => {
    res.status(201).json(await recordCount(sequelize, req.user!.id, parseOr400(StockCountSchema, req.body)));
  });

  const j = secureRouter('/api/jobs', table);
  j.get('/:id/sessions/:sessionId/materials', 'recordProgress', async (req, res) => {
    const { id, sessionId } = parseOr400(SessionParam, req.params);
    res.json(await sessionMaterials(id, sessionId));
  });
  j.get('/:id/costing', 'readCosting', async (req, res) => {
    res.json(await jobCosting(parseOr400(IdParam, req.params).id));
  });

  const o = secureRouter('/api/purchase-orders', table);
  o.get('', 'keepStock', async (req, res) => {
    res.json(await listOrders(parseOr400(OrderListQuerySchema, req.query)));
  });
  o.post('/from-forecast', 'keepStock', async (req, res) => {
    res.status(201).json(await ordersFromForecast(sequelize, req.user!.id, parseOr400(OrdersFromForecastSchema, req.body ?? {})));
  });
  o.get('/:id', 'keepStock', async (req, res) => {
    res.json(await getOrder(parseOr400(IdParam, req.params).id));
  });
  o.get('/:id/pdf', 'keepStock', async (req, res) => {
    const { number, pdf } = await orderPdf(parseOr400(IdParam, req.params).id);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="${number.replace(/[^\w.-]/g, '_')}.pdf"`);
    res.setHeader('Cache-Control', 'private, no-store');
    res.send(pdf);
  });
  o.post('/:id/send', 'keepStock', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await sendOrder(config, sequelize, req.user!.id, id, parseOr400(SendOrderSchema, req.body)));
  });
  o.post('/:id/receive', 'keepStock', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await receiveOrder(sequelize, req.user!.id, id, parseOr400(ReceiveOrderSchema, req.body)));
  });
  o.post('/:id/cancel', 'keepStock', async (req, res) => {
    res.json(await cancelOrder(sequelize, req.user!.id, parseOr400(IdParam, req.params).id));
  });

  return [s.router, j.router, o.router];
}
