/**
 * What the customer agreed is what the workshop keeps: one accepted quote per estimate (under 20 parallel
 * acceptances), outbox retries only for failed messages, one open checkout per quote (under 10 parallel requests),
 * expired and cancelled checkouts, a second payment flagged and refunded, a wrong amount flagged and not counted,
 * extras carried into every figure and into the job, the estimator's discount, private figures kept off the
 * customer's page, PDF and e-mail, and dates promised only once booked.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { UniqueConstraintError } from 'sequelize';
import { Estimate, Job, OutboxMessage, Payment, Quote, QuoteLine } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app, config } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let estimator: Session;
let sales: Session;
let owner: Session;
let workshop: Session;
let server: http.Server;

afterAll(async () => {
  await services?.stop();
  server?.closeAllConnections();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  await closeTestApp();
});

beforeAll(async () => {
  // The payment stand-in sends its webhooks over HTTP: the app listens on a loopback port for them.
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  config.publicUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  services = await startServices();
  estimator = await signInAs(app, 'estimator');
  sales = await signInAs(app, 'sales');
  owner = await signInAs(app, 'owner');
  workshop = await signInAs(app, 'workshop');
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const problem = (res: request.Response) => JSON.parse(res.text) as { status: number; code: string; detail: string; field?: string };
const tokenOf = (link: string) => link.split('/q/')[1]!;
const pub = (token: string, rest = '') => `/api/public/quotes/${token}${rest}`;
const accept = (token: string, extras: string[] = [], name = 'Perpetua Langstroth') =>
  request(app).post(pub(token, '/accept')).send({ name, acceptTerms: true, extras });
const upright = (discountPct = 0) => ({ piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish', discountPct });

let serial = 0;
async function pricedEstimate(discountPct = 0): Promise<number> {
  serial++;
  const c = await post(sales, '/api/customers', { name: `Agreement Customer ${serial}`, email: `agreement.${serial}.${process.pid}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Walnut upright ${serial}` }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: upright(discountPct) }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  return e.body.id;
}

const TWO_EXTRAS = [
  { label: 'Regulate the action', description: 'Key dip and let-off', hours: 6, price: '300.00' },
  { label: 'New castor cups', description: 'Turned walnut, felt bases', hours: 1.5, price: '80.00' },
];

/** A sent quote: its id and the customer's token. */
async function sentQuote(estimateId: number, body: object = {}): Promise<{ id: number; token: string }> {
  const q = await post(sales, `/api/estimates/${estimateId}/quotes`, body).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  return { id: q.body.id, token: tokenOf(sent.body.link) };
}

function pdfText(pdf: Buffer): string {
  const file = path.join(os.tmpdir(), `agreement-${process.pid}-${Date.now()}-${Math.random()}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
  } finally {
    fs.rmSync(file, { force: true });
  }
}
const binary = (req: request.Test) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });
const gbp = (amount: string) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(Number(amount));

/** Accepts and opens a checkout; returns the provider's session id. */
async function checkout(token: string): Promise<string> {
  const res = await request(app).post(pub(token, '/deposit')).send({}).expect(200);
  return String(res.body.url).split('/checkout/')[1]!;
}

describe('one agreement per estimate', () => {
  it('20 parallel acceptances of two quotes for one estimate end with exactly one accepted', async () => {
    const estimateId = await pricedEstimate();
    // Two quotes offered side by side (sending one no longer withdraws the other).
    const a = await sentQuote(estimateId, { message: 'Full repolish' });
    const b = await sentQuote(estimateId, { message: 'The same with a lower deposit', depositPct: 20 });
    expect((await Quote.findByPk(a.id))!.state).toBe('quoted');

    const answers = await Promise.all(Array.from({ length: 20 }, (_, i) => accept(i % 2 ? b.token : a.token, [], `Customer ${i}`)));
    const ok = answers.filter((r) => r.status === 200);
    const refused = answers.filter((r) => r.status !== 200);
    expect(ok).toHaveLength(1);
    expect(refused).toHaveLength(19);
    for (const r of refused) {
      expect(r.status).toBe(409);
      expect(['quote_accepted', 'quote_withdrawn', 'estimate_already_agreed']).toContain(problem(r).code);
    }
    const quotes = await Quote.findAll({ where: { estimateId } });
    expect(quotes.filter((q) => q.state === 'accepted')).toHaveLength(1);
    // The other quote was withdrawn by the acceptance, and its link says so.
    const accepted = quotes.find((q) => q.state === 'accepted')!;
    const other = quotes.find((q) => q.id !== accepted.id)!;
    expect(other.state).toBe('withdrawn');
    const otherToken = other.id === a.id ? a.token : b.token;
    const again = await accept(otherToken);
    expect(again.status).toBe(409);
    expect((await Estimate.findByPk(estimateId))!.state).toBe('accepted');
  });

  it('the database itself refuses a second accepted quote for an estimate (its piece, on the quote lines)', async () => {
    const estimateId = await pricedEstimate();
    const a = await sentQuote(estimateId);
    const b = await sentQuote(estimateId);
    await accept(a.token).expect(200);
    // The one agreement sits on the chosen quote lines' piece (quote_lines_one_agreement).
    await expect(QuoteLine.update({ chosen: true, agreed: true }, { where: { quoteId: b.id } })).rejects.toBeInstanceOf(UniqueConstraintError);
    // And an accepted deposit that is not the deposit percentage of the accepted total.
    await expect(Quote.update({ acceptedDeposit: '1.00' }, { where: { id: a.id } })).rejects.toThrow(/quotes_accepted_deposit/);
  });

  it('once accepted, no other quote for the estimate can be made or sent: a 409 names the accepted quote', async () => {
    const estimateId = await pricedEstimate();
    const a = await sentQuote(estimateId);
    const draft = await post(sales, `/api/estimates/${estimateId}/quotes`, {}).expect(201);
    await accept(a.token).expect(200);
    const number = (await Quote.findByPk(a.id))!.number;

    const send = await post(sales, `/api/quotes/${draft.body.id}/send`, {});
    expect(send.status).toBe(409);
    // The draft was withdrawn by the acceptance.
    expect(problem(send).code).toBe('quote_closed');
    // A draft made meanwhile that escaped withdrawal (state forced back) is still refused, naming the accepted quote.
    await Quote.update({ state: 'draft', revoked: false }, { where: { id: draft.body.id } });
    const send2 = await post(sales, `/api/quotes/${draft.body.id}/send`, {});
    expect(send2.status).toBe(409);
    expect(problem(send2)).toMatchObject({ code: 'estimate_already_agreed' });
    expect(problem(send2).detail).toContain(number);
    const make = await post(sales, `/api/estimates/${estimateId}/quotes`, {});
    expect(make.status).toBe(409);
    expect(problem(make).detail).toContain(number);
  });

  it('one estimate never yields two jobs', async () => {
    const estimateId = await pricedEstimate();
    const a = await sentQuote(estimateId);
    await accept(a.token).expect(200);
    const results = await Promise.all(Array.from({ length: 4 }, () => post(workshop, '/api/jobs', { quoteId: a.id })));
    expect(results.filter((r) => r.status === 201)).toHaveLength(1);
    for (const r of results.filter((x) => x.status !== 201)) expect(r.status).toBe(409);
    expect(await Job.count({ where: { estimateId } })).toBe(1);
  });
});

describe('outbox retry', () => {
  it('only a failed message can be retried; a retry never withdraws the quote the customer is reading', async () => {
    const estimateId = await pricedEstimate();
    const reading = await sentQuote(estimateId);
    await request(app).get(pub(reading.token)).expect(200);
    expect((await Quote.findByPk(reading.id))!.state).toBe('viewed');

    const sentMessage = await OutboxMessage.findOne({ where: { quoteId: reading.id }, order: [['id', 'DESC']] });
    const notFailed = await post(sales, `/api/outbox/${sentMessage!.id}/retry`, {});
    expect(notFailed.status).toBe(409);
    expect(problem(notFailed).code).toBe('not_failed');

    // A second quote whose mail fails, then is retried in parallel: it goes once, and the first quote stays open.
    const second = await post(sales, `/api/estimates/${estimateId}/quotes`, {}).expect(201);
    const good = config.mail.url;
    config.mail.url = 'smtp://127.0.0.1:9';
    try {
      await post(sales, `/api/quotes/${second.body.id}/send`, {}).expect(200);
    } finally {
      config.mail.url = good;
    }
    const failed = await OutboxMessage.findOne({ where: { quoteId: second.body.id } });
    expect(failed!.status).toBe('failed');
    const before = services.mail!.messages.length;
    const retries = await Promise.all(Array.from({ length: 5 }, () => post(sales, `/api/outbox/${failed!.id}/retry`, {})));
    expect(retries.filter((r) => r.status === 200)).toHaveLength(1);
    for (const r of retries.filter((x) => x.status !== 200)) expect(r.status).toBe(409);
    expect(services.mail!.messages.length).toBe(before + 1);
    expect((await Quote.findByPk(second.body.id))!.state).toBe('quoted');
    expect((await Quote.findByPk(reading.id))!.state).toBe('viewed');
    expect((await request(app).get(pub(reading.token)).expect(200)).body.closed).toBeNull();
    // Sent now: a further retry is refused and changes nothing.
    expect((await post(sales, `/api/outbox/${failed!.id}/retry`, {})).status).toBe(409);
  });
});

describe('one deposit', () => {
  it('10 parallel deposit requests end with one open checkout', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    await accept(q.token).expect(200);
    const answers = await Promise.all(Array.from({ length: 10 }, () => request(app).post(pub(q.token, '/deposit')).send({})));
    for (const r of answers) expect(r.status).toBe(200);
    expect(new Set(answers.map((r) => r.body.url)).size).toBe(1);
    expect(await Payment.count({ where: { quoteId: q.id } })).toBe(1);
    expect(await Payment.count({ where: { quoteId: q.id, status: 'pending' } })).toBe(1);
    // The database refuses a second pending checkout outright.
    const p = (await Payment.findOne({ where: { quoteId: q.id } }))!;
    await expect(Payment.create({ quoteId: q.id, providerSessionId: 'cs_test_manual', amountMinor: p.amountMinor, currency: 'GBP', paidAt: null, checkoutUrl: null, expiresAt: null })).rejects.toBeInstanceOf(
      UniqueConstraintError,
    );
  });

  it('an expired checkout is shown as expired, and a new one is opened after it', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    await accept(q.token).expect(200);
    const first = await checkout(q.token);
    await services.payments!.expire(first);
    expect((await Payment.findOne({ where: { providerSessionId: first } }))!.status).toBe('expired');
    const staff = await sales.agent.get(`/api/quotes/${q.id}`).expect(200);
    expect(staff.body.payments.map((p: { status: string }) => p.status)).toEqual(['expired']);
    const second = await checkout(q.token);
    expect(second).not.toBe(first);
    expect(await Payment.count({ where: { quoteId: q.id, status: 'pending' } })).toBe(1);
  });

  it('a checkout whose time ran out is never left pending, even without the provider\u2019s event', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    await accept(q.token).expect(200);
    const first = await checkout(q.token);
    await Payment.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { providerSessionId: first } });
    const page = await request(app).get(pub(q.token)).expect(200);
    expect(page.body.checkout).toEqual({ open: false, lastStatus: 'expired', available: true });
    expect(await checkout(q.token)).not.toBe(first);
  });

  it('coming back from a cancelled payment page closes the checkout at the provider and shows it cancelled', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    await accept(q.token).expect(200);
    const first = await checkout(q.token);
    const page = await request(app).post(pub(q.token, '/deposit/cancel')).send({}).expect(200);
    expect(page.body.checkout).toEqual({ open: false, lastStatus: 'cancelled', available: true });
    expect(services.payments!.sessions.get(first)!.status).toBe('expired');
    expect((await Payment.findOne({ where: { providerSessionId: first } }))!.status).toBe('cancelled');
    // The closed checkout cannot be paid any more; a new one can.
    await expect(services.payments!.pay(first)).rejects.toThrow(/expired/);
    const second = await checkout(q.token);
    expect(second).not.toBe(first);
    await services.payments!.pay(second);
    expect((await Quote.findByPk(q.id))!.state).toBe('deposit-paid');
  });

  it('a payment arriving after the deposit is paid is recorded, flagged and refunded through the SDK', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    await accept(q.token).expect(200);
    const first = await checkout(q.token);
    await services.payments!.expire(first);
    const second = await checkout(q.token);
    await services.payments!.pay(second);
    expect((await Quote.findByPk(q.id))!.state).toBe('deposit-paid');
    // The provider takes the first, expired, checkout's money after all (a late capture).
    await services.payments!.pay(first, { force: true });
    const late = (await Payment.findOne({ where: { providerSessionId: first } }))!;
    expect(late.flag).toBe('duplicate');
    expect(late.status).toBe('refunded');
    expect(late.refundId).toMatch(/^re_/);
    const refund = services.payments!.refunds.get(late.refundId!)!;
    expect(refund.payment_intent).toBe(services.payments!.sessions.get(first)!.payment_intent);
    expect(refund.amount).toBe(services.payments!.sessions.get(first)!.amount_total);
    // Counted once: one unflagged paid payment.
    expect(await Payment.count({ where: { quoteId: q.id, status: 'paid', flag: null } })).toBe(1);
    const staff = await sales.agent.get(`/api/quotes/${q.id}`).expect(200);
    expect(staff.body.flagged).toBe(1);
    const flagged = await owner.agent.get('/api/payments/flagged').expect(200);
    expect(flagged.body.find((p: { id: number }) => p.id === late.id)).toMatchObject({ flag: 'duplicate', status: 'refunded', quote: { id: q.id } });
    // A counted deposit is never refunded from here.
    const counted = (await Payment.findOne({ where: { quoteId: q.id, flag: null } }))!;
    expect((await post(owner, `/api/payments/${counted.id}/refund`, {})).status).toBe(409);
  });

  it('a webhook whose amount differs from the deposit is recorded and flagged, not marked paid', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    await accept(q.token).expect(200);
    const session = await checkout(q.token);
    const asked = services.payments!.sessions.get(session)!.amount_total;
    await services.payments!.pay(session, { amount: asked - 100 });
    const payment = (await Payment.findOne({ where: { providerSessionId: session } }))!;
    expect(payment.flag).toBe('amount-mismatch');
    expect(Number(payment.amountReceivedMinor)).toBe(asked - 100);
    expect((await Quote.findByPk(q.id))!.state).toBe('accepted');
    const staff = await sales.agent.get(`/api/quotes/${q.id}`).expect(200);
    expect(staff.body.flagged).toBe(1);
    expect(staff.body.payments[0]).toMatchObject({ flag: 'amount-mismatch', amountReceived: ((asked - 100) / 100).toFixed(2) });
    const flagged = await owner.agent.get('/api/payments/flagged').expect(200);
    expect(flagged.body.some((p: { id: number }) => p.id === payment.id)).toBe(true);
  });

  it('the amount asked is always the deposit on the accepted total', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId, { extras: TWO_EXTRAS, depositPct: 25 });
    await accept(q.token, ['x2']).expect(200);
    const session = await checkout(q.token);
    const quote = (await Quote.findByPk(q.id))!;
    expect(services.payments!.sessions.get(session)!.amount_total).toBe(Math.round(Number(quote.acceptedDeposit) * 100));
    expect(Number(quote.acceptedDeposit)).toBeCloseTo(Math.round((Number(quote.total) + 96) * 25) / 100, 2);
  });
});

describe('what was accepted flows everywhere', () => {
  it('the ticked extra changes total, deposit and balance on every screen, the record PDF and the job', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId, { extras: TWO_EXTRAS, depositPct: 30 });
    const base = (await Quote.findByPk(q.id))!;
    const total = (Math.round(Number(base.total) * 100) + 36_000) / 100;
    const deposit = Math.round(total * 30) / 100;
    const agreed = { total: total.toFixed(2), deposit: deposit.toFixed(2), balance: (Math.round(total * 100 - deposit * 100) / 100).toFixed(2) };

    const res = await accept(q.token, ['x1']).expect(200);
    expect(res.body.agreed).toMatchObject({ ...agreed, extraHours: 6 });
    expect(res.body.agreed.extras.map((x: { label: string }) => x.label)).toEqual(['Regulate the action']);

    const staff = await sales.agent.get(`/api/quotes/${q.id}`).expect(200);
    expect(staff.body.agreed).toMatchObject(agreed);
    const estimate = await sales.agent.get(`/api/estimates/${estimateId}`).expect(200);
    expect(estimate.body.agreed).toMatchObject({ quoteId: q.id, ...agreed, extras: ['Regulate the action'] });
    const customerId = estimate.body.customer.id;
    const record = await sales.agent.get(`/api/estimates?customerId=${customerId}`).expect(200);
    expect(record.body.rows[0].agreed).toMatchObject(agreed);

    const pdf = pdfText((await binary(sales.agent.get(`/api/quotes/${q.id}/acceptance.pdf`)).expect(200)).body as Buffer);
    expect(pdf).toContain('Perpetua Langstroth');
    expect(pdf).toContain(base.acceptedIp ?? (await Quote.findByPk(q.id))!.acceptedIp!);
    expect(pdf).toContain(gbp(agreed.total));
    expect(pdf).toContain(gbp(agreed.deposit));
    expect(pdf).toContain(gbp(agreed.balance));
    expect(pdf).toContain('Regulate the action');
    expect(pdf).toMatch(/not taken: New castor cups/);
    const publicPdf = pdfText((await binary(request(app).get(pub(q.token, '/acceptance.pdf'))).expect(200)).body as Buffer);
    expect(publicPdf).toContain(gbp(agreed.total));
    // The quote PDF now shows the agreed total, deposit and balance.
    const quotePdf = pdfText((await binary(request(app).get(pub(q.token, '/pdf'))).expect(200)).body as Buffer);
    expect(quotePdf).toContain(gbp(agreed.total));
    expect(quotePdf).toContain(gbp(agreed.balance));

    const job = await post(workshop, '/api/jobs', { quoteId: q.id }).expect(201);
    const extraSessions = job.body.sessions.filter((s: { stageKind: string }) => s.stageKind === 'extra');
    expect(extraSessions).toHaveLength(2);
    expect(extraSessions.reduce((t: number, s: { handsOnHours: number }) => t + s.handsOnHours, 0)).toBeCloseTo(6, 2);
    const revision = await sales.agent.get(`/api/estimates/${estimateId}`).expect(200);
    expect(job.body.estimatedHours).toBeCloseTo(revision.body.current.result.totals.labourHours + 6, 1);
  });

  it('an acceptance record before acceptance is a 409, never a 500', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    expect((await sales.agent.get(`/api/quotes/${q.id}/acceptance.pdf`)).status).toBe(409);
    expect((await request(app).get(pub(q.token, '/acceptance.pdf'))).status).toBe(409);
  });

  it('the estimator\u2019s discount carries into the quote unless sales changes it within the cap', async () => {
    const estimateId = await pricedEstimate(7);
    const carried = await post(sales, `/api/estimates/${estimateId}/quotes`, {}).expect(201);
    expect(carried.body.discountPct).toBe(7);
    expect(carried.body.pricing.lines.find((l: { code: string }) => l.code === 'discount')).toBeTruthy();
    const changed = await post(sales, `/api/estimates/${estimateId}/quotes`, { discountPct: 3 }).expect(201);
    expect(changed.body.discountPct).toBe(3);
    expect(Number(changed.body.total)).toBeGreaterThan(Number(carried.body.total));
    const over = await post(sales, `/api/estimates/${estimateId}/quotes`, { discountPct: 60 });
    expect(over.status).toBe(400);
    expect(problem(over).field).toBe('discountPct');
  });
});

describe('private figures stay private; promises the workshop can keep; the e-mail', () => {
  it('the customer\u2019s page, PDF and e-mail never show the labour rate, overhead or margin; staff keep the build-up', async () => {
    const estimateId = await pricedEstimate();
    const before = services.mail!.messages.length;
    const q = await sentQuote(estimateId, { message: 'Dear Perpetua,\n\nThank you for calling in with the upright.\n\nKind regards,\nSam' });
    const page = await request(app).get(pub(q.token)).expect(200);
    const json = JSON.stringify(page.body);
    for (const word of [/per hour/i, /overhead/i, /margin/i, /"code":"labour"/]) expect(json).not.toMatch(word);
    const lines = page.body.pricing.lines as { code: string; amount: string }[];
    expect(lines.map((l) => l.code)).toContain('work');
    const cents = lines.reduce((t, l) => t + Math.round(Number(l.amount) * 100), 0);
    expect(cents).toBe(Math.round(Number(page.body.pricing.total) * 100));
    // No "0 coats": a stage that lays no coat has none.
    for (const s of page.body.work.stages as { coats: number | null }[]) expect(s.coats === null || s.coats > 0).toBe(true);
    expect(page.body.work.stages.some((s: { coats: number | null }) => s.coats === null)).toBe(true);

    const pdf = pdfText((await binary(request(app).get(pub(q.token, '/pdf'))).expect(200)).body as Buffer);
    for (const word of [/per hour/i, /overhead/i, /margin/i]) expect(pdf).not.toMatch(word);
    expect(pdf).not.toMatch(/\b0 coats\b/);

    const mail = services.mail!.messages[before]!.raw.replace(/=\r?\n/g, '');
    for (const word of [/per hour/i, /overhead/i, /margin/i]) expect(mail).not.toMatch(word);

    const staff = await sales.agent.get(`/api/quotes/${q.id}`).expect(200);
    expect(staff.body.pricing.lines.map((l: { code: string }) => l.code)).toEqual(expect.arrayContaining(['labour', 'overhead', 'margin']));
  });

  it('every e-mail reads greeting, covering message, sign-off, in that order, once each', async () => {
    const estimateId = await pricedEstimate();
    const before = services.mail!.messages.length;
    await sentQuote(estimateId, { message: 'Dear Perpetua,\n\nThank you for calling in with the upright.\n\nKind regards,\nSam' });
    const outbox = await OutboxMessage.findOne({ order: [['id', 'DESC']] });
    const text = outbox!.textBody;
    expect(text.match(/Dear /g)).toHaveLength(1);
    expect(text.match(/Kind regards/g)).toHaveLength(1);
    const greeting = text.indexOf('Dear ');
    const message = text.indexOf('Thank you for calling in');
    const body = text.indexOf('Please find attached');
    const signOff = text.indexOf('Kind regards');
    expect(greeting).toBe(0);
    expect(greeting).toBeLessThan(message);
    expect(message).toBeLessThan(body);
    expect(body).toBeLessThan(signOff);
    expect(text.slice(signOff)).not.toMatch(/Please|http/);
    expect(outbox!.htmlBody.indexOf('Dear ')).toBeLessThan(outbox!.htmlBody.indexOf('Kind regards'));
    expect(services.mail!.messages.length).toBe(before + 1);
  });

  it('no dates are promised before the job is booked; once booked the customer sees the booked dates', async () => {
    const estimateId = await pricedEstimate();
    const q = await sentQuote(estimateId);
    await accept(q.token).expect(200);
    const session = await checkout(q.token);
    await services.payments!.pay(session);
    const before = await request(app).get(pub(q.token)).expect(200);
    expect(before.body.schedule).toMatchObject({ booked: false, start: null, ready: null });
    const pdfBefore = pdfText((await binary(request(app).get(pub(q.token, '/pdf'))).expect(200)).body as Buffer);
    expect(pdfBefore).toMatch(/dates are fixed when we book the work/);
    expect(pdfBefore).not.toMatch(/reserved|we start on/i);

    const job = await post(workshop, '/api/jobs', { quoteId: q.id }).expect(201);
    const booked = await post(workshop, `/api/jobs/${job.body.id}/booking`, { mode: 'earliest' }).expect(200);
    const after = await request(app).get(pub(q.token)).expect(200);
    expect(after.body.schedule).toMatchObject({ booked: true, start: booked.body.roomStart.slice(0, 10), ready: booked.body.roomEnd.slice(0, 10) });
    const pdfAfter = pdfText((await binary(request(app).get(pub(q.token, '/pdf'))).expect(200)).body as Buffer);
    expect(pdfAfter).toMatch(/The work is booked: we start on/);
    // Leave the shared board as it was for the other test files: the booking is cancelled.
    await post(workshop, `/api/jobs/${job.body.id}/cancel`, {}).expect(200);
    expect((await request(app).get(pub(q.token)).expect(200)).body.schedule.booked).toBe(false);
  });
});
