/**
 * A local stand-in for the payment provider, for `npm start` and the tests. It answers the provider's official SDK
 * (form-encoded POSTs under /v1): connected accounts (create, retrieve) and their onboarding links, with an
 * onboarding page of its own where a workshop's owner finishes setting up; checkout sessions and refunds on a
 * connected account named by the `Stripe-Account` header (a checkout belongs to the account it was opened on, and no
 * other account can read, expire or refund it); a checkout page where the customer can pay or go back without
 * paying; expiry (on request or when the time runs out); and webhooks signed with the SDK's own signing helper, each
 * naming the connected account in `account`.
 *
 * With a `stateFile`, what it holds (accounts, checkouts, refunds, and the port it listened on) is written to that
 * file after every change and read back at the next start, so a restart of `npm start` keeps the workshops' accounts
 * and open checkouts, on the same port when it is free.
 */
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import express from 'express';
import Stripe from 'stripe';

export interface FakeAccount {
  id: string;
  object: 'account';
  type: 'standard';
  email: string | null;
  country: string;
  default_currency: string;
  business_profile: { name: string | null };
  charges_enabled: boolean;
  payouts_enabled: boolean;
  details_submitted: boolean;
  metadata: Record<string, string>;
  created: number;
}

interface FakeLink {
  id: string;
  account: string;
  return_url: string;
  refresh_url: string;
  expires_at: number;
  used: boolean;
}

export interface FakeSession {
  id: string;
  /** The connected account the checkout was opened on (the stand-in's own record; not part of the API's answer). */
  account: string;
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
  /** The connected account the refund was made on (the stand-in's own record). */
  account: string;
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
  accounts: Map<string, FakeAccount>;
  sessions: Map<string, FakeSession>;
  refunds: Map<string, FakeRefund>;
  /**
   * Finishes an account's onboarding as its owner does on the onboarding page (charges enabled), and sends the
   * `account.updated` webhook unless `notify` is false.
   */
  completeOnboarding(accountId: string, opts?: { notify?: boolean }): Promise<FakeAccount>;
  /**
   * Takes back an account the app already holds, ready, when this stand-in has no record of it (it was started
   * without the state file that had it, as each test file's stand-in is).
   */
  rememberAccount(accountId: string, fields?: { email?: string | null; name?: string | null }): FakeAccount;
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

const ACCOUNT_ID = /^acct_[A-Za-z0-9]{8,40}$/;

interface SavedState {
  port?: number;
  accounts?: FakeAccount[];
  sessions?: FakeSession[];
  refunds?: FakeRefund[];
}

function readState(file: string | undefined): SavedState {
  if (!file) return {};
  try {
    return JSON.parse(fs.readFileSync(file, 'utf8')) as SavedState;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') console.warn(`[payments] ${file} could not be read (${String(err)}): starting empty`);
    return {};
  }
}

/** What the API answers for a checkout: the record without the stand-in's own bookkeeping. */
function view(s: FakeSession): Omit<FakeSession, 'account'> {
  const { account: _account, ...rest } = s;
  return rest;
}

function refundView(r: FakeRefund): Omit<FakeRefund, 'account'> {
  const { account: _account, ...rest } = r;
  return rest;
}

export async function startPaymentProvider(opts: { port?: number; webhookUrl: string; webhookSecret: string; apiKey: string; stateFile?: string }): Promise<PaymentProvider> {
  const saved = readState(opts.stateFile);
  const accounts = new Map<string, FakeAccount>((saved.accounts ?? []).map((a) => [a.id, a]));
  const sessions = new Map<string, FakeSession>((saved.sessions ?? []).map((x) => [x.id, x]));
  const refunds = new Map<string, FakeRefund>((saved.refunds ?? []).map((r) => [r.id, r]));
  const links = new Map<string, FakeLink>();
  const signer = new Stripe(opts.apiKey);
  const app = express();
  app.use(express.urlencoded({ extended: false }));

  let port = 0;
  /** Writes the state file (whole, then renamed into place, so a crash never leaves half a file). */
  function persist(): void {
    if (!opts.stateFile) return;
    const data: SavedState = { port, accounts: [...accounts.values()], sessions: [...sessions.values()], refunds: [...refunds.values()] };
    fs.mkdirSync(path.dirname(opts.stateFile), { recursive: true });
    const tmp = `${opts.stateFile}.${process.pid}.tmp`;
    fs.writeFileSync(tmp, JSON.stringify(data));
    fs.renameSync(tmp, opts.stateFile);
  }

  const fail = (res: express.Response, status: number, message: string, extra: Record<string, string> = {}) =>
    void res.status(status).json({ error: { type: status === 403 ? 'permission_error' : 'invalid_request_error', message, ...extra } });

  /** The connected account named by the Stripe-Account header: every payment call is made on one. */
  function accountOf(req: express.Request, res: express.Response): FakeAccount | undefined {
    const raw = req.headers['stripe-account'];
    const id = Array.isArray(raw) ? raw[0] : raw;
    if (!id) {
      fail(res, 400, 'This stand-in takes payments on connected accounts only: name the account in the Stripe-Account header.');
      return undefined;
    }
    const account = accounts.get(id);
    if (!account) {
      fail(res, 403, `The provided key does not have access to account '${id}' (or that account does not exist).`);
      return undefined;
    }
    return account;
  }

  const authorised: express.RequestHandler = (req, res, next) => {
    if (req.headers.authorization !== `Bearer ${opts.apiKey}`) {
      res.status(401).json({ error: { type: 'invalid_request_error', message: 'Invalid API key provided' } });
      return;
    }
    next();
  };

  let base = '';

  // ------------------------------------------------------------------ connected accounts and onboarding
  app.post('/v1/accounts', authorised, (req, res) => {
    if (req.headers['stripe-account']) return fail(res, 400, 'Connected accounts are created by the platform, not on a connected account.');
    const body = nested(req.body as Record<string, string>);
    const account: FakeAccount = {
      id: `acct_${randomBytes(8).toString('hex')}`,
      object: 'account',
      type: 'standard',
      email: (body.email as string | undefined) ?? null,
      country: String(body.country ?? 'GB'),
      default_currency: String(body.default_currency ?? 'gbp'),
      business_profile: { name: ((body.business_profile as Record<string, string> | undefined)?.name ?? null) || null },
      charges_enabled: false,
      payouts_enabled: false,
      details_submitted: false,
      metadata: (body.metadata as Record<string, string>) ?? {},
      created: Math.floor(Date.now() / 1000),
    };
    accounts.set(account.id, account);
    persist();
    res.json(account);
  });
  app.get('/v1/accounts/:id', authorised, (req, res) => {
    const account = accounts.get(String(req.params.id));
    if (!account) return fail(res, 404, `No such account: '${String(req.params.id)}'`, { param: 'account' });
    res.json(account);
  });
  app.post('/v1/account_links', authorised, (req, res) => {
    const body = nested(req.body as Record<string, string>);
    const account = accounts.get(String(body.account ?? ''));
    if (!account) return fail(res, 400, `No such account: '${String(body.account ?? '')}'`, { param: 'account' });
    if (body.type !== 'account_onboarding') return fail(res, 400, 'This stand-in makes account_onboarding links only.', { param: 'type' });
    const returnUrl = String(body.return_url ?? '');
    const refreshUrl = String(body.refresh_url ?? '');
    if (!/^https?:\/\//.test(returnUrl)) return fail(res, 400, 'return_url must be an address starting with http:// or https://', { param: 'return_url' });
    if (!/^https?:\/\//.test(refreshUrl)) return fail(res, 400, 'refresh_url must be an address starting with http:// or https://', { param: 'refresh_url' });
    const now = Math.floor(Date.now() / 1000);
    const link: FakeLink = { id: randomBytes(12).toString('hex'), account: account.id, return_url: returnUrl, refresh_url: refreshUrl, expires_at: now + 300, used: false };
    links.set(link.id, link);
    res.json({ object: 'account_link', created: now, expires_at: link.expires_at, url: `${base}/connect/onboarding/${link.id}` });
  });

  async function completeOnboarding(accountId: string, o: { notify?: boolean } = {}): Promise<FakeAccount> {
    const account = accounts.get(accountId);
    if (!account) throw new Error(`no account ${accountId}`);
    account.charges_enabled = true;
    account.payouts_enabled = true;
    account.details_submitted = true;
    persist();
    if (o.notify !== false) await sendEvent('account.updated', account.id, account);
    return account;
  }

  function rememberAccount(accountId: string, fields: { email?: string | null; name?: string | null } = {}): FakeAccount {
    if (!ACCOUNT_ID.test(accountId)) throw new Error(`not an account id: ${accountId}`);
    const known = accounts.get(accountId);
    if (known) return known;
    const account: FakeAccount = {
      id: accountId,
      object: 'account',
      type: 'standard',
      email: fields.email ?? null,
      country: 'GB',
      default_currency: 'gbp',
      business_profile: { name: fields.name ?? null },
      charges_enabled: true,
      payouts_enabled: true,
      details_submitted: true,
      metadata: {},
      created: Math.floor(Date.now() / 1000),
    };
    accounts.set(accountId, account);
    persist();
    return account;
  }

  /** A link that is unknown, spent or out of time sends the owner to the refresh address, as the provider does. */
  function liveLink(id: string): FakeLink | undefined {
    const link = links.get(id);
    if (!link || link.used || link.expires_at * 1000 <= Date.now()) return undefined;
    return link;
  }

  app.get('/connect/onboarding/:link', (req, res) => {
    const link = links.get(String(req.params.link));
    if (!link) return void res.status(404).send('No such onboarding link');
    if (!liveLink(link.id)) return void res.redirect(303, link.refresh_url);
    const account = accounts.get(link.account)!;
    res.type('html').send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Set up card payments</title><link rel="icon" href="data:,">
<style>body{font-family:system-ui,sans-serif;background:#eef1f4;margin:0;display:grid;place-items:center;min-height:100vh}
main{background:#fff;padding:32px 36px;border-radius:10px;box-shadow:0 6px 24px #0002;max-width:460px;width:100%}
h1{font-size:20px;margin:0 0 4px}p{color:#445}dl{color:#223}dt{font-weight:600}dd{margin:0 0 10px}
button{font-size:16px;padding:10px 18px;border-radius:6px;border:0;cursor:pointer}
.go{background:#2b5fd9;color:#fff}.later{background:#e3e6ea;margin-left:8px}.note{font-size:12px;color:#778;margin-top:20px}</style></head>
<body><main><h1>Local test account set-up</h1><p>Card payments for this business will be paid into this account.</p>
<dl><dt>Business</dt><dd>${escape(account.business_profile.name ?? 'Not named')}</dd><dt>E-mail</dt><dd>${escape(account.email ?? 'Not given')}</dd><dt>Account</dt><dd>${escape(account.id)}</dd></dl>
<form method="post" action="/connect/onboarding/${link.id}/complete" style="display:inline"><button class="go" type="submit">Finish setting up</button></form>
<form method="post" action="/connect/onboarding/${link.id}/leave" style="display:inline"><button class="later" type="submit">Come back later</button></form>
<p class="note">A stand-in for the payment provider on this machine: no bank details are asked for or kept.</p></main></body></html>`);
  });
  app.post('/connect/onboarding/:link/complete', async (req, res) => {
    const link = liveLink(String(req.params.link));
    if (!link) return void res.status(409).send('This set-up link has been used or has run out: start again from the workshop\u2019s settings.');
    link.used = true;
    try {
      await completeOnboarding(link.account);
    } catch (err) {
      res.status(502).send(`The workshop did not take the notice: ${escape(String(err))}`);
      return;
    }
    res.redirect(303, link.return_url);
  });
  app.post('/connect/onboarding/:link/leave', (req, res) => {
    const link = links.get(String(req.params.link));
    if (!link) return void res.status(404).send('No such onboarding link');
    link.used = true;
    res.redirect(303, link.return_url);
  });

  // ------------------------------------------------------------------ checkouts and refunds on a connected account
  app.post('/v1/checkout/sessions', authorised, (req, res) => {
    const account = accountOf(req, res);
    if (!account) return;
    if (!account.charges_enabled) return fail(res, 400, `Account ${account.id} cannot take charges yet: its owner has not finished setting it up.`);
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
      account: account.id,
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
    persist();
    res.json(view(session));
  });
  /** A session whose time has run out is expired when next looked at, as the provider does on its own clock. */
  function current(id: string): FakeSession | undefined {
    const s = sessions.get(id);
    if (s && s.status === 'open' && s.expires_at * 1000 <= Date.now()) {
      s.status = 'expired';
      persist();
      void sendWebhook('checkout.session.expired', s).catch(() => undefined);
    }
    return s;
  }

  /** The checkout named in the path, on the request's account only (another account's is "no such" checkout). */
  function sessionOn(req: express.Request, res: express.Response): FakeSession | undefined {
    const account = accountOf(req, res);
    if (!account) return undefined;
    const id = String(req.params.id);
    const known = sessions.get(id);
    if (!known || known.account !== account.id) {
      fail(res, 404, `No such checkout.session: '${id}'`);
      return undefined;
    }
    return current(id);
  }

  app.get('/v1/checkout/sessions/:id', authorised, (req, res) => {
    const session = sessionOn(req, res);
    if (session) res.json(view(session));
  });
  app.post('/v1/checkout/sessions/:id/expire', authorised, (req, res) => {
    const session = sessionOn(req, res);
    if (!session) return;
    if (session.status !== 'open') {
      res.status(400).json({ error: { type: 'invalid_request_error', message: `Only Checkout Sessions with a status in ["open"] can be expired; this one is ${session.status}.` } });
      return;
    }
    session.status = 'expired';
    persist();
    res.json(view(session));
    // The provider's event follows the answer, as a real one arrives on its own.
    void sendWebhook('checkout.session.expired', session).catch(() => undefined);
  });
  app.post('/v1/refunds', authorised, (req, res) => {
    const account = accountOf(req, res);
    if (!account) return;
    const body = nested(req.body as Record<string, string>);
    const intent = String(body.payment_intent ?? '');
    const session = [...sessions.values()].find((s) => s.payment_intent === intent && s.payment_status === 'paid' && s.account === account.id);
    if (!session) return void res.status(404).json({ error: { type: 'invalid_request_error', message: `No such payment_intent: '${intent}'`, param: 'payment_intent' } });
    const already = [...refunds.values()].filter((r) => r.payment_intent === intent).reduce((t, r) => t + r.amount, 0);
    const amount = body.amount === undefined ? session.amount_total - already : Number(body.amount);
    if (!Number.isInteger(amount) || amount <= 0 || amount + already > session.amount_total) {
      res.status(400).json({ error: { type: 'invalid_request_error', message: 'Refund amount is greater than the unrefunded amount of the charge', param: 'amount' } });
      return;
    }
    const idempotency = String(req.headers['idempotency-key'] ?? '');
    const repeat = idempotency ? [...refunds.values()].find((r) => r.metadata.__idempotency === idempotency) : undefined;
    if (repeat) return void res.json(refundView(repeat));
    const refund: FakeRefund = {
      id: `re_test_${randomBytes(12).toString('hex')}`,
      account: account.id,
      object: 'refund',
      amount,
      currency: session.currency,
      payment_intent: intent,
      status: 'succeeded',
      metadata: { ...((body.metadata as Record<string, string>) ?? {}), ...(idempotency ? { __idempotency: idempotency } : {}) },
      created: Math.floor(Date.now() / 1000),
    };
    refunds.set(refund.id, refund);
    persist();
    res.json(refundView(refund));
  });

  const sendWebhook = (type: string, session: FakeSession) => sendEvent(type, session.account, view(session));

  /** An event on a connected account: `account` names it, as the provider's Connect events do. */
  async function sendEvent(type: string, account: string, object: object): Promise<void> {
    const payload = JSON.stringify({
      id: `evt_${randomBytes(12).toString('hex')}`,
      object: 'event',
      type,
      account,
      created: Math.floor(Date.now() / 1000),
      data: { object },
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
    persist();
    await sendWebhook('checkout.session.completed', session);
  }

  async function expire(id: string): Promise<void> {
    const session = sessions.get(id);
    if (!session) throw new Error(`no session ${id}`);
    if (session.status !== 'open') throw new Error(`session ${id} is ${session.status}`);
    session.status = 'expired';
    persist();
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
  const listen = (p: number) =>
    new Promise<void>((resolve, reject) => {
      const failed = (err: Error) => reject(err);
      server.once('error', failed);
      server.listen(p, '127.0.0.1', () => {
        server.off('error', failed);
        resolve();
      });
    });
  if (opts.port === undefined && saved.port) {
    // The port of last time, so the checkout addresses the app kept still lead here; any free one if it is taken.
    await listen(saved.port).catch(() => listen(0));
  } else {
    await listen(opts.port ?? 0);
  }
  port = (server.address() as AddressInfo).port;
  base = `http://127.0.0.1:${port}`;
  for (const x of sessions.values()) x.url = `${base}/checkout/${x.id}`;
  persist();
  return {
    url: base,
    port,
    accounts,
    sessions,
    refunds,
    completeOnboarding,
    rememberAccount,
    pay,
    expire,
    stop: async () => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
