/**
 * The money report and the accounting export through the API, against figures worked by hand: two agreements of
 * this file's own, paid by hand (a bank transfer that pays the deposit moves the quote to "deposit paid" as the card
 * would), invoiced, credited, one refund; the report's months move by exactly those amounts, the money held against
 * work not yet done and the owed list by age name them, and the accounting export lists one row a document or payment
 * with its net, tax and total (credit notes and refunds negative), every text cell safe to open in a spreadsheet.
 * Owner only.
 */
import { parse } from 'csv-parse/sync';
import Decimal from 'decimal.js';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AccountDto } from '../../shared/schemas/accounts';
import { localToday } from '../../shared/schemas/dates';
import type { MoneyReport } from '../../shared/schemas/reports';
import { AccountEntry, Payment, Quote } from '../../server/models';
import { currentWorkshop } from '../../server/services/workshops';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app, sequelize } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let estimator: Session;
let sales: Session;
let owner: Session;
let planner: Session;
let keptPricing: { taxPct: number; taxLabel: string } | null = null;
let keptStage: string | null = null;

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const put = (s: Session, url: string, body: object) => s.agent.put(url).set('x-csrf-token', s.csrf).send(body);

beforeAll(async () => {
  services = await startServices();
  [estimator, sales, owner, planner] = await Promise.all([signInAs(app, 'estimator'), signInAs(app, 'sales'), signInAs(app, 'owner'), signInAs(app, 'workshop')]);
  // The figures are worked by hand at 20 % VAT: this file sets the workshop's rate, and puts it back after.
  const w = (await currentWorkshop())!;
  keptPricing = { taxPct: w.settings.pricing.taxPct, taxLabel: w.settings.pricing.taxLabel };
  await w.update({ settings: { ...w.settings, pricing: { ...w.settings.pricing, taxPct: 20, taxLabel: 'VAT' } } });
  keptStage = (await owner.agent.get('/api/accounts/settings').expect(200)).body.invoiceStage;
  await put(owner, '/api/accounts/settings', { invoiceStage: 'accepted' }).expect(200);
});

afterAll(async () => {
  if (keptPricing) {
    const w = (await currentWorkshop())!;
    await w.update({ settings: { ...w.settings, pricing: { ...w.settings.pricing, ...keptPricing } } });
  }
  if (keptStage && owner) await put(owner, '/api/accounts/settings', { invoiceStage: keptStage });
  await services?.stop();
  await closeTestApp();
});

let serial = 0;
/** An accepted quote of one piece whose agreed total is `total`, with a deposit of `depositPct` of it; the customer named `name`. */
async function agreement(name: string, total: string, depositPct: number): Promise<{ id: number; token: string; number: string }> {
  serial++;
  const tag = `${process.pid}-${serial}`;
  const c = await post(sales, '/api/customers', { name, email: `money.${tag}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Walnut upright ${serial}` }).expect(201);
  const e = await post(estimator, '/api/estimates', {
    customerId: c.body.id,
    pieceId: p.body.id,
    input: { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish', discountPct: 0 },
  }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, { depositPct }).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  const token = String(sent.body.link).split('/q/')[1]!;
  await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Perpetua Lamb', acceptTerms: true, extras: [] }).expect(200);
  const deposit = new Decimal(total).times(depositPct).dividedBy(100).toDecimalPlaces(2, Decimal.ROUND_HALF_UP).toFixed(2);
  await Quote.update({ total, acceptedTotal: total, acceptedDeposit: deposit }, { where: { id: q.body.id } });
  await sequelize.query('UPDATE quote_lines SET total = :total WHERE quote_id = :id', { replacements: { total, id: q.body.id } });
  return { id: q.body.id, token, number: q.body.number };
}

const pay = async (quoteId: number, method: string, amount: string, reference = '') =>
  (await post(sales, `/api/accounts/quotes/${quoteId}/payments`, { method, amount, receivedOn: localToday(), reference }).expect(201)).body as AccountDto;

describe('a deposit paid by hand', () => {
  it('marks the deposit paid once what was received reaches it, and closes the open card checkout', async () => {
    // 25 % of 500.00: a deposit of 125.00.
    const b = await agreement(`Hand Deposit ${process.pid}`, '500.00', 25);
    // The customer opened the card checkout for the deposit, then paid by bank transfer instead.
    await request(app).post(`/api/public/quotes/${b.token}/deposit`).send({}).expect(200);
    expect(await Payment.count({ where: { quoteId: b.id, status: 'pending' } })).toBe(1);

    // 50.00 is part of the deposit: still only accepted.
    let a = await pay(b.id, 'bank-transfer', '50.00', 'Transfer 1');
    expect(a.quote.state).toBe('accepted');
    // 80.00 more makes 130.00, over the 125.00 deposit: deposit paid, as the card would have made it.
    a = await pay(b.id, 'bank-transfer', '80.00', 'Transfer 2');
    expect(a.quote.state).toBe('deposit-paid');
    const quote = (await Quote.findByPk(b.id))!;
    expect(quote.depositPaidAt).not.toBeNull();
    const estimate = await sequelize.query<{ state: string }>('SELECT e.state FROM estimates e JOIN quotes q ON q.estimate_id = e.id WHERE q.id = :id', { replacements: { id: b.id }, type: QueryTypes.SELECT });
    expect(estimate[0]!.state).toBe('deposit-paid');
    const second = (await AccountEntry.findAll({ where: { quoteId: b.id }, order: [['id', 'ASC']] }))[1]!;
    expect(second.note).toBe('Deposit');
    // The card checkout left open is closed at the provider.
    expect(await Payment.count({ where: { quoteId: b.id, status: 'pending' } })).toBe(0);
    // 500 − 130 = 370.00 still owed, payable by card now as after a card deposit.
    expect(a.figures.balance).toBe('370.00');

    // A payment on a quote that asks for no deposit leaves it accepted.
    const none = await agreement(`No Deposit ${process.pid}`, '200.00', 0);
    expect((await pay(none.id, 'cash', '20.00')).quote.state).toBe('accepted');
  });
});

describe('the money report and the accounting export', () => {
  it('moves by the hand-worked amounts, holds, owes and exports them to the penny, spreadsheet-safe', async () => {
    const today = localToday();
    const period = `from=${today.slice(0, 7)}-01&to=${today}`;
    const read = async () => (await owner.agent.get(`/api/reports/money?${period}`).expect(200)).body as MoneyReport;
    const before = await read();
    const month = (r: MoneyReport) => r.months.find((m) => m.month === today.slice(0, 7))!;

    // A customer whose name and references would be formulas in a spreadsheet.
    // 25 % of 1,234.56: a deposit of 308.64.
    const a = await agreement(`=HYPERLINK("http://example.com","Money ${process.pid}")`, '1234.56', 25);
    await pay(a.id, 'bank-transfer', '308.64', '@SUM(A1:A9)');
    await pay(a.id, 'cash', '400.00', '-2+3');
    let acc = (await post(sales, `/api/accounts/quotes/${a.id}/invoice`, {}).expect(201)).body as AccountDto;
    const invoice = acc.documents.find((d) => d.kind === 'invoice')!;
    // Credit 100.00 (VAT 100 × 20 / 120 = 16.67): 1,234.56 − 100 − 708.64 = 425.92 owed.
    acc = (await post(sales, `/api/accounts/documents/${invoice.id}/credit-notes`, { amount: '100.00', reason: 'Touch-up done free' }).expect(201)).body;
    expect(acc.figures.balance).toBe('425.92');

    let after = await read();
    const d = (k: 'invoiced' | 'credited' | 'received' | 'refunded' | 'net') => new Decimal(month(after)[k]).minus(month(before)[k]).toFixed(2);
    expect([d('invoiced'), d('credited'), d('received'), d('refunded'), d('net')]).toEqual(['1234.56', '100.00', '708.64', '0.00', '708.64']);
    expect(new Decimal(after.totals.received).minus(before.totals.received).toFixed(2)).toBe('708.64');
    // No job is planned yet: the 708.64 received is held against work not yet done.
    expect(after.held.rows.find((r) => r.quoteId === a.id)).toMatchObject({ held: '708.64', agreedTotal: '1234.56', openJobs: [] });
    // Owed: the invoice is today's, 425.92 in the 0–30 days bucket.
    expect(after.owed.rows.find((r) => r.quoteId === a.id)).toMatchObject({ invoiceNumber: invoice.number, balance: '425.92', ageDays: 0, bucket: '0-30' });
    const bucketDelta = new Decimal(after.owed.buckets.find((b) => b.bucket === '0-30')!.amount).minus(before.owed.buckets.find((b) => b.bucket === '0-30')!.amount);
    expect(bucketDelta.toFixed(2)).toBe('425.92');

    // A credit of 500.00 is 74.08 more than the 425.92 owed: refunded by bank transfer. VAT 500 × 20 / 120 = 83.33.
    acc = (await post(sales, `/api/accounts/documents/${invoice.id}/credit-notes`, { amount: '500.00', reason: 'Lid left as it was', refund: { method: 'bank-transfer', reference: '=1+1' } }).expect(201)).body;
    const credits = acc.documents.filter((x) => x.kind === 'credit-note');
    expect(acc.figures.balance).toBe('0.00');
    after = await read();
    expect([d('invoiced'), d('credited'), d('received'), d('refunded'), d('net')]).toEqual(['1234.56', '600.00', '708.64', '74.08', '634.56']);
    expect(after.held.rows.find((r) => r.quoteId === a.id)?.held).toBe('634.56');
    // Settled: no longer owed.
    expect(after.owed.rows.find((r) => r.quoteId === a.id)).toBeUndefined();
    expect(after.held.amount).toBe(after.held.rows.reduce((t, r) => t.plus(r.held), new Decimal(0)).toFixed(2));

    // The money CSV: one row a month then the totals, amounts written exactly.
    const moneyCsv = await owner.agent.get(`/api/reports/money.csv?${period}`).expect(200);
    expect(moneyCsv.headers['content-disposition']).toContain(`money-${today.slice(0, 7)}-01-${today}.csv`);
    const moneyRows = parse(moneyCsv.text.replace(/^\ufeff/, '')) as string[][];
    expect(moneyRows[0]![0]).toBe('Month');
    expect(moneyRows.at(-1)).toEqual(['Total', after.totals.invoiced, after.totals.credited, after.totals.received, after.totals.refunded, after.totals.net]);

    // The accounting export: this agreement's rows, worked by hand.
    const csv = await owner.agent.get(`/api/reports/accounting.csv?from=${today}&to=${today}`).expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const rows = parse(csv.text.replace(/^\ufeff/, '')) as string[][];
    expect(rows[0]).toEqual(['Date', 'Type', 'Number', 'Customer', 'Quote', 'Net', 'Tax', 'Tax rate (%)', 'Total', 'Currency', 'Method', 'Reference', 'Against invoice']);
    const mine = rows.filter((r) => r[4] === a.number);
    const customer = `'=HYPERLINK("http://example.com","Money ${process.pid}")`;
    const receipts = acc.entries.map((e) => e.receiptNumber);
    expect(mine).toEqual([
      [today, 'Tax invoice', invoice.number, customer, a.number, '1028.80', '205.76', '20', '1234.56', 'GBP', '', '', ''],
      [today, 'Credit note', credits[0]!.number, customer, a.number, '-83.33', '-16.67', '20', '-100.00', 'GBP', '', '', invoice.number],
      [today, 'Credit note', credits[1]!.number, customer, a.number, '-416.67', '-83.33', '20', '-500.00', 'GBP', '', '', invoice.number],
      [today, 'Payment received', receipts[0]!, customer, a.number, '', '', '', '308.64', 'GBP', 'Bank transfer', "'@SUM(A1:A9)", ''],
      [today, 'Payment received', receipts[1]!, customer, a.number, '', '', '', '400.00', 'GBP', 'Cash', "'-2+3", ''],
      [today, 'Refund made', credits[1]!.number, customer, a.number, '', '', '', '-74.08', 'GBP', 'Bank transfer', "'=1+1", ''],
    ]);
    // No text cell anywhere in the file starts a formula; only the product's own amounts start with a minus.
    for (const row of rows.slice(1)) {
      for (const [i, cell] of row.entries()) {
        if (['Net', 'Tax', 'Total'].includes(rows[0]![i]!) && /^-?\d+\.\d{2}$/.test(cell)) continue;
        expect(cell, `${rows[0]![i]}: ${cell}`).not.toMatch(/^[=+\-@\t\r]/);
      }
    }
  });

  it('is the owner\u2019s only, and says which end of the period is wrong', async () => {
    for (const s of [sales, estimator, planner]) {
      expect((await s.agent.get('/api/reports/money?from=2026-01-01&to=2026-01-31')).status).toBe(403);
      expect((await s.agent.get('/api/reports/money.csv?from=2026-01-01&to=2026-01-31')).status).toBe(403);
      expect((await s.agent.get('/api/reports/accounting.csv?from=2026-01-01&to=2026-01-31')).status).toBe(403);
    }
    const bad = await owner.agent.get('/api/reports/accounting.csv?from=2026-02-01&to=2026-01-01');
    expect(bad.status).toBe(400);
    expect(bad.body.field).toBe('to');
  });
});
