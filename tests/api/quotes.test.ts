import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry, OutboxMessage, Payment, Quote } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app, config } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let estimator: Session;
let sales: Session;
let estimateId: number;

afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const grand = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };

async function pricedEstimate(email = 'quote.customer@example.com'): Promise<number> {
  const c = await post(sales, '/api/customers', { name: 'Hyacinth Ormerod', email }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: 'Rosewood grand' }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  return e.body.id;
}

function pdfText(pdf: Buffer): string {
  const file = path.join(os.tmpdir(), `quote-${process.pid}-${Date.now()}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
  } finally {
    fs.rmSync(file, { force: true });
  }
}

const tokenOf = (link: string) => link.split('/q/')[1]!;
const gbp = (amount: string) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(Number(amount));

beforeAll(async () => {
  services = await startServices();
  estimator = await signInAs(app, 'estimator');
  sales = await signInAs(app, 'sales');
  estimateId = await pricedEstimate();
});

describe('making and sending a quote', () => {
  let quoteId: number;
  let link: string;

  it('refuses a draft estimate and a discount over the owner\u2019s cap', async () => {
    const c = await post(sales, '/api/customers', { name: 'Draft Only', email: 'draft.only@example.com' }).expect(201);
    const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: 'Upright' }).expect(201);
    const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
    const draft = await post(sales, `/api/estimates/${e.body.id}/quotes`, {});
    expect(draft.status).toBe(409);
    const over = await post(sales, `/api/estimates/${estimateId}/quotes`, { discountPct: 40 });
    expect(over.status).toBe(400);
    expect(JSON.parse(over.text)).toMatchObject({ field: 'discountPct' });
  });

  it('prices the quote from the revision with its discount, deposit and extras', async () => {
    const res = await post(sales, `/api/estimates/${estimateId}/quotes`, {
      message: 'Thank you for bringing the grand to us.',
      discountPct: 10,
      depositPct: 30,
      extras: [{ label: 'Regulate the action', description: 'Other workshop work', hours: 6, price: '300.00' }],
    });
    expect(res.status).toBe(201);
    quoteId = res.body.id;
    expect(res.body.state).toBe('draft');
    expect(res.body.number).toMatch(/^Q-\d{4}-\d{4}$/);
    expect(res.body.pricing.lines.map((l: { code: string }) => l.code)).toContain('discount');
    // Deposit is 30 % of the total, to the penny (decimal arithmetic checked by hand here).
    const expected = Math.round(Number(res.body.total) * 30) / 100;
    expect(Number(res.body.deposit)).toBeCloseTo(expected, 2);
    expect(res.body.extras[0]).toMatchObject({ id: 'x1', price: '300.00', priceWithTax: '360.00' });
  });

  it('sends it: the mail server receives the message with the PDF attached and the link', async () => {
    const before = services.mail!.messages.length;
    const res = await post(sales, `/api/quotes/${quoteId}/send`, {});
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('quoted');
    link = res.body.link;
    expect(link).toMatch(/\/q\/[A-Za-z0-9_-]{32}\.[A-Za-z0-9_-]{22}$/);
    const mail = services.mail!.messages[before]!;
    expect(mail.to).toEqual(['quote.customer@example.com']);
    expect(mail.raw).toMatch(/Content-Type: application\/pdf/i);
    expect(mail.raw).toMatch(/filename="?Q-\d{4}-\d{4}\.pdf/);
    expect(mail.raw.replace(/=\r?\n/g, '')).toContain(tokenOf(link));
    const outbox = await OutboxMessage.findOne({ where: { quoteId }, order: [['id', 'DESC']] });
    expect(outbox?.status).toBe('sent');
    const est = await sales.agent.get(`/api/estimates/${estimateId}`).expect(200);
    expect(est.body.state).toBe('quoted');
    const listed = await sales.agent.get('/api/outbox').expect(200);
    expect(listed.body.rows[0]).toMatchObject({ quoteId, status: 'sent', attachmentName: expect.stringMatching(/\.pdf$/) });
    const attachment = await sales.agent.get(`/api/outbox/${listed.body.rows[0].id}/attachment`).buffer(true).expect(200);
    expect(attachment.headers['content-type']).toBe('application/pdf');
  });

  it('the PDF holds the total, the deposit and the cautions', async () => {
    const quote = await sales.agent.get(`/api/quotes/${quoteId}`).expect(200);
    const pdf = await sales.agent.get(`/api/quotes/${quoteId}/pdf`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(pdf.status).toBe(200);
    const text = pdfText(pdf.body as Buffer).replace(/\s+/g, ' ');
    expect(text).toContain(gbp(quote.body.total));
    expect(text).toContain(gbp(quote.body.deposit));
    expect(text).toMatch(/local fire codes/i);
    expect(text).toMatch(/oily rags/i);
    expect(text).toMatch(/Page 1 of \d/);
  });

  it('a tampered or unknown link is refused without a hint', async () => {
    const token = tokenOf(link);
    const tampered = token.slice(0, -1) + (token.endsWith('A') ? 'B' : 'A');
    const res = await request(app).get(`/api/public/quotes/${tampered}`);
    expect(res.status).toBe(404);
    expect(JSON.parse(res.text).code).toBe('link_invalid');
    expect((await request(app).get('/api/public/quotes/not-a-token-at-all')).status).toBe(404);
  });

  it('the customer opens the link: the quote becomes viewed', async () => {
    const res = await request(app).get(`/api/public/quotes/${tokenOf(link)}`).expect(200);
    expect(res.body).toMatchObject({ state: 'viewed', closed: null, customerName: 'Hyacinth Ormerod' });
    expect(res.body.cautions.length).toBeGreaterThan(0);
    const est = await sales.agent.get(`/api/estimates/${estimateId}`).expect(200);
    expect(est.body.state).toBe('viewed');
  });

  it('acceptance needs a name and the terms, keeps time and address, and adds chosen extras', async () => {
    const token = tokenOf(link);
    const noTerms = await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Hyacinth Ormerod' });
    expect(JSON.parse(noTerms.text)).toMatchObject({ status: 400, field: 'acceptTerms' });
    const res = await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Hyacinth Ormerod', acceptTerms: true, extras: ['x1'] }).expect(200);
    expect(res.body.state).toBe('accepted');
    const q = await Quote.findByPk(quoteId);
    expect(q!.acceptedName).toBe('Hyacinth Ormerod');
    expect(q!.acceptedIp).toBeTruthy();
    expect(Number(q!.acceptedTotal)).toBeCloseTo(Number(q!.total) + 360, 2);
    expect(Number(q!.acceptedDeposit)).toBeCloseTo(Math.round(Number(q!.acceptedTotal) * 30) / 100, 2);
    const again = await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Someone Else', acceptTerms: true });
    expect(again.status).toBe(409);
  });

  it('pays the deposit: a forged webhook changes nothing, a signed one marks it paid once', async () => {
    const token = tokenOf(link);
    const checkout = await request(app).post(`/api/public/quotes/${token}/deposit`).send({}).expect(200);
    expect(checkout.body.url).toContain(services.payments!.url);
    const sessionId = checkout.body.url.split('/checkout/')[1];
    const session = services.payments!.sessions.get(sessionId)!;
    const q = await Quote.findByPk(quoteId);
    expect(session.amount_total).toBe(Math.round(Number(q!.acceptedDeposit) * 100));

    const paidSession = { ...session, status: 'complete', payment_status: 'paid' };
    const payload = JSON.stringify({ id: 'evt_test_paid_1', object: 'event', type: 'checkout.session.completed', account: session.account, data: { object: paidSession } });
    const forged = await request(app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', 't=1,v1=deadbeef').send(payload);
    expect(forged.status).toBe(400);
    expect((await Quote.findByPk(quoteId))!.state).toBe('accepted');

    const signer = new Stripe('sk_test_unused');
    const header = signer.webhooks.generateTestHeaderString({ payload, secret: config.payments.webhookSecret! });
    const ok = await request(app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', header).send(payload);
    expect(ok.status).toBe(200);
    expect(ok.body.handled).toBe(true);
    expect((await Quote.findByPk(quoteId))!.state).toBe('deposit-paid');
    const audits = await AuditEntry.count({ where: { action: 'quote.deposit_paid' } });

    const repeat = await request(app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', header).send(payload);
    expect(repeat.status).toBe(200);
    expect(repeat.body.duplicate).toBe(true);
    expect(await AuditEntry.count({ where: { action: 'quote.deposit_paid' } })).toBe(audits);
    expect(await Payment.count({ where: { quoteId, status: 'paid' } })).toBe(1);
    const est = await sales.agent.get(`/api/estimates/${estimateId}`).expect(200);
    expect(est.body.state).toBe('deposit-paid');
    const page = await request(app).get(`/api/public/quotes/${token}`).expect(200);
    expect(page.body).toMatchObject({ state: 'deposit-paid', closed: 'deposit-paid' });
  });
});

describe('expiry, withdrawal and failed mail', () => {
  it('an expired link says so and cannot be accepted', async () => {
    const id = await pricedEstimate('expiring@example.com');
    const q = await post(sales, `/api/estimates/${id}/quotes`, {}).expect(201);
    const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
    await Quote.update({ validUntil: '2020-01-01' }, { where: { id: q.body.id } });
    const token = tokenOf(sent.body.link);
    const page = await request(app).get(`/api/public/quotes/${token}`).expect(200);
    expect(page.body.closed).toBe('expired');
    const accept = await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Late Person', acceptTerms: true });
    expect(accept.status).toBe(409);
    expect(JSON.parse(accept.text).detail).toMatch(/expired/);
  });

  it('sending again gives a new link and the old one stops working; a withdrawn quote says so', async () => {
    const id = await pricedEstimate('resend@example.com');
    const q = await post(sales, `/api/estimates/${id}/quotes`, {}).expect(201);
    const first = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
    const second = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
    expect((await request(app).get(`/api/public/quotes/${tokenOf(first.body.link)}`)).status).toBe(404);
    await post(sales, `/api/quotes/${q.body.id}/withdraw`, {}).expect(200);
    const page = await request(app).get(`/api/public/quotes/${tokenOf(second.body.link)}`).expect(200);
    expect(page.body.closed).toBe('withdrawn');
  });

  it('a mail failure is shown, nothing is marked sent, and a retry sends it', async () => {
    const id = await pricedEstimate('mailfail@example.com');
    const q = await post(sales, `/api/estimates/${id}/quotes`, {}).expect(201);
    const good = config.mail.url;
    config.mail.url = 'smtp://127.0.0.1:9';
    try {
      const res = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
      expect(res.body.state).toBe('draft');
      expect(res.body.sentAt).toBeNull();
      expect(res.body.delivery).toMatchObject({ delivered: false });
      expect(res.body.delivery.error).toBeTruthy();
    } finally {
      config.mail.url = good;
    }
    const failed = await OutboxMessage.findOne({ where: { quoteId: q.body.id } });
    expect(failed!.status).toBe('failed');
    expect(failed!.lastError).toBeTruthy();
    const retry = await post(sales, `/api/outbox/${failed!.id}/retry`, {}).expect(200);
    expect(retry.body.status).toBe('sent');
    expect((await sales.agent.get(`/api/quotes/${q.body.id}`).expect(200)).body.state).toBe('quoted');
    const ofEstimate = await sales.agent.get(`/api/quotes?estimateId=${id}`).expect(200);
    expect(ofEstimate.body.rows.map((r: { id: number }) => r.id)).toEqual([q.body.id]);
  });

  it('shows the pipeline by state', async () => {
    const res = await sales.agent.get('/api/quotes/pipeline').expect(200);
    const states = res.body.map((r: { state: string }) => r.state);
    expect(states).toEqual(expect.arrayContaining(['deposit-paid', 'expired', 'quoted']));
    for (const row of res.body) {
      expect(row.value).toMatch(/^\d+\.\d{2}$/);
      expect(row.currency).toBe('GBP');
    }
  });
});
