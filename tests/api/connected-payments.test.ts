/**
 * Money goes to the right workshop: each workshop connects its own account with the payment provider (through the
 * SDK, against the local stand-in), its deposits are taken on that account, and a webhook counts only for the
 * workshop whose account sent it and owns the checkout.
 */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runAsWorkshop } from '../../server/db/workshop-context';
import { startPaymentProvider } from '../../server/fakes/payment-provider';
import { AccountEntry, Payment, Workshop } from '../../server/models';
import { closeTestApp, getTestApp, signIn, startServices, type Session } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD, type OtherWorkshop } from '../helpers/workshops';

const { app, config } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let server: http.Server;

interface Shop {
  w: OtherWorkshop;
  owner: Session;
  sales: Session;
  estimator: Session;
  account: string | null;
}
let a: Shop;
let b: Shop;
let unconnected: Shop;

afterAll(async () => {
  await services?.stop();
  server?.closeAllConnections();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  await closeTestApp();
});

const post = (s: Session, url: string, body: object = {}) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const pub = (token: string, rest = '') => `/api/public/quotes/${token}${rest}`;
const sessionOf = (url: string) => url.split('/checkout/')[1]!;

async function shop(name: string): Promise<Shop> {
  const w = await createOtherWorkshop(getTestApp().sequelize, name);
  const [owner, sales, estimator] = await Promise.all([signIn(app, w.emails.owner, OTHER_PASSWORD), signIn(app, w.emails.sales, OTHER_PASSWORD), signIn(app, w.emails.estimator, OTHER_PASSWORD)]);
  // The defaults' labour rates are nought: give the polisher's hour a price so a quote asks for a deposit.
  const rates = await owner.agent.get('/api/labour-rates').expect(200);
  for (const r of rates.body as { id: number }[]) await owner.agent.patch(`/api/labour-rates/${r.id}`).set('x-csrf-token', owner.csrf).send({ perHour: '42.00' }).expect(200);
  return { w, owner, sales, estimator, account: null };
}

/** Connects a workshop's account the way its owner does: the SDK creates it, the stand-in's page finishes it. */
async function connect(s: Shop): Promise<string> {
  const before = await s.owner.agent.get('/api/settings/card-payments').expect(200);
  expect(before.body).toMatchObject({ state: 'none', accountId: null, configured: true });
  const started = await post(s.owner, '/api/settings/card-payments/connect').expect(200);
  const link = new URL(started.body.url as string);
  expect(link.origin).toBe(services.payments!.url);
  const mid = await s.owner.agent.get('/api/settings/card-payments').expect(200);
  expect(mid.body.state).toBe('onboarding');
  const accountId = mid.body.accountId as string;
  expect(services.payments!.accounts.get(accountId)).toMatchObject({ charges_enabled: false, business_profile: { name: expect.stringContaining('') } });
  // A second click while the set-up is unfinished gives a new link to the same account.
  const again = await post(s.owner, '/api/settings/card-payments/connect').expect(200);
  expect(again.body.url).not.toBe(started.body.url);
  expect((await s.owner.agent.get('/api/settings/card-payments').expect(200)).body.accountId).toBe(accountId);

  const page = await fetch(again.body.url as string);
  expect(page.status).toBe(200);
  expect(await page.text()).toContain(accountId);
  // Finishing the provider's form sends account.updated to the app, then the owner back to the settings page.
  const done = await fetch(`${again.body.url as string}/complete`, { method: 'POST', redirect: 'manual' });
  expect(done.status).toBe(303);
  expect(done.headers.get('location')).toBe(`${config.publicUrl}/settings?card-payments=back`);
  const after = await s.owner.agent.get('/api/settings/card-payments').expect(200);
  expect(after.body).toMatchObject({ state: 'ready', accountId });
  // The page the owner comes back to asks the provider again: still ready.
  expect((await post(s.owner, '/api/settings/card-payments/refresh').expect(200)).body).toMatchObject({ state: 'ready', accountId });
  const refused = await post(s.owner, '/api/settings/card-payments/connect').expect(409);
  expect(refused.body.code).toBe('payments_connected');
  s.account = accountId;
  return accountId;
}

let serial = 0;
/** An accepted quote of the workshop: its customer token. */
async function acceptedQuote(s: Shop): Promise<string> {
  serial++;
  const c = await post(s.sales, '/api/customers', { name: `Connected Customer ${serial}`, email: `connected.${serial}.${process.pid}@example.com` }).expect(201);
  const p = await post(s.estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Oak upright ${serial}` }).expect(201);
  const input = { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'oak', veneered: false }, system: 'full-repolish' };
  const e = await post(s.estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input });
  expect(e.status, JSON.stringify(e.body)).toBe(201);
  await post(s.estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(s.sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(s.sales, `/api/quotes/${q.body.id}/send`).expect(200);
  const token = String(sent.body.link).split('/q/')[1]!;
  await request(app).post(pub(token, '/accept')).send({ name: 'Hesper Vantongeren', acceptTerms: true }).expect(200);
  return token;
}

async function depositCheckout(token: string): Promise<string> {
  const res = await request(app).post(pub(token, '/deposit')).send({});
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return sessionOf(String(res.body.url));
}

const stateOf = async (token: string) => (await request(app).get(pub(token)).expect(200)).body.state as string;

function signed(event: object) {
  const payload = JSON.stringify(event);
  const header = new Stripe(config.payments.secretKey!).webhooks.generateTestHeaderString({ payload, secret: config.payments.webhookSecret! });
  return request(app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', header).send(payload);
}

const completedEvent = (id: string, account: string | undefined, sessionId: string) => {
  const session = services.payments!.sessions.get(sessionId)!;
  const { account: _own, ...object } = session;
  return { id, object: 'event', type: 'checkout.session.completed', ...(account ? { account } : {}), created: Math.floor(Date.now() / 1000), livemode: false, data: { object: { ...object, status: 'complete', payment_status: 'paid', payment_intent: `pi_test_${id}` } } };
};

beforeAll(async () => {
  // The stand-in sends its webhooks over HTTP, and the owner comes back to this address.
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  config.publicUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  services = await startServices();
  [a, b, unconnected] = await Promise.all([shop('Amberley Case Finishers'), shop('Brackenholm Polishing Rooms'), shop('Cinderford Bench Works')]);
});

describe('connecting a workshop to the payment provider', () => {
  it('each owner connects an account of their own through the SDK and the set-up page', async () => {
    const [accountA, accountB] = [await connect(a), await connect(b)];
    expect(accountA).not.toBe(accountB);
    expect(services.payments!.accounts.get(accountA)!.charges_enabled).toBe(true);
    const rows = await Promise.all([a, b].map((s) => runAsWorkshop(s.w.id, () => Workshop.findByPk(s.w.id))));
    expect(rows.map((w) => [w!.paymentAccountId, w!.paymentAccountState])).toEqual([
      [accountA, 'ready'],
      [accountB, 'ready'],
    ]);
  });

  it('a workshop without a ready account cannot take a card payment and says so plainly', async () => {
    const token = await acceptedQuote(unconnected);
    const view = await request(app).get(pub(token)).expect(200);
    expect(view.body.checkout.available).toBe(false);
    const res = await request(app).post(pub(token, '/deposit')).send({}).expect(409);
    expect(res.body).toMatchObject({ code: 'payments_not_set_up' });
    expect(res.body.detail).toMatch(/card payments are not set up for this workshop/i);
    expect(await runAsWorkshop(unconnected.w.id, () => Payment.count())).toBe(0);
  });

  it('a workshop half set up (the owner left the form) still cannot take one', async () => {
    const half = await shop('Dunnerholme Restorers');
    const started = await post(half.owner, '/api/settings/card-payments/connect').expect(200);
    const left = await fetch(`${started.body.url as string}/leave`, { method: 'POST', redirect: 'manual' });
    expect(left.status).toBe(303);
    expect((await post(half.owner, '/api/settings/card-payments/refresh').expect(200)).body.state).toBe('onboarding');
    const token = await acceptedQuote(half);
    expect((await request(app).post(pub(token, '/deposit')).send({}).expect(409)).body.code).toBe('payments_not_set_up');
  });
});

describe('deposits on the workshop’s own account', () => {
  it('each deposit checkout lands on its own workshop’s account, and no other account can touch it', async () => {
    const [tokenA, tokenB] = await Promise.all([acceptedQuote(a), acceptedQuote(b)]);
    const [sA, sB] = [await depositCheckout(tokenA), await depositCheckout(tokenB)];
    expect(services.payments!.sessions.get(sA)!.account).toBe(a.account);
    expect(services.payments!.sessions.get(sB)!.account).toBe(b.account);
    expect((await runAsWorkshop(a.w.id, () => Payment.findOne({ where: { providerSessionId: sA } })))!.providerAccountId).toBe(a.account);
    expect((await runAsWorkshop(b.w.id, () => Payment.findOne({ where: { providerSessionId: sB } })))!.providerAccountId).toBe(b.account);

    // Through the SDK, as the app calls it: A's account does not see, expire or refund B's checkout.
    const stripe = new Stripe(config.payments.secretKey!, { host: '127.0.0.1', port: services.payments!.port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
    await expect(stripe.checkout.sessions.retrieve(sB, {}, { stripeAccount: a.account! })).rejects.toMatchObject({ statusCode: 404 });
    await expect(stripe.checkout.sessions.expire(sB, {}, { stripeAccount: a.account! })).rejects.toMatchObject({ statusCode: 404 });
    expect((await stripe.checkout.sessions.retrieve(sB, {}, { stripeAccount: b.account! })).status).toBe('open');
    await services.payments!.pay(sB);
    const intent = services.payments!.sessions.get(sB)!.payment_intent!;
    await expect(stripe.refunds.create({ payment_intent: intent }, { stripeAccount: a.account! })).rejects.toMatchObject({ statusCode: 404 });
    expect(services.payments!.refunds.size === 0 || [...services.payments!.refunds.values()].every((r) => r.payment_intent !== intent)).toBe(true);
    // Without an account the stand-in takes no payment at all.
    await expect(stripe.checkout.sessions.retrieve(sB)).rejects.toMatchObject({ statusCode: 400 });

    // The webhook for B's payment marked B's quote only.
    expect(await stateOf(tokenB)).toBe('deposit-paid');
    expect(await stateOf(tokenA)).toBe('accepted');
    expect(await runAsWorkshop(a.w.id, () => Payment.count({ where: { status: 'paid' } }))).toBe(0);
  });

  it('an event whose account does not own the checkout, or names no known account, changes nothing', async () => {
    const tokenB = await acceptedQuote(b);
    const sB = await depositCheckout(tokenB);
    const forged = await Promise.all([
      signed(completedEvent(`evt_wrong_account_${sB}`, a.account!, sB)),
      signed(completedEvent(`evt_no_account_${sB}`, undefined, sB)),
      signed(completedEvent(`evt_unknown_account_${sB}`, 'acct_0000000000000000', sB)),
    ]);
    for (const r of forged) expect(r.body).toEqual({ handled: false });
    expect(await stateOf(tokenB)).toBe('accepted');
    const payment = (await runAsWorkshop(b.w.id, () => Payment.findOne({ where: { providerSessionId: sB } })))!;
    expect(payment.status).toBe('pending');
    // A forged signature is refused before anything is read.
    const payload = JSON.stringify(completedEvent(`evt_forged_${sB}`, b.account!, sB));
    await request(app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', 't=1,v1=deadbeef').send(payload).expect(400);
    // An account.updated that says another workshop's account is not ready does not touch this one.
    const other = await signed({ id: `evt_acct_${sB}`, object: 'event', type: 'account.updated', account: a.account, created: 1, livemode: false, data: { object: { ...services.payments!.accounts.get(b.account!)!, charges_enabled: false } } });
    expect(other.body).toEqual({ handled: false });
    expect((await b.owner.agent.get('/api/settings/card-payments').expect(200)).body.state).toBe('ready');
    expect((await a.owner.agent.get('/api/settings/card-payments').expect(200)).body.state).toBe('ready');
  });

  it('parallel duplicate deliveries of the payment’s webhook count it once', async () => {
    const tokenA = await acceptedQuote(a);
    const sA = await depositCheckout(tokenA);
    // The same event twelve times and eight other events for the same checkout, all at once.
    const answers = await Promise.all(Array.from({ length: 20 }, (_, i) => signed(completedEvent(i < 12 ? `evt_same_${sA}` : `evt_${i}_${sA}`, a.account!, sA))));
    for (const r of answers) expect(r.status).toBe(200);
    expect(answers.filter((r) => r.body.duplicate === true).length).toBeGreaterThanOrEqual(11);
    expect(await stateOf(tokenA)).toBe('deposit-paid');
    const payments = await runAsWorkshop(a.w.id, () => Payment.findAll({ where: { providerSessionId: sA } }));
    expect(payments.map((p) => [p.status, p.flag])).toEqual([['paid', null]]);
    const quoteId = payments[0]!.quoteId;
    const entries = await runAsWorkshop(a.w.id, () => AccountEntry.findAll({ where: { quoteId } }));
    expect(entries).toHaveLength(1);
  });
});

describe('disconnecting an account and connecting another', () => {
  const payment = (s: Shop, sessionId: string) => runAsWorkshop(s.w.id, () => Payment.findOne({ where: { providerSessionId: sessionId } }));
  /** The customer pays at the provider; its notice (the event `eventId`, see completedEvent) has not reached the app yet. */
  const paidSilently = (sessionId: string, eventId: string, amount?: number) => {
    const session = services.payments!.sessions.get(sessionId)!;
    Object.assign(session, { status: 'complete', payment_status: 'paid', payment_intent: `pi_test_${eventId}` }, amount === undefined ? {} : { amount_total: amount });
  };

  it('names the account, is the owner’s only, closes the open checkouts and leaves payments taken on it counted and refundable', async () => {
    const c = await shop('Elderwick Finishing Rooms');
    const former = await connect(c);
    const disconnect = (s: Session, body: object) => post(s, '/api/settings/card-payments/disconnect', body);

    // Three agreements on the account: one paid (its notice not yet in), one paid with the wrong amount, one open.
    const [paidToken, wrongToken, openToken] = [await acceptedQuote(c), await acceptedQuote(c), await acceptedQuote(c)];
    const [paidSession, wrongSession, openSession] = [await depositCheckout(paidToken), await depositCheckout(wrongToken), await depositCheckout(openToken)];
    paidSilently(wrongSession, `evt_wrong_${wrongSession}`, 1);
    expect((await signed(completedEvent(`evt_wrong_${wrongSession}`, former, wrongSession))).body).toMatchObject({ handled: true, flag: 'amount-mismatch' });
    paidSilently(paidSession, `evt_paid_${paidSession}`);

    // Refusals change nothing: no account named, another account named, a role that does not keep the settings.
    const missing = await disconnect(c.owner, {}).expect(400);
    expect(missing.body.field).toBe('accountId');
    expect((await disconnect(c.owner, { accountId: 'acct_someone_else' }).expect(409)).body.code).toBe('payments_account_changed');
    await disconnect(c.sales, { accountId: former }).expect(403);
    // A customer has paid and the notice is on its way: the owner is told to wait, and nothing is closed.
    const busy = await disconnect(c.owner, { accountId: former }).expect(409);
    expect(busy.body.code).toBe('payment_in_progress');
    expect(busy.body.detail).toMatch(/just paid by card on quote Q-/);
    expect(services.payments!.sessions.get(openSession)!.status).toBe('open');
    expect((await c.owner.agent.get('/api/settings/card-payments').expect(200)).body).toMatchObject({ state: 'ready', accountId: former });

    // The notice arrives and counts; now the account can go.
    expect((await signed(completedEvent(`evt_paid_${paidSession}`, former, paidSession))).body).toEqual({ handled: true });
    expect(await stateOf(paidToken)).toBe('deposit-paid');
    const done = await disconnect(c.owner, { accountId: former }).expect(200);
    expect(done.body).toMatchObject({ state: 'none', accountId: null });
    expect(services.payments!.sessions.get(openSession)!.status).toBe('expired');
    expect((await payment(c, openSession))!.status).toBe('cancelled');
    expect((await disconnect(c.owner, { accountId: former }).expect(409)).body.code).toBe('payments_not_connected');

    // Customers are asked to pay another way.
    expect((await request(app).get(pub(openToken)).expect(200)).body.checkout.available).toBe(false);
    expect((await request(app).post(pub(openToken, '/deposit')).send({}).expect(409)).body.code).toBe('payments_not_set_up');

    // A late repeat of the paid checkout's notice from the former account is still this workshop's, and counts once.
    expect((await signed(completedEvent(`evt_paid_again_${paidSession}`, former, paidSession))).body).toEqual({ handled: true });
    const paidRow = (await payment(c, paidSession))!;
    expect(await runAsWorkshop(c.w.id, () => AccountEntry.count({ where: { quoteId: paidRow.quoteId } }))).toBe(1);
    // The payment of the wrong amount is refunded on the account that took it.
    const wrong = (await payment(c, wrongSession))!;
    const refunded = await post(c.owner, `/api/payments/${wrong.id}/refund`).expect(200);
    expect(refunded.body.status).toBe('refunded');
    expect([...services.payments!.refunds.values()].some((r) => r.payment_intent === `pi_test_evt_wrong_${wrongSession}`)).toBe(true);

    // Connecting again makes a new account, on which the open agreement's deposit is then taken.
    const next = await connect(c);
    expect(next).not.toBe(former);
    const again = await depositCheckout(openToken);
    expect(services.payments!.sessions.get(again)!.account).toBe(next);
    await services.payments!.pay(again);
    expect(await stateOf(openToken)).toBe('deposit-paid');
  });

  it('a checkout opened while the account is being disconnected is closed with the rest, or refused after it (parallel)', async () => {
    const d = await shop('Fellgate Polishers');
    const former = await connect(d);
    const tokens = await Promise.all(Array.from({ length: 6 }, () => acceptedQuote(d)));
    const answers = await Promise.all([
      ...tokens.map((t) => request(app).post(pub(t, '/deposit')).send({})),
      post(d.owner, '/api/settings/card-payments/disconnect', { accountId: former }),
    ]);
    expect(answers.at(-1)!.status).toBe(200);
    for (const r of answers.slice(0, -1)) expect([200, 409]).toContain(r.status);
    // Whatever the order, no checkout is left open on the former account, here or at the provider.
    const rows = await runAsWorkshop(d.w.id, () => Payment.findAll());
    expect(rows.filter((p) => p.status === 'pending')).toEqual([]);
    for (const p of rows) {
      expect(p.providerAccountId).toBe(former);
      expect(services.payments!.sessions.get(p.providerSessionId)!.status).toBe('expired');
    }
  });
});

describe('the stand-in across a restart', () => {
  it('keeps its accounts and checkouts in its state file, on the same port when it is free', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shellwright-payments-'));
    const opts = { apiKey: 'sk_test_restart', webhookSecret: 'whsec_restart', webhookUrl: `${config.publicUrl}/api/webhooks/payments`, stateFile: path.join(dir, 'state.json') };
    const sdk = (port: number) => new Stripe('sk_test_restart', { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
    const first = await startPaymentProvider(opts);
    let second: Awaited<ReturnType<typeof startPaymentProvider>> | undefined;
    try {
      const account = await sdk(first.port).accounts.create({ type: 'standard', business_profile: { name: 'Restart Rooms' } });
      await first.completeOnboarding(account.id, { notify: false });
      const session = await sdk(first.port).checkout.sessions.create(
        { mode: 'payment', line_items: [{ quantity: 1, price_data: { currency: 'gbp', unit_amount: 4200, product_data: { name: 'Deposit' } } }], success_url: 'http://127.0.0.1/ok', cancel_url: 'http://127.0.0.1/back' },
        { stripeAccount: account.id },
      );
      await first.stop();
      second = await startPaymentProvider(opts);
      expect(second.port).toBe(first.port);
      expect((await sdk(second.port).accounts.retrieve(account.id)).charges_enabled).toBe(true);
      const again = await sdk(second.port).checkout.sessions.retrieve(session.id, {}, { stripeAccount: account.id });
      expect(again).toMatchObject({ status: 'open', amount_total: 4200, url: session.url });
    } finally {
      await second?.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
