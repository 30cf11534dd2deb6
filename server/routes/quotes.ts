import type { Response } from 'express';
import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { IdSchema } from '@shared/schemas/customers';
import { CreateQuoteSchema, QuoteListQuerySchema } from '@shared/schemas/quotes';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400, problems } from '../http/problem';
import { renderQuotePdf } from '../pdf/quote-pdf';
import { renderAcceptancePdf } from '../pdf/acceptance-pdf';
import { getOutboxMessage, listOutbox, outboxAttachment, retryOutboxMessage } from '../services/outbox';
import { flaggedPayments, refundPayment } from '../services/payments';
import { acceptanceRecordOf, buildDocument, createQuote, estimateDocument, getQuote, listQuotes, optionReport, pipeline, sendQuote, withdrawQuote } from '../services/quotes';
import { Quote } from '../models';

const IdParam = z.object({ id: IdSchema });
const ALL = 'signed-in' as const;
const SendSchema = z.object({ recipient: z.email({ message: 'must be an e-mail address' }).optional() }).strict();
const OutboxQuery = z.object({
  status: z.enum(['queued', 'sent', 'failed']).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});

function pdfResponse(res: Response, name: string, pdf: Buffer, inline = true): void {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `${inline ? 'inline' : 'attachment'}; filename="${name.replace(/[^\w.-]/g, '_')}.pdf"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.send(pdf);
}

export function quoteRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const e = secureRouter('/api/estimates', table);
  e.post('/:id/quotes', 'sendQuotes', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await createQuote(sequelize, req.user!, id, parseOr400(CreateQuoteSchema, req.body)));
  });
  /** The estimate as a customer would read it, before any quote is made. */
  e.get('/:id/quote.pdf', ALL, async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    pdfResponse(res, `estimate-${id}`, await renderQuotePdf(await estimateDocument(id, config.uploadsDir)));
  });

  const q = secureRouter('/api/quotes', table);
  q.get('', ALL, async (req, res) => {
    res.json(await listQuotes(parseOr400(QuoteListQuerySchema, req.query)));
  });
  q.get('/pipeline', ALL, async (_req, res) => {
    res.json(await pipeline(sequelize));
  });
  /** How often customers take the lighter of the options offered for a piece. */
  q.get('/options-report', 'sendQuotes', async (_req, res) => {
    res.json(await optionReport(sequelize));
  });
  q.get('/:id', ALL, async (req, res) => {
    res.json(await getQuote(parseOr400(IdParam, req.params).id));
  });
  q.get('/:id/pdf', ALL, async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    const quote = await Quote.findByPk(id);
    if (!quote) throw problems.notFound('Quote');
    pdfResponse(res, quote.number, await renderQuotePdf(await buildDocument(id, config.uploadsDir)));
  });
  q.get('/:id/acceptance.pdf', ALL, async (req, res) => {
    const record = await acceptanceRecordOf(parseOr400(IdParam, req.params).id);
    pdfResponse(res, `${record.quoteNumber}-acceptance`, await renderAcceptancePdf(record));
  });
  q.post('/:id/send', 'sendQuotes', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await sendQuote(sequelize, config, req.user!.id, id, parseOr400(SendSchema, req.body).recipient));
  });
  q.post('/:id/withdraw', 'sendQuotes', async (req, res) => {
    res.json(await withdrawQuote(sequelize, req.user!.id, parseOr400(IdParam, req.params).id));
  });

  const o = secureRouter('/api/outbox', table);
  o.get('', 'sendQuotes', async (req, res) => res.json(await listOutbox(parseOr400(OutboxQuery, req.query))));
  o.get('/:id', 'sendQuotes', async (req, res) => res.json(await getOutboxMessage(parseOr400(IdParam, req.params).id)));
  o.get('/:id/attachment', 'sendQuotes', async (req, res) => {
    const { name, pdf } = await outboxAttachment(parseOr400(IdParam, req.params).id);
    pdfResponse(res, name, pdf);
  });
  o.post('/:id/retry', 'sendQuotes', async (req, res) => res.json(await retryOutboxMessage(sequelize, config, parseOr400(IdParam, req.params).id)));

  const p = secureRouter('/api/payments', table);
  /** Payments the owner should look at: paid twice, or a different amount from the deposit. */
  p.get('/flagged', 'sendQuotes', async (_req, res) => {
    res.json(await flaggedPayments());
  });
  /** Refunds a flagged payment whose automatic refund did not go through. */
  p.post('/:id/refund', 'refundDeposits', async (req, res) => {
    res.json(await refundPayment(config, parseOr400(IdParam, req.params).id, req.user!.id));
  });
  return [e.router, q.router, o.router, p.router];
}
