import type { Response } from 'express';
import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { AccountSettingsSchema, CreditNoteSchema, IssueInvoiceSchema, OwedQuerySchema, RecordPaymentSchema } from '@shared/schemas/accounts';
import { IdSchema } from '@shared/schemas/customers';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { can } from '@shared/roles';
import {
  balanceCheckout,
  documentPdf,
  getAccount,
  getSettings,
  issueCreditNote,
  issueInvoice,
  listOwed,
  publicAccount,
  publicDocumentPdf,
  recordPayment,
  refuseEdit,
  sendBalanceReminder,
  updateSettings,
} from '../services/accounts';
import { publicLinkLimiter } from '../http/public-limit';

const IdParam = z.object({ id: IdSchema });
const TokenParam = z.object({ token: z.string().min(10).max(200) });
const TokenDocParam = TokenParam.extend({ id: IdSchema });
/** A reminder takes nothing but the press: anything sent with it is refused before anything is looked at. */
const ReminderSchema = z.object({}).strict();

function pdf(res: Response, number: string, bytes: Buffer): void {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `inline; filename="${number.replace(/[^\w.-]/g, '_')}.pdf"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.send(bytes);
}

/** A job's account (by its accepted quote), the documents issued, the ledger and the owed list; and the customer's side. */
export function accountRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/accounts', table);
  r.get('/owed', 'takePayments', async (req, res) => res.json(await listOwed(parseOr400(OwedQuerySchema, req.query))));
  /** The setting, and whether the caller may change it (the owner alone). */
  r.get('/settings', 'takePayments', async (req, res) => res.json({ ...(await getSettings()), canChange: can(req.user!.role, 'editSettings') }));
  r.put('/settings', 'editSettings', async (req, res) => res.json(await updateSettings(sequelize, req.user!.id, parseOr400(AccountSettingsSchema, req.body))));
  r.get('/quotes/:id', 'takePayments', async (req, res) => res.json(await getAccount(parseOr400(IdParam, req.params).id)));
  r.post('/quotes/:id/payments', 'takePayments', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await recordPayment(sequelize, config, req.user!.id, id, parseOr400(RecordPaymentSchema, req.body)));
  });
  r.post('/quotes/:id/invoice', 'takePayments', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await issueInvoice(sequelize, config, req.user!.id, id, parseOr400(IssueInvoiceSchema, req.body ?? {})));
  });
  /** "Send a reminder" from the owed list: the balance-due message, queued to the customer, once a day per invoice. */
  r.post('/quotes/:id/reminder', 'takePayments', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    parseOr400(ReminderSchema, req.body ?? {});
    res.status(201).json(await sendBalanceReminder(sequelize, config, req.user!.id, id));
  });
  r.post('/documents/:id/credit-notes', 'takePayments', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await issueCreditNote(sequelize, config, req.user!.id, id, parseOr400(CreditNoteSchema, req.body)));
  });
  /** An issued document is never edited: the answer is always a 409 that says to credit it instead. */
  r.patch('/documents/:id', 'takePayments', async (req) => refuseEdit(parseOr400(IdParam, req.params).id));
  r.put('/documents/:id', 'takePayments', async (req) => refuseEdit(parseOr400(IdParam, req.params).id));
  r.get('/documents/:id/pdf', 'takePayments', async (req, res) => {
    const { number, pdf: bytes } = await documentPdf(parseOr400(IdParam, req.params).id);
    pdf(res, number, bytes);
  });

  const limiter = publicLinkLimiter();
  const p = secureRouter('/api/public/quotes', table);
  p.get('/:token/account', 'public', limiter, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await publicAccount(config, parseOr400(TokenParam, req.params).token));
  });
  p.post('/:token/balance', 'public', limiter, async (req, res) => {
    res.json(await balanceCheckout(sequelize, config, parseOr400(TokenParam, req.params).token));
  });
  p.get('/:token/documents/:id/pdf', 'public', limiter, async (req, res) => {
    const { token, id } = parseOr400(TokenDocParam, req.params);
    const { number, pdf: bytes } = await publicDocumentPdf(config, token, id);
    pdf(res, number, bytes);
  });
  return [r.router, p.router];
}
