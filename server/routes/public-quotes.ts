import express from 'express';
import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { AcceptQuoteSchema, DeclineQuoteSchema } from '@shared/schemas/quotes';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { renderQuotePdf } from '../pdf/quote-pdf';
import { handleWebhook } from '../services/payments';
import { renderAcceptancePdf } from '../pdf/acceptance-pdf';
import { acceptQuote, acceptanceRecord, declineQuote, depositCancelled, depositCheckout, publicPdf, viewQuote } from '../services/public-quotes';
import { publicLinkLimiter } from '../http/public-limit';

const TokenParam = z.object({ token: z.string().min(10).max(200) });

/** The customer's side: no account, only the signed link. CSRF does not apply (no cookie is involved). */
export function publicQuoteRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const limiter = publicLinkLimiter();
  const r = secureRouter('/api/public/quotes', table);
  r.get('/:token', 'public', limiter, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await viewQuote(config, parseOr400(TokenParam, req.params).token));
  });
  r.get('/:token/pdf', 'public', limiter, async (req, res) => {
    const { number, doc } = await publicPdf(config, parseOr400(TokenParam, req.params).token);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="${number}.pdf"`);
    res.setHeader('Cache-Control', 'no-store');
    res.send(await renderQuotePdf(doc));
  });
  r.post('/:token/accept', 'public', limiter, async (req, res) => {
    const { token } = parseOr400(TokenParam, req.params);
    res.json(await acceptQuote(sequelize, config, token, parseOr400(AcceptQuoteSchema, req.body), req.ip ?? ''));
  });
  r.post('/:token/decline', 'public', limiter, async (req, res) => {
    const { token } = parseOr400(TokenParam, req.params);
    res.json(await declineQuote(sequelize, config, token, parseOr400(DeclineQuoteSchema, req.body).reason, req.ip ?? ''));
  });
  r.post('/:token/deposit', 'public', limiter, async (req, res) => {
    res.json(await depositCheckout(sequelize, config, parseOr400(TokenParam, req.params).token));
  });
  /** Back from the payment page without paying: the open checkout is closed. */
  r.post('/:token/deposit/cancel', 'public', limiter, async (req, res) => {
    res.json(await depositCancelled(config, parseOr400(TokenParam, req.params).token));
  });
  /** What was agreed, by whom, when and from which address. */
  r.get('/:token/acceptance.pdf', 'public', limiter, async (req, res) => {
    const record = await acceptanceRecord(config, parseOr400(TokenParam, req.params).token);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="${record.quoteNumber}-acceptance.pdf"`);
    res.setHeader('Cache-Control', 'no-store');
    res.send(await renderAcceptancePdf(record));
  });

  const w = secureRouter('/api/webhooks', table);
  w.post('/payments', 'public', express.raw({ type: '*/*', limit: '256kb' }), async (req, res) => {
    const raw = Buffer.isBuffer(req.body) ? req.body : Buffer.from(JSON.stringify(req.body ?? {}));
    const header = req.headers['stripe-signature'];
    res.json(await handleWebhook(sequelize, config, raw, Array.isArray(header) ? header[0] : header));
  });
  return [r.router, w.router];
}
