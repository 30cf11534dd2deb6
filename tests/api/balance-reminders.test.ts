/**
 * "Send a reminder" from the owed list: the owner's balance-due message with what is still owed, queued to the
 * customer through the message queue, delivered once and listed with the customer's messages; once a day per invoice
 * however many presses arrive at once; refused with a reason when there is no invoice or nothing is owed; for the
 * owner and sales only.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { Op } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CustomerMessagesPage } from '../../shared/schemas/messages';
import { OutboxMessage } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';
import { today as workshopToday } from '../../shared/time';

const { app, config, queue: appQueue } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let owner: Session;
let sales: Session;
let estimator: Session;
let planner: Session;
let server: http.Server;
let keptStage = 'finished';

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const put = (s: Session, url: string, body: object) => s.agent.put(url).set('x-csrf-token', s.csrf).send(body);
/** Waits for a condition, polling; the bound is generous (a busy shared machine), never a fixed sleep. */
const until = <T>(fn: () => Promise<T> | T) => expect.poll(fn, { timeout: 60_000, interval: 200 });
const today = () => workshopToday();

beforeAll(async () => {
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  config.publicUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  services = await startServices();
  [owner, sales, estimator, planner] = await Promise.all([signInAs(app, 'owner'), signInAs(app, 'sales'), signInAs(app, 'estimator'), signInAs(app, 'workshop')]);
  await appQueue!.start();
  // Invoices as soon as the quote is accepted, so each test's agreement can be invoiced without running its job.
  keptStage = (await owner.agent.get('/api/accounts/settings').expect(200)).body.invoiceStage as string;
  await put(owner, '/api/accounts/settings', { invoiceStage: 'accepted' }).expect(200);
});

afterAll(async () => {
  if (owner) await put(owner, '/api/accounts/settings', { invoiceStage: keptStage });
  await services?.stop();
  server?.closeAllConnections();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  await closeTestApp();
});

let made = 0;
/** An accepted quote for a customer of its own, with a part-payment in cash; invoiced unless told otherwise. */
async function owingAgreement(opts: { invoice?: boolean } = {}): Promise<{ quoteId: number; customerId: number; email: string; balance: string; invoice: string | null }> {
  made++;
  const tag = `${process.pid}-${made}`;
  const email = `reminders.${tag}@example.com`;
  const c = await post(sales, '/api/customers', { name: `Rosalind Quennell ${made}`, email }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'furniture', description: `Satinwood card table ${tag}` }).expect(201);
  const input = { piece: { template: 'cabinet', dimensions: { height: '75 cm', width: '90 cm', depth: '45 cm' }, species: 'satinwood', veneered: true }, system: 'full-repolish' };
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  const token = String(sent.body.link).split('/q/')[1]!;
  await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: `Rosalind Quennell ${made}`, acceptTerms: true, extras: [] }).expect(200);
  await post(sales, `/api/accounts/quotes/${q.body.id}/payments`, { method: 'cash', amount: '100.00', receivedOn: today(), reference: 'Counter book' }).expect(201);
  let invoice: string | null = null;
  if (opts.invoice !== false) invoice = (await post(sales, `/api/accounts/quotes/${q.body.id}/invoice`, {}).expect(201)).body.documents.find((d: { kind: string }) => d.kind === 'invoice').number;
  const account = await sales.agent.get(`/api/accounts/quotes/${q.body.id}`).expect(200);
  return { quoteId: q.body.id, customerId: c.body.id, email, balance: account.body.figures.balance as string, invoice };
}

/** The reminders queued for an agreement (the invoice's own e-mail is not one). */
const reminders = (quoteId: number) => OutboxMessage.count({ where: { quoteId, kind: 'balance-due', dedupeKey: { [Op.like]: 'balance-reminder:%' } } });
const gbp = (amount: string) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(Number(amount));
const mailText = (raw: string) => raw.replace(/=\r?\n/g, '').replace(/=C2=A3/g, '£').replace(/=3D/g, '=').replace(/\s+/g, ' ');

describe('a reminder from the owed list', () => {
  it('queues the balance-due message with what is owed; it is delivered once and listed with the customer’s messages', async () => {
    const a = await owingAgreement();
    const owed = await sales.agent.get('/api/accounts/owed').query({ sort: 'invoice', dir: 'desc', pageSize: 100 }).expect(200);
    expect(owed.body.rows.map((r: { quoteId: number }) => r.quoteId)).toContain(a.quoteId);

    const sent = await post(sales, `/api/accounts/quotes/${a.quoteId}/reminder`, {}).expect(201);
    expect(sent.body).toMatchObject({ to: a.email, amount: a.balance });
    const outboxId = sent.body.outboxId as number;
    await until(async () => (await OutboxMessage.findByPk(outboxId))?.status).toBe('sent');
    const row = (await OutboxMessage.findByPk(outboxId))!;
    expect(row).toMatchObject({ kind: 'balance-due', customerId: a.customerId, quoteId: a.quoteId, attempts: 1 });
    expect(row.dedupeKey).toMatch(/^balance-reminder:invoice:\d+:\d{4}-\d{2}-\d{2}$/);

    // The customer's messages list it, sent; the e-mail names the balance still owed and carries the safety note.
    const list = (await sales.agent.get(`/api/messages/customers/${a.customerId}`).query({ pageSize: 100 }).expect(200)).body as CustomerMessagesPage;
    expect(list.rows.filter((m) => m.id === outboxId)).toEqual([expect.objectContaining({ kind: 'balance-due', status: 'sent', to: a.email })]);
    const mails = services.mail!.messages.filter((m) => m.to.includes(a.email)).map((m) => mailText(m.raw)).filter((t) => t.includes('The balance still to pay is'));
    // The invoice's own e-mail carried the balance-due text once; the reminder is the second, with the same figure.
    expect(mails).toHaveLength(2);
    expect(mails[1]).toContain(`The balance still to pay is ${gbp(a.balance)}`);
    expect(mails[1]).toMatch(/flammable/i);

    // A second press the same day is refused, naming the message; nothing more is queued.
    const again = await post(sales, `/api/accounts/quotes/${a.quoteId}/reminder`, {}).expect(409);
    expect(again.body.code).toBe('already_reminded');
    expect(again.body.detail).toContain(`message ${outboxId}`);
    expect(await reminders(a.quoteId)).toBe(1);
  });

  it('presses arriving at the same moment make one reminder', async () => {
    const a = await owingAgreement();
    const presses = await Promise.all(Array.from({ length: 8 }, () => post(owner, `/api/accounts/quotes/${a.quoteId}/reminder`, {})));
    expect(presses.map((r) => r.status).sort()).toEqual([201, 409, 409, 409, 409, 409, 409, 409]);
    for (const r of presses.filter((x) => x.status === 409)) expect(r.body.code).toBe('already_reminded');
    const id = presses.find((r) => r.status === 201)!.body.outboxId as number;
    await until(async () => (await OutboxMessage.findByPk(id))?.status).toBe('sent');
    expect(await reminders(a.quoteId)).toBe(1);
  });

  it('is refused with a reason when there is no invoice or nothing is owed, and for roles that do not take payments', async () => {
    const notInvoiced = await owingAgreement({ invoice: false });
    const none = await post(sales, `/api/accounts/quotes/${notInvoiced.quoteId}/reminder`, {}).expect(409);
    expect(none.body.code).toBe('no_invoice');

    const paid = await owingAgreement();
    await post(sales, `/api/accounts/quotes/${paid.quoteId}/payments`, { method: 'bank-transfer', amount: paid.balance, receivedOn: today(), reference: 'Settled' }).expect(201);
    const nothing = await post(sales, `/api/accounts/quotes/${paid.quoteId}/reminder`, {}).expect(409);
    expect(nothing.body.code).toBe('nothing_owed');
    expect(nothing.body.detail).toContain(paid.invoice!);

    const owing = await owingAgreement();
    await post(estimator, `/api/accounts/quotes/${owing.quoteId}/reminder`, {}).expect(403);
    await post(planner, `/api/accounts/quotes/${owing.quoteId}/reminder`, {}).expect(403);
    await request(app).post(`/api/accounts/quotes/${owing.quoteId}/reminder`).send({}).expect((r) => expect([401, 403]).toContain(r.status));
    await post(sales, '/api/accounts/quotes/999999999/reminder', {}).expect(404);
    const bad = await post(sales, '/api/accounts/quotes/abc/reminder', {}).expect(400);
    expect(bad.body.field ?? JSON.stringify(bad.body)).toMatch(/id/);
    expect(await reminders(owing.quoteId)).toBe(0);
    expect(await reminders(notInvoiced.quoteId)).toBe(0);
    expect(await reminders(paid.quoteId)).toBe(0);
  });
});
