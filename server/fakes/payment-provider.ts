/**
 * A local stand-in for the payment provider, for `npm start` and the tests. It answers the provider's official SDK
 * (checkout sessions, form-encoded POSTs under /v1), shows a checkout page of its own where the customer can pay or
 * go back without paying, expires checkouts (on request or when their time runs out), refunds payments, and sends
 * webhooks signed with the SDK's own signing helper back to the app.
 */
import { randomBytes } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import express from 'express';
import Stripe from 'stripe';

export interface FakeSession {
  id: string;
  object: 'checkout.session';
  amount_total: number;
  currency: string;
  mode: 'payment';
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  success_url: string;
  cancel_url: string;
  metadata: Record<string, string>;
  client_reference_id: string | null;
  customer_email: string | null;
  description: string;
  url: string;
  created: number;
  expires_at: number;
  payment_intent: string | null;
}

export interface FakeRefund {
  id: string;
  object: 'refund';
  amount: number;
  currency: string;
  payment_intent: string;
  status: 'succeeded';
  metadata: Record<string, string>;
  created: number;
}

export interface PaymentProvider {
  url: string;
  port: number;
  sessions: Map<string, FakeSession>;
  refunds: Map<string, FakeRefund>;
  /**
   * Pays a session as the customer would (used by tests that skip the browser). `amount` makes the provider report
   * another amount taken; `force` pays a session that is no longer open (a late capture).
   */
  pay(id: string, opts?: { amount?: number; force?: boolean }): Promise<void>;
  /** Expires an open session as the provider does when its time runs out, with the webhook. */
  expire(id: string): Promise<void>;
  stop(): Promise<void>;
}

/** Reads the SDK's form encoding (line_items[0][price_data][currency]=gbp) into nested objects. */
function nested(body: Record<string, string>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(body)) {
    const parts = key.replace(/\]/g, '').split('[');
    let node: Record<string, unknown> = out;
    parts.forEach((part, i) => {
      if (i === parts.length - 1) node[part] = value;
      else node = (node[part] ??= {}) as Record<string, unknown>;
    });
  }
  return out;
}

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export async function startPaymentProvider(opts: { port?: number; webhookUrl: string; webhookSecret: string; apiKey: string }): Promise<PaymentProvider> {
  const sessions = new Map<string, FakeSession>();
  const refunds = new Map<string, FakeRefund>();
  const signer = new Stripe(opts.apiKey);
  const app = express();
  app.use(express.urlencoded({ extended: false }));

  const authorised: express.RequestHandler = (req, res, next) => {
    if (req.headers.authorization !== `Bearer ${opts.apiKey}`) {
      res.status(401).json({ error: { type: 'invalid_request_error', message: 'Invalid API key provided' } });
      return;
    }
    next();
  };

  let base = '';
  app.post('/v1/checkout/sessions', authorised, (req, res) => {
    const body = nested(req.body as Record<string, string>);
    const item = ((body.line_items as Record<string, Record<string, unknown>> | undefined)?.['0'] ?? {}) as Record<string, Record<string, unknown>>;
    const priceData = (item.price_data ?? {}) as Record<string, unknown>;
    const amount = Number(priceData.unit_amount) * Number(item.quantity ?? 1);
    if (!Number.isInteger(amount) || amount <= 0) {
      res.status(400).json({ error: { type: 'invalid_request_error', message: 'line_items[0][price_data][unit_amount] must be a positive integer' } });
      return;
    }
    const now = Math.floor(Date.now() / 1000);
    const expiresAt = body.expires_at === undefined ? now + 24 * 3600 : Number(body.expires_at);
    if (!Number.isInteger(expiresAt) || expiresAt < now + 30 * 60 - 60 || expiresAt > now + 24 * 3600 + 60) {
      res.status(400).json({ error: { type: 'invalid_request_error', message: 'expires_at must be between 30 minutes and 24 hours from now', param: 'expires_at' } });
      return;
    }
    const id = `cs_test_${randomBytes(12).toString('hex')}`;
    const session: FakeSession = {
      id,
      object: 'checkout.session',
      amount_total: amount,
      currency: String(priceData.currency ?? 'gbp'),
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      success_url: String(body.success_url ?? ''),
      cancel_url: String(body.cancel_url ?? ''),
      metadata: (body.metadata as Record<string, string>) ?? {},
      client_reference_id: (body.client_reference_id as string) ?? null,
      customer_email: (body.customer_email as string) ?? null,
      description: String(((priceData.product_data as Record<string, unknown>) ?? {}).name ?? 'Payment'),
      url: `${base}/checkout/${id}`,
      created: now,
      expires_at: expiresAt,
      payment_intent: null,
    };
    sessions.set(id, session);
    res.json(session);
  });
  /** A session whose time has run out is expired when next looked at, as the provider does on its own clock. */
  function current(id: string): FakeSession | undefined {
    const s = sessions.get(id);
    if (s && s.status === 'open' && s.expires_at * 1000 <= Date.now()) {
      s.status = 'expired';
      void sendWebhook('checkout.session.expired', s).catch(() => undefined);
    }
    return s;
  }

  app.get('/v1/checkout/sessions/:id', authorised, (req, res) => {
    const session = current(String(req.params.id));
    if (!session) return void res.status(404).json({ error: { type: 'invalid_request_error', message: 'No such checkout.session' } });
    res.json(session);
  });
  app.post('/v1/checkout/sessions/:id/expire', authorised, (req, res) => {
    const session = current(String(req.params.id));
    if (!session) return void res.status(404).json({ error: { type: 'invalid_request_error', message: 'No such checkout.session' } });
    if (session.status !== 'open') {
      res.status(400).json({ error: { type: 'invalid_request_error', message: `Only Checkout Sessions with a status in ["open"] can be expired; this one is ${session.status}.` } });
      return;
    }
    session.status = 'expired';
    res.json(session);
    // The provider's event follows the answer, as a real one arrives on its own.
    void sendWebhook('checkout.session.expired', session).catch(() => undefined);
  });
  app.post('/v1/refunds', authorised, (req, res) => {
    const body = nested(req.body as Record<string, string>);
    const intent = String(body.payment_intent ?? '');
    const session = [...sessions.values()].find((s) => s.payment_intent === intent && s.payment_status === 'paid');
    if (!session) return void res.status(404).json({ error: { type: 'invalid_request_error', message: `No such payment_intent: '${intent}'`, param: 'payment_intent' } });
    const already = [...refunds.values()].filter((r) => r.payment_intent === intent).reduce((t, r) => t + r.amount, 0);
    const amount = body.amount === undefined ? session.amount_total - already : Number(body.amount);
    if (!Number.isInteger(amount) || amount <= 0 || amount + already > session.amount_total) {
      res.status(400).json({ error: { type: 'invalid_request_error', message: 'Refund amount is greater than the unrefunded amount of the charge', param: 'amount' } });
      return;
    }
    const idempotency = String(req.headers['idempotency-key'] ?? '');
    const repeat = idempotency ? [...refunds.values()].find((r) => r.metadata.__idempotency === idempotency) : undefined;
    if (repeat) return void res.json(repeat);
    const refund: FakeRefund = {
      id: `re_test_${randomBytes(12).toString('hex')}`,
      object: 'refund',
      amount,
      currency: session.currency,
      payment_intent: intent,
      status: 'succeeded',
      metadata: { ...((body.metadata as Record<string, string>) ?? {}), ...(idempotency ? { __idempotency: idempotency } : {}) },
      created: Math.floor(Date.now() / 1000),
    };
    refunds.set(refund.id, refund);
    res.json(refund);
  });

  async function sendWebhook(type: string, session: FakeSession): Promise<void> {
    const payload = JSON.stringify({
      id: `evt_${randomBytes(12).toString('hex')}`,
      object: 'event',
      type,
      created: Math.floor(Date.now() / 1000),
      data: { object: session },
      livemode: false,
    });
    const header = signer.webhooks.generateTestHeaderString({ payload, secret: opts.webhookSecret });
    const res = await fetch(opts.webhookUrl, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': header }, body: payload });
    if (!res.ok) throw new Error(`webhook ${type} answered ${res.status}`);
  }

  async function pay(id: string, o: { amount?: number; force?: boolean } = {}): Promise<void> {
    const session = current(id);
    if (!session) throw new Error(`no session ${id}`);
    if (session.status !== 'open' && !o.force) throw new Error(`session ${id} is ${session.status}`);
    session.status = 'complete';
    session.payment_status = 'paid';
    session.payment_intent = `pi_test_${randomBytes(12).toString('hex')}`;
    if (o.amount !== undefined) session.amount_total = o.amount;
    await sendWebhook('checkout.session.completed', session);
  }

  async function expire(id: string): Promise<void> {
    const session = sessions.get(id);
    if (!session) throw new Error(`no session ${id}`);
    if (session.status !== 'open') throw new Error(`session ${id} is ${session.status}`);
    session.status = 'expired';
    await sendWebhook('checkout.session.expired', session);
  }

  app.get('/checkout/:id', (req, res) => {
    const s = current(String(req.params.id));
    if (!s) return void res.status(404).send('No such payment');
    const amount = new Intl.NumberFormat('en-GB', { style: 'currency', currency: s.currency.toUpperCase() }).format(s.amount_total / 100);
    res.type('html').send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Card payment</title><link rel="icon" href="data:,">
<style>body{font-family:system-ui,sans-serif;background:#eef1f4;margin:0;display:grid;place-items:center;min-height:100vh}
main{background:#fff;padding:32px 36px;border-radius:10px;box-shadow:0 6px 24px #0002;max-width:420px;width:100%}
h1{font-size:20px;margin:0 0 4px}p{color:#445}.amount{font-size:32px;font-weight:700;margin:16px 0}
button{font-size:16px;padding:10px 18px;border-radius:6px;border:0;cursor:pointer}
.pay{background:#2b5fd9;color:#fff}.cancel{background:#e3e6ea;margin-left:8px}.note{font-size:12px;color:#778;margin-top:20px}</style></head>
<body><main><h1>Local test payment</h1><p>${escape(s.description)}</p><div class="amount">${amount}</div>
${s.status === 'open' ? `<form method="post" action="/checkout/${s.id}/pay" style="display:inline"><button class="pay" type="submit">Pay ${amount}</button></form>
<form method="post" action="/checkout/${s.id}/cancel" style="display:inline"><button class="cancel" type="submit">Cancel</button></form>` : `<p>This payment is ${s.status}.</p>`}
<p class="note">A stand-in for the payment provider on this machine: no card is charged.</p></main></body></html>`);
  });
  app.post('/checkout/:id/pay', async (req, res) => {
    const s = current(String(req.params.id));
    if (!s || s.status !== 'open') return void res.status(409).send('This payment is no longer open');
    try {
      await pay(s.id);
    } catch (err) {
      res.status(502).send(`The shop did not take the payment notice: ${escape(String(err))}`);
      return;
    }
    res.redirect(303, s.success_url.replace('{CHECKOUT_SESSION_ID}', s.id));
  });
  // Going back without paying leaves the session open, as the provider does: the shop closes it (expire) if it wants.
  app.post('/checkout/:id/cancel', (req, res) => {
    const s = sessions.get(String(req.params.id));
    if (!s) return void res.status(404).send('No such payment');
    res.redirect(303, s.cancel_url);
  });

  const server = http.createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, '127.0.0.1', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  base = `http://127.0.0.1:${port}`;
  return {
    url: base,
    port,
    sessions,
    refunds,
    pay,
    expire,
    stop: async () => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
