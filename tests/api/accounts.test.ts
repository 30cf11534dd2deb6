/**
 * A job's account after the agreement: the deposit receipt, hand-recorded payments and over-payment refused, the tax
 * invoice with its tax worked out by hand, credit notes (with the refund they need), the balance paid by card through
 * the payment stand-in, webhooks counted exactly once however they are replayed, gap-free document numbers under
 * parallel requests, issued documents never edited, the owed list by age, and the balance rule as a property.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import Decimal from 'decimal.js';
import fc from 'fast-check';
import { QueryTypes } from 'sequelize';
import Stripe from 'stripe';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AccountDto, OwedPage, PublicAccount } from '../../shared/schemas/accounts';
import { AccountDocument, AccountEntry, Job, Payment, Quote } from '../../server/models';
import { currentWorkshop } from '../../server/services/workshops';
import { balanceOf, taxSplit } from '../../server/services/accounts';
import { createSequelize } from '../../server/db/sequelize';
import { closeTestApp, getTestApp, signInAs, startServices, testDatabaseUrl, type Session } from '../helpers/app';
import { today as workshopToday } from '../../shared/time';

const { app, config, sequelize } = getTestApp();
/** The owning role: only it may switch a table's trigger off (the app's role owns no table). */
const ownerDb = createSequelize(testDatabaseUrl(), { poolMax: 1 });
let services: Awaited<ReturnType<typeof startServices>>;
let estimator: Session;
let sales: Session;
let owner: Session;
let server: http.Server;
let keptPricing: { taxPct: number; taxLabel: string } | null = null;
let keptStage: string | null = null;

beforeAll(async () => {
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  config.publicUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  services = await startServices();
  estimator = await signInAs(app, 'estimator');
  sales = await signInAs(app, 'sales');
  owner = await signInAs(app, 'owner');
  // The figures below are worked by hand at 20 % VAT: this file sets the workshop's rate, and puts it back after.
  const w = (await currentWorkshop())!;
  keptPricing = { taxPct: w.settings.pricing.taxPct, taxLabel: w.settings.pricing.taxLabel };
  await w.update({ settings: { ...w.settings, pricing: { ...w.settings.pricing, taxPct: 20, taxLabel: 'VAT' } } });
  keptStage = (await owner.agent.get('/api/accounts/settings').expect(200)).body.invoiceStage;
  await put(owner, '/api/accounts/settings', { invoiceStage: 'accepted' }).expect(200);
});

afterAll(async () => {
  await ownerDb.close();
  if (keptPricing) {
    const w = (await currentWorkshop())!;
    await w.update({ settings: { ...w.settings, pricing: { ...w.settings.pricing, ...keptPricing } } });
  }
  if (keptStage && owner) await put(owner, '/api/accounts/settings', { invoiceStage: keptStage });
  await services?.stop();
  server?.closeAllConnections();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const put = (s: Session, url: string, body: object) => s.agent.put(url).set('x-csrf-token', s.csrf).send(body);
const problem = (res: request.Response) => JSON.parse(res.text) as { status: number; code: string; detail: string; field?: string };
const pub = (token: string, rest = '') => `/api/public/quotes/${token}${rest}`;
const binary = (req: request.Test) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

function pdfText(pdf: Buffer): string {
  const file = path.join(os.tmpdir(), `accounts-${process.pid}-${Date.now()}-${Math.random()}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
  } finally {
    fs.rmSync(file, { force: true });
  }
}

let serial = 0;
/**
 * An accepted quote of one piece whose agreed total is set to `total` (deposit `depositPct` of it), so that every
 * figure after it can be worked by hand. Returns the quote id and the customer's link token.
 */
async function agreement(total = '1234.56', depositPct = 25): Promise<{ id: number; token: string; number: string }> {
  serial++;
  const tag = `${process.pid}-${serial}`;
  const c = await post(sales, '/api/customers', { name: `Account Customer ${serial}`, email: `account.${tag}@example.com`, address: '4 Varnish Row\nOldbury OK1 4MK' }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Rosewood upright ${serial}` }).expect(201);
  const e = await post(estimator, '/api/estimates', {
    customerId: c.body.id,
    pieceId: p.body.id,
    input: { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish', discountPct: 0 },
  }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, { depositPct }).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  const token = String(sent.body.link).split('/q/')[1]!;
  await request(app).post(pub(token, '/accept')).send({ name: 'Ottoline Brack', acceptTerms: true, extras: [] }).expect(200);
  const deposit = new Decimal(total).times(depositPct).dividedBy(100).toDecimalPlaces(2, Decimal.ROUND_HALF_UP).toFixed(2);
  await Quote.update({ total, acceptedTotal: total, acceptedDeposit: deposit }, { where: { id: q.body.id } });
  await sequelize.query('UPDATE quote_lines SET total = :total WHERE quote_id = :id', { replacements: { total, id: q.body.id } });
  return { id: q.body.id, token, number: q.body.number };
}

/** Pays the deposit through the payment stand-in, as the customer would. */
async function payDeposit(token: string): Promise<void> {
  const res = await request(app).post(pub(token, '/deposit')).send({}).expect(200);
  await services.payments!.pay(String(res.body.url).split('/checkout/')[1]!);
}

const account = async (id: number): Promise<AccountDto> => (await sales.agent.get(`/api/accounts/quotes/${id}`).expect(200)).body;

describe('the deposit receipt, payments by hand, the tax invoice, credit notes and the balance by card', () => {
  it('works every figure to the penny, from deposit to settled', async () => {
    const q = await agreement('1234.56', 25);
    const mailBefore = services.mail!.messages.length;
    await payDeposit(q.token);

    // Deposit 25 % of 1,234.56 = 308.64; its receipt carries 308.64 / 6 = 51.44 of VAT; 925.92 left.
    let a = await account(q.id);
    expect(a.figures).toMatchObject({ agreedTotal: '1234.56', paid: '308.64', credited: '0.00', refunded: '0.00', balance: '925.92' });
    expect(a.entries).toHaveLength(1);
    expect(a.entries[0]).toMatchObject({ kind: 'payment', method: 'card', amount: '308.64' });
    const receipt = a.documents.find((d) => d.kind === 'receipt')!;
    expect(receipt).toMatchObject({ total: '308.64', tax: '51.44', net: '257.20', balanceDue: '925.92', mail: { status: 'sent' } });
    expect(receipt.number).toMatch(/^RC-\d{5}$/);
    expect(a.entries[0]!.receiptNumber).toBe(receipt.number);
    expect(services.mail!.messages.length).toBe(mailBefore + 1);
    expect(services.mail!.messages.at(-1)!.raw).toContain(`Receipt ${receipt.number}`);
    const receiptText = pdfText((await binary(sales.agent.get(`/api/accounts/documents/${receipt.id}/pdf`)).expect(200)).body as Buffer);
    expect(receiptText).toContain(`Receipt ${receipt.number}`);
    expect(receiptText).toContain('£308.64');
    expect(receiptText).toContain('£925.92');
    expect(receiptText).toMatch(/flammable/);

    // Cash 400.00 by hand: 525.92 left; its receipt's VAT is 400 / 6 = 66.666… → 66.67.
    const cash = await post(sales, `/api/accounts/quotes/${q.id}/payments`, { method: 'cash', amount: '400.00', receivedOn: workshopToday(), reference: 'Till slip 0042' }).expect(201);
    a = cash.body;
    expect(a.figures.balance).toBe('525.92');
    expect(a.documents.filter((d) => d.kind === 'receipt').at(-1)).toMatchObject({ total: '400.00', tax: '66.67', net: '333.33', balanceDue: '525.92' });

    // One penny more than is owed is refused, naming the amount; nothing is written.
    const over = await post(sales, `/api/accounts/quotes/${q.id}/payments`, { method: 'bank-transfer', amount: '525.93', receivedOn: workshopToday() });
    expect(over.status).toBe(400);
    expect(problem(over)).toMatchObject({ code: 'overpayment', field: 'amount' });
    expect(problem(over).detail).toContain('£525.92');
    expect(await AccountEntry.count({ where: { quoteId: q.id } })).toBe(2);

    // The tax invoice: 1,234.56 with VAT 1,234.56 × 20 / 120 = 205.76, net 1,028.80; 708.64 deducted; 525.92 due.
    const inv = await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {}).expect(201);
    a = inv.body;
    const invoice = a.documents.find((d) => d.kind === 'invoice')!;
    expect(invoice).toMatchObject({ total: '1234.56', tax: '205.76', net: '1028.80', taxLabel: 'VAT', taxPct: 20, balanceDue: '525.92', mail: { status: 'sent' } });
    expect(invoice.number).toMatch(/^INV-\d{5}$/);
    const invoiceText = pdfText((await binary(sales.agent.get(`/api/accounts/documents/${invoice.id}/pdf`)).expect(200)).body as Buffer);
    for (const s of [`Tax invoice ${invoice.number}`, 'Account Customer', '4 Varnish Row', q.number, '£1,234.56', '£205.76', '£1,028.80', 'VAT at 20%', '£308.64', '£400.00', 'Balance due', '£525.92']) {
      expect(invoiceText).toContain(s);
    }
    for (const word of [/per hour/i, /overhead/i, /margin/i]) expect(invoiceText).not.toMatch(word);
    expect(invoiceText).toMatch(/flammable/);
    // Only one invoice for an agreement.
    const again = await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {});
    expect(again.status).toBe(409);
    expect(problem(again).detail).toContain(invoice.number);

    // An issued invoice is never edited: a 409 that says to credit it; the database refuses it too.
    for (const method of ['patch', 'put'] as const) {
      const edit = await sales.agent[method](`/api/accounts/documents/${invoice.id}`).set('x-csrf-token', sales.csrf).send({ total: '1.00' });
      expect(edit.status).toBe(409);
      expect(problem(edit)).toMatchObject({ code: 'document_issued' });
      expect(problem(edit).detail).toMatch(/credit note/);
    }
    await expect(AccountDocument.update({ total: '1.00', net: '1.00', tax: '0.00' }, { where: { id: invoice.id } })).rejects.toThrow(/never changed/);
    await expect(AccountDocument.destroy({ where: { id: invoice.id } })).rejects.toThrow(/never deleted/);

    // A credit note of 100.00 (VAT 16.67, net 83.33): 425.92 owed.
    const cn = await post(sales, `/api/accounts/documents/${invoice.id}/credit-notes`, { amount: '100.00', reason: 'A scuff on the lid was touched in at no charge' }).expect(201);
    a = cn.body;
    const credit = a.documents.find((d) => d.kind === 'credit-note')!;
    expect(credit).toMatchObject({ total: '100.00', tax: '16.67', net: '83.33', balanceDue: '425.92', againstNumber: invoice.number });
    expect(credit.number).toMatch(/^CN-\d{5}$/);
    expect(a.figures).toMatchObject({ credited: '100.00', balance: '425.92' });
    const creditText = pdfText((await binary(sales.agent.get(`/api/accounts/documents/${credit.id}/pdf`)).expect(200)).body as Buffer);
    for (const s of [`Credit note ${credit.number}`, `against invoice ${invoice.number}`, '£100.00', '£16.67', 'A scuff on the lid']) expect(creditText).toContain(s);

    // The customer's page: the balance, and a pay button that opens a card checkout for exactly 425.92.
    const page = (await request(app).get(pub(q.token, '/account')).expect(200)).body as PublicAccount;
    expect(page).toMatchObject({ agreedTotal: '1234.56', paid: '708.64', credited: '100.00', balance: '425.92', canPay: true });
    expect(JSON.stringify(page)).not.toMatch(/margin|overhead|per hour/i);
    expect(page.documents.map((d) => d.number)).toEqual(expect.arrayContaining([receipt.number, invoice.number, credit.number]));
    const pubPdf = pdfText((await binary(request(app).get(pub(q.token, `/documents/${invoice.id}/pdf`))).expect(200)).body as Buffer);
    expect(pubPdf).toContain(invoice.number);
    const checkout = await request(app).post(pub(q.token, '/balance')).send({}).expect(200);
    const sessionId = String(checkout.body.url).split('/checkout/')[1]!;
    expect(services.payments!.sessions.get(sessionId)!.amount_total).toBe(42592);
    // Asking again gives the same checkout.
    expect((await request(app).post(pub(q.token, '/balance')).send({}).expect(200)).body).toMatchObject({ url: checkout.body.url, reused: true });
    await services.payments!.pay(sessionId);
    a = await account(q.id);
    expect(a.figures).toMatchObject({ paid: '1134.56', balance: '0.00' });
    expect(a.entries.at(-1)).toMatchObject({ method: 'card', amount: '425.92' });
    expect(a.documents.filter((d) => d.kind === 'receipt').at(-1)).toMatchObject({ total: '425.92', balanceDue: '0.00' });
    expect((await request(app).get(pub(q.token, '/account')).expect(200)).body).toMatchObject({ balance: '0.00', canPay: false });
    expect((await request(app).post(pub(q.token, '/balance')).send({})).status).toBe(409);

    // Settled: a further credit of 50.00 has been paid, so it must say how it is refunded.
    const noRefund = await post(sales, `/api/accounts/documents/${invoice.id}/credit-notes`, { amount: '50.00', reason: 'Castor cups not fitted' });
    expect(noRefund.status).toBe(400);
    expect(problem(noRefund)).toMatchObject({ code: 'refund_required', field: 'refund' });
    const refunded = await post(sales, `/api/accounts/documents/${invoice.id}/credit-notes`, { amount: '50.00', reason: 'Castor cups not fitted', refund: { method: 'bank-transfer', reference: 'BACS 7781' } }).expect(201);
    a = refunded.body;
    // 1,234.56 − 150.00 credited − 1,134.56 paid + 50.00 refunded = 0.00.
    expect(a.figures).toMatchObject({ agreedTotal: '1234.56', credited: '150.00', paid: '1134.56', refunded: '50.00', balance: '0.00' });
    expect(a.entries.at(-1)).toMatchObject({ kind: 'refund', method: 'bank-transfer', amount: '50.00', creditNoteNumber: a.documents.at(-1)!.number });
    // More than the invoice still carries (1,234.56 − 150.00 = 1,084.56) is refused.
    const tooMuch = await post(sales, `/api/accounts/documents/${invoice.id}/credit-notes`, { amount: '1084.57', reason: 'Typing slip', refund: { method: 'cash' } });
    expect(problem(tooMuch)).toMatchObject({ status: 400, code: 'credit_too_large', field: 'amount' });
  });

  it('an invoice waits for the stage the owner chose; the owner alone chooses it', async () => {
    const q = await agreement('600.00', 30);
    expect((await put(sales, '/api/accounts/settings', { invoiceStage: 'finished' })).status).toBe(403);
    expect((await sales.agent.get('/api/accounts/settings').expect(200)).body).toMatchObject({ canChange: false });
    expect((await owner.agent.get('/api/accounts/settings').expect(200)).body).toMatchObject({ canChange: true });
    expect(problem(await put(owner, '/api/accounts/settings', { invoiceStage: 'whenever' }))).toMatchObject({ status: 400, field: 'invoiceStage' });
    await put(owner, '/api/accounts/settings', { invoiceStage: 'finished' }).expect(200);
    try {
      let a = await account(q.id);
      expect(a.invoice).toMatchObject({ canIssue: false });
      expect(a.invoice.why).toMatch(/no job yet/);
      const early = await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {});
      expect(problem(early)).toMatchObject({ status: 409, code: 'invoice_not_due' });
      await payDeposit(q.token);
      const job = await post(owner, '/api/jobs', { quoteId: q.id }).expect(201);
      const unfinished = await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {});
      expect(problem(unfinished).detail).toContain(job.body.number);
      await Job.update({ state: 'finished', finishedAt: new Date() }, { where: { id: job.body.id } });
      a = (await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {}).expect(201)).body;
      // 600.00 at 20 %: VAT 100.00, net 500.00; deposit 180.00 deducted, 420.00 due.
      expect(a.documents.find((d) => d.kind === 'invoice')).toMatchObject({ total: '600.00', tax: '100.00', net: '500.00', balanceDue: '420.00' });
    } finally {
      await put(owner, '/api/accounts/settings', { invoiceStage: 'accepted' }).expect(200);
    }
  });

  it('bad input is a 400 naming the field; other roles are refused', async () => {
    const q = await agreement('300.00', 20);
    const today = workshopToday();
    const cases: [object, string][] = [
      [{ method: 'card', amount: '10.00', receivedOn: today }, 'method'],
      [{ method: 'cash', amount: '10.001', receivedOn: today }, 'amount'],
      [{ method: 'cash', amount: '0', receivedOn: today }, 'amount'],
      [{ method: 'cash', amount: '-5', receivedOn: today }, 'amount'],
      [{ method: 'cheque', amount: '10.00', receivedOn: '2026-02-30' }, 'receivedOn'],
      [{ method: 'cheque', amount: '10.00', receivedOn: '2099-01-01' }, 'receivedOn'],
    ];
    for (const [body, field] of cases) {
      const res = await post(sales, `/api/accounts/quotes/${q.id}/payments`, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(problem(res).field).toBe(field);
    }
    const workshop = await signInAs(app, 'workshop');
    expect((await post(workshop, `/api/accounts/quotes/${q.id}/payments`, { method: 'cash', amount: '10.00', receivedOn: today })).status).toBe(403);
    expect((await estimator.agent.get('/api/accounts/owed')).status).toBe(403);
    expect(await AccountEntry.count({ where: { quoteId: q.id } })).toBe(0);
  });
});

describe('numbers and webhooks under parallel requests', () => {
  it('invoices and receipts issued in parallel take consecutive numbers: no gaps, no duplicates', async () => {
    const quotes = await Promise.all(Array.from({ length: 5 }, () => agreement('500.00', 20)));
    const maxSeq = async (kind: string) => Number((await AccountDocument.max<number, AccountDocument>('seq', { where: { kind } })) ?? 0);
    const invBefore = await maxSeq('invoice');
    const rcBefore = await maxSeq('receipt');
    const today = workshopToday();
    // Two invoice requests for each agreement (one must fail and roll back its number), and on the first agreement
    // eight payments of 150.00 against 500.00 owed (three fit; the rest are refused and roll back).
    const results = await Promise.all([
      ...quotes.flatMap((q) => [post(sales, `/api/accounts/quotes/${q.id}/invoice`, {}), post(owner, `/api/accounts/quotes/${q.id}/invoice`, {})]),
      ...Array.from({ length: 8 }, (_, i) => post(i % 2 ? sales : owner, `/api/accounts/quotes/${quotes[0]!.id}/payments`, { method: 'bank-transfer', amount: '150.00', receivedOn: today, reference: `T${i}` })),
    ]);
    const invoiceAnswers = results.slice(0, 10);
    const paymentAnswers = results.slice(10);
    expect(invoiceAnswers.filter((r) => r.status === 201)).toHaveLength(5);
    for (const r of invoiceAnswers.filter((x) => x.status !== 201)) expect(problem(r)).toMatchObject({ status: 409, code: 'invoice_not_due' });
    expect(paymentAnswers.filter((r) => r.status === 201)).toHaveLength(3);
    for (const r of paymentAnswers.filter((x) => x.status !== 201)) expect(problem(r)).toMatchObject({ status: 400, code: 'overpayment', field: 'amount' });

    const invoices = await AccountDocument.findAll({ where: { kind: 'invoice', quoteId: quotes.map((q) => q.id) }, order: [['seq', 'ASC']] });
    expect(invoices.map((d) => d.seq)).toEqual([1, 2, 3, 4, 5].map((n) => invBefore + n));
    expect(new Set(invoices.map((d) => d.number)).size).toBe(5);
    const receipts = await AccountDocument.findAll({ where: { kind: 'receipt', quoteId: quotes[0]!.id }, order: [['seq', 'ASC']] });
    expect(receipts.map((d) => d.seq)).toEqual([1, 2, 3].map((n) => rcBefore + n));
    // Nothing else took a number meanwhile: the counter stands at the last one given.
    const [counter] = await sequelize.query<{ last_number: number }>(`SELECT last_number FROM document_counters WHERE kind = 'invoice'`, { type: QueryTypes.SELECT });
    expect(Number(counter!.last_number)).toBe(invBefore + 5);
    expect((await account(quotes[0]!.id)).figures.balance).toBe('50.00');
  });

  it('a balance payment is counted exactly once, however many times its webhook arrives and in whatever order', async () => {
    const q = await agreement('800.00', 25);
    await payDeposit(q.token);
    const checkout = await request(app).post(pub(q.token, '/balance')).send({}).expect(200);
    const sessionId = String(checkout.body.url).split('/checkout/')[1]!;
    await services.payments!.pay(sessionId);
    const session = services.payments!.sessions.get(sessionId)!;
    // The same event again, and nine new events for the same payment, all at once.
    const signer = new Stripe(config.payments.secretKey!);
    const deliveries = Array.from({ length: 10 }, (_, i) => {
      const payload = JSON.stringify({ id: i < 2 ? `evt_replay_${sessionId}` : `evt_${i}_${sessionId}`, object: 'event', type: 'checkout.session.completed', account: session.account, created: Math.floor(Date.now() / 1000), data: { object: session }, livemode: false });
      const header = signer.webhooks.generateTestHeaderString({ payload, secret: config.payments.webhookSecret! });
      return request(app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', header).send(payload);
    });
    const answers = await Promise.all(deliveries);
    for (const r of answers) expect(r.status).toBe(200);
    // The replayed event id is handled once at most; the other deliveries find the payment already counted.
    expect(answers.filter((r) => r.body.duplicate === true).length).toBeGreaterThanOrEqual(1);
    const payment = (await Payment.findOne({ where: { providerSessionId: sessionId } }))!;
    expect(payment).toMatchObject({ status: 'paid', flag: null, purpose: 'balance' });
    const entries = await AccountEntry.findAll({ where: { quoteId: q.id }, order: [['id', 'ASC']] });
    expect(entries.map((e) => [e.method, e.amount])).toEqual([
      ['card', '200.00'],
      ['card', '600.00'],
    ]);
    expect(await AccountDocument.count({ where: { quoteId: q.id, kind: 'receipt' } })).toBe(2);
    expect((await account(q.id)).figures.balance).toBe('0.00');
    // A forged delivery is refused.
    const forged = await request(app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', 't=1,v1=00').send('{}');
    expect(forged.status).toBe(400);
  });

  it('a card payment of a balance settled meanwhile by hand is flagged and refunded, not counted', async () => {
    const q = await agreement('400.00', 50);
    await payDeposit(q.token);
    const checkout = await request(app).post(pub(q.token, '/balance')).send({}).expect(200);
    const sessionId = String(checkout.body.url).split('/checkout/')[1]!;
    // The customer pays while staff record a cheque for the same balance: the provider took the money anyway.
    await post(sales, `/api/accounts/quotes/${q.id}/payments`, { method: 'cheque', amount: '200.00', receivedOn: workshopToday() }).expect(201);
    await services.payments!.pay(sessionId, { force: true });
    const payment = (await Payment.findOne({ where: { providerSessionId: sessionId } }))!;
    expect(payment.flag).toBe('duplicate');
    expect(payment.status).toBe('refunded');
    const a = await account(q.id);
    expect(a.figures).toMatchObject({ paid: '400.00', balance: '0.00' });
    expect(a.entries.filter((e) => e.method === 'card')).toHaveLength(1);
  });
});

describe('what customers owe, by age', () => {
  it('lists invoiced balances with ageing buckets, sorted and paged', async () => {
    const ages = [5, 45, 90];
    const made: { id: number; age: number }[] = [];
    for (const age of ages) {
      const q = await agreement('120.00', 0);
      const a = (await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {}).expect(201)).body as AccountDto;
      const inv = a.documents.find((d) => d.kind === 'invoice')!;
      // Issued "age" days ago, at noon on the workshop's clock (so that a daylight-saving change between then and
      // now, late in the evening, does not move it to the next day): the date is moved past the trigger, as a
      // back-dated import would be.
      await ownerDb.transaction(async (transaction) => {
        await ownerDb.query('ALTER TABLE account_documents DISABLE TRIGGER account_documents_issued', { transaction });
        await ownerDb.query(
          `UPDATE account_documents d SET issued_at = ((now() AT TIME ZONE z.zone)::date - :age + time '12:00') AT TIME ZONE z.zone
             FROM (SELECT w.id, COALESCE(w.settings->>'timeZone', 'Europe/London') AS zone FROM workshops w) z
            WHERE z.id = d.workshop_id AND d.id = :id`,
          { replacements: { age, id: inv.id }, transaction },
        );
        await ownerDb.query('ALTER TABLE account_documents ENABLE TRIGGER account_documents_issued', { transaction });
      });
      made.push({ id: q.id, age });
    }
    const all: OwedPage['rows'] = [];
    for (let page = 1; ; page++) {
      const res = (await sales.agent.get('/api/accounts/owed').query({ sort: 'age', dir: 'desc', pageSize: 2, page }).expect(200)).body as OwedPage;
      all.push(...res.rows);
      if (res.rows.length < 2) break;
    }
    const mine = all.filter((r) => made.some((m) => m.id === r.quoteId));
    expect(mine.map((r) => [r.ageDays, r.bucket, r.balance])).toEqual([
      [90, '60+', '120.00'],
      [45, '31-60', '120.00'],
      [5, '0-30', '120.00'],
    ]);
    // Sorted by age, descending, across pages.
    for (let i = 1; i < all.length; i++) expect(all[i - 1]!.ageDays).toBeGreaterThanOrEqual(all[i]!.ageDays);
    const old = (await sales.agent.get('/api/accounts/owed').query({ bucket: '60+', pageSize: 100 }).expect(200)).body as OwedPage;
    expect(old.rows.every((r) => r.ageDays > 60)).toBe(true);
    expect(old.rows.some((r) => r.quoteId === made[2]!.id)).toBe(true);
    expect(old.buckets.find((b) => b.bucket === '60+' && b.currency === 'GBP')!.count).toBeGreaterThanOrEqual(1);
    const bad = await sales.agent.get('/api/accounts/owed').query({ sort: 'margin' });
    expect(problem(bad)).toMatchObject({ status: 400, field: 'sort' });
    // Paid off: it leaves the list.
    await post(sales, `/api/accounts/quotes/${made[0]!.id}/payments`, { method: 'cash', amount: '120.00', receivedOn: workshopToday() }).expect(201);
    const after = (await sales.agent.get('/api/accounts/owed').query({ bucket: '0-30', pageSize: 100 }).expect(200)).body as OwedPage;
    expect(after.rows.some((r) => r.quoteId === made[0]!.id)).toBe(false);
  });
});

describe('the balance rule', () => {
  it('taxSplit: net + tax is the amount, the tax within half a penny of the exact fraction', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 0, max: 3000 }), (cents, pctHundredths) => {
        const gross = (cents / 100).toFixed(2);
        const pct = pctHundredths / 100;
        const { net, tax } = taxSplit(gross, pct);
        expect(Math.round(Number(net) * 100) + Math.round(Number(tax) * 100)).toBe(cents);
        // exact tax in cents = cents × pct / (100 + pct)
        expect(Math.abs(Math.round(Number(tax) * 100) - (cents * pct) / (100 + pct))).toBeLessThanOrEqual(0.5 + 1e-9);
      }),
    );
    expect(balanceOf({ agreedTotal: '1234.56', credited: '150.00', paid: '1134.56', refunded: '50.00' })).toBe('0.00');
  });

  it('after any sequence of payments and credit notes, balance = agreed total − credited − paid + refunded and never below zero', async () => {
    const today = workshopToday();
    const op = fc.oneof(
      fc.record({ kind: fc.constant('pay' as const), cents: fc.integer({ min: 1, max: 60_000 }), method: fc.constantFrom('cash', 'cheque', 'bank-transfer') }),
      fc.record({ kind: fc.constant('credit' as const), cents: fc.integer({ min: 1, max: 40_000 }), refund: fc.boolean() }),
    );
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 100, max: 90_000 }), fc.array(op, { minLength: 1, maxLength: 5 }), async (totalCents, ops) => {
        const total = (totalCents / 100).toFixed(2);
        const q = await agreement(total, 0);
        const inv = (await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {}).expect(201)).body as AccountDto;
        const invoiceId = inv.documents.find((d) => d.kind === 'invoice')!.id;
        let balance = totalCents;
        let creditLeft = totalCents;
        let paid = 0;
        let credited = 0;
        let refunded = 0;
        for (const o of ops) {
          const amount = (o.cents / 100).toFixed(2);
          if (o.kind === 'pay') {
            const res = await post(sales, `/api/accounts/quotes/${q.id}/payments`, { method: o.method, amount, receivedOn: today });
            if (o.cents > balance) {
              expect(problem(res)).toMatchObject({ status: 400, field: 'amount' });
            } else {
              expect(res.status).toBe(201);
              balance -= o.cents;
              paid += o.cents;
            }
          } else {
            const res = await post(sales, `/api/accounts/documents/${invoiceId}/credit-notes`, { amount, reason: 'Property check', ...(o.refund ? { refund: { method: 'bank-transfer' } } : {}) });
            if (o.cents > creditLeft) expect(problem(res)).toMatchObject({ status: 400, field: 'amount' });
            else if (o.cents > balance && !o.refund) expect(problem(res)).toMatchObject({ status: 400, field: 'refund' });
            else if (o.cents <= balance && o.refund) expect(problem(res)).toMatchObject({ status: 400, field: 'refund' });
            else {
              expect(res.status).toBe(201);
              creditLeft -= o.cents;
              credited += o.cents;
              const excess = Math.max(0, o.cents - balance);
              refunded += excess;
              balance = Math.max(0, balance - o.cents);
            }
          }
          const f = (await account(q.id)).figures;
          const c = (s: string) => Math.round(Number(s) * 100);
          expect([c(f.paid), c(f.credited), c(f.refunded), c(f.balance)]).toEqual([paid, credited, refunded, balance]);
          expect(c(f.balance)).toBe(totalCents - credited - paid + refunded);
          expect(c(f.balance)).toBeGreaterThanOrEqual(0);
        }
      }),
      { numRuns: 6 },
    );
    // Each run makes a fresh agreement through the API: a generous guard against a hang, not a speed target.
  }, 300_000);
});
