/**
 * Deposits through the payment provider's official SDK: one open checkout per accepted quote for the deposit on the
 * accepted total, and the signed webhooks that say a checkout was paid or expired. Webhooks are verified and handled
 * once per event id. A payment that cannot count as the deposit (the deposit is already paid, or the amount is not
 * the deposit) is recorded and flagged, never counted; one that arrives for an already paid deposit is refunded
 * through the SDK. The database keeps the rules too: one pending checkout per quote, one counted deposit per quote.
 */
import type Stripe from 'stripe';
import { Op, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import type { FlaggedPayment, PaymentDto, PaymentFlag } from '@shared/schemas/quotes';
import type { Config } from '../config';
import { lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
import { HttpProblem, problems } from '../http/problem';
import { Customer, Estimate, Payment, PaymentEvent, Quote, Workshop } from '../models';
import { audit } from './audit';
import { balanceCompleted, markDepositPaid, recordCardPayment } from './accounts';
import { deliver } from './mail';
import { accountOfPayment, CHECKOUT_MINUTES, client, fromMinor, lapseCheckouts, minorUnits, onAccount, paymentDto, unreachable, workshopPaymentAccount } from './payment-provider';

/**
 * The deposit checkout of an accepted quote: the open one when there is one, else a new one at the provider for the
 * deposit on the accepted total. Runs under the quote's row lock, so parallel requests get the same checkout; the
 * database refuses a second pending checkout for a quote whatever happens.
 */
export async function openCheckout(
  sequelize: Sequelize,
  config: Config,
  quoteId: number,
  a: { returnUrl: string; description: string; email: string | null },
): Promise<{ url: string; reused: boolean }> {
  return sequelize.transaction(async (transaction) => {
    const quote = await Quote.findByPk(quoteId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!quote) throw problems.notFound('Quote');
    if (quote.state === 'deposit-paid') throw new HttpProblem(409, 'quote_deposit_paid', 'Deposit paid', 'The deposit for this quote has already been paid.');
    if (quote.state !== 'accepted' || quote.acceptedDeposit === null) throw new HttpProblem(409, 'not_accepted', 'Accept first', 'Accept the quote before paying the deposit.');
    const amount = minorUnits(String(quote.acceptedDeposit), quote.currency);
    if (amount <= 0) throw new HttpProblem(409, 'no_deposit', 'No deposit due', 'This quote asks for no deposit.');
    // The deposit is taken on the workshop's own account with the provider (409 while it has none ready).
    const account = await workshopPaymentAccount(transaction);
    await lapseCheckouts(quote.id, transaction);
    const open = await Payment.findOne({ where: { quoteId: quote.id, status: 'pending' }, transaction });
    if (open && Number(open.amountMinor) === amount && open.checkoutUrl && (open.providerAccountId ?? account) === account) return { url: open.checkoutUrl, reused: true };
    if (open) {
      // A checkout for another amount cannot stand: close it at the provider before opening the right one.
      const on = await accountOfPayment(open, transaction);
      if (on) await client(config).checkout.sessions.expire(open.providerSessionId, {}, onAccount(on)).catch(() => undefined);
      await open.update({ status: 'cancelled', closedAt: new Date() }, { transaction });
    }
    let session: Stripe.Checkout.Session;
    try {
      session = await client(config).checkout.sessions.create({
        mode: 'payment',
        line_items: [{ quantity: 1, price_data: { currency: quote.currency.toLowerCase(), unit_amount: amount, product_data: { name: a.description } } }],
        success_url: `${a.returnUrl}?deposit=paid`,
        cancel_url: `${a.returnUrl}?deposit=cancelled`,
        client_reference_id: quote.number,
        expires_at: Math.floor(Date.now() / 1000) + CHECKOUT_MINUTES * 60,
        ...(a.email ? { customer_email: a.email } : {}),
        metadata: { quote_id: String(quote.id), quote_number: quote.number },
      }, onAccount(account));
    } catch (err) {
      throw unreachable(err);
    }
    if (!session.url) throw new HttpProblem(502, 'payments_unreachable', 'Payment service unavailable', 'The payment service gave no checkout address.');
    await Payment.create(
      {
        quoteId: quote.id,
        providerSessionId: session.id,
        amountMinor: amount,
        currency: quote.currency,
        paidAt: null,
        checkoutUrl: session.url,
        expiresAt: session.expires_at ? new Date(session.expires_at * 1000) : new Date(Date.now() + CHECKOUT_MINUTES * 60_000),
        providerAccountId: account,
      },
      { transaction },
    );
    return { url: session.url, reused: false };
  });
}

/**
 * The customer came back from the payment page without paying: the open checkout is closed at the provider (so it
 * cannot be paid later) and shown as cancelled. A checkout the provider says was paid meanwhile is left to its webhook.
 */
export async function cancelCheckout(config: Config, quoteId: number): Promise<{ cancelled: boolean }> {
  const open = await Payment.findOne({ where: { quoteId, status: 'pending' } });
  if (!open) return { cancelled: false };
  const on = await accountOfPayment(open);
  try {
    if (on) {
      const session = await client(config).checkout.sessions.retrieve(open.providerSessionId, {}, onAccount(on));
      if (session.status === 'complete') return { cancelled: false };
      if (session.status === 'open') await client(config).checkout.sessions.expire(open.providerSessionId, {}, onAccount(on));
    }
  } catch (err) {
    throw unreachable(err);
  }
  const [n] = await Payment.update({ status: 'cancelled', closedAt: new Date() }, { where: { id: open.id, status: 'pending' } });
  if (n > 0) await audit({ userId: null, action: 'payment.cancel', entityType: 'quote', entityId: quoteId, after: { session: open.providerSessionId } });
  return { cancelled: n > 0 };
}

interface Outcome {
  handled: boolean;
  duplicate?: boolean;
  flag?: PaymentFlag;
  refund?: number;
  /** A receipt to deliver once the transaction has committed. */
  mail?: number;
}

/** What a completed checkout does: counts as the deposit, or is recorded and flagged (and refunded when paid twice). */
async function completed(session: Stripe.Checkout.Session, transaction: Transaction): Promise<Outcome> {
  if (session.payment_status !== 'paid') return { handled: false };
  let payment = await Payment.findOne({ where: { providerSessionId: session.id }, transaction, lock: transaction.LOCK.UPDATE });
  const quoteId = payment?.quoteId ?? Number(session.metadata?.quote_id);
  const quote = Number.isInteger(quoteId) && quoteId > 0 ? await Quote.findByPk(quoteId, { transaction, lock: transaction.LOCK.UPDATE }) : null;
  if (!quote) return { handled: false };
  // A checkout for the balance (after the deposit) is counted by the account's own rules.
  if ((payment?.purpose ?? session.metadata?.purpose) === 'balance') {
    if (!payment) {
      payment = await Payment.create(
        { quoteId: quote.id, providerSessionId: session.id, amountMinor: session.amount_total ?? 0, currency: quote.currency, paidAt: null, checkoutUrl: null, expiresAt: null, purpose: 'balance' },
        { transaction },
      );
    }
    return balanceCompleted(session, payment, quote, transaction);
  }
  const received = session.amount_total ?? 0;
  const currencyOk = String(session.currency ?? '').toLowerCase() === quote.currency.toLowerCase();
  const paymentIntent = typeof session.payment_intent === 'string' ? session.payment_intent : (session.payment_intent?.id ?? null);
  if (!payment) {
    payment = await Payment.create(
      { quoteId: quote.id, providerSessionId: session.id, amountMinor: received, currency: quote.currency, paidAt: null, checkoutUrl: null, expiresAt: null },
      { transaction },
    );
  }
  if (payment.status === 'paid' || payment.status === 'refunded') return { handled: true };
  const due = quote.acceptedDeposit === null ? null : minorUnits(String(quote.acceptedDeposit), quote.currency);
  const counted = await Payment.findOne({ where: { quoteId: quote.id, status: 'paid', flag: null, id: { [Op.ne]: payment.id } }, transaction });
  const base = { status: 'paid' as const, paidAt: new Date(), paymentIntent, amountReceivedMinor: received };

  let flag: PaymentFlag | null = null;
  let note: string | null = null;
  if (quote.state === 'deposit-paid' || counted) {
    flag = 'duplicate';
    note = `Paid after the deposit for quote ${quote.number} was already paid: refunded.`;
  } else if (quote.state !== 'accepted') {
    flag = 'unknown-checkout';
    note = `Paid while quote ${quote.number} is ${quote.state}: refunded.`;
  } else if (!currencyOk || due === null || received !== due || Number(payment.amountMinor) !== due) {
    flag = 'amount-mismatch';
    note = `The provider took ${fromMinor(received, quote.currency)} ${String(session.currency ?? '').toUpperCase()}; the deposit due is ${due === null ? 'not set' : fromMinor(due, quote.currency)} ${quote.currency}. Not counted as the deposit.`;
  }
  if (flag) {
    await payment.update({ ...base, flag, note }, { transaction });
    await audit({ userId: null, action: 'payment.flag', entityType: 'quote', entityId: quote.id, after: { flag, session: session.id, amountMinor: received } }, transaction);
    return { handled: true, flag, ...(flag === 'amount-mismatch' ? {} : { refund: payment.id }) };
  }
  await payment.update({ ...base, flag: null, note: null }, { transaction });
  // The quote and the estimates of the lines the customer chose (a quote of one piece: its estimate).
  await markDepositPaid(quote, transaction);
  await audit({ userId: null, action: 'quote.deposit_paid', entityType: 'quote', entityId: quote.id, after: { amountMinor: received, session: session.id } }, transaction);
  // The deposit enters the job's ledger, with its receipt for the customer.
  const mail = await recordCardPayment(quote, payment, 'deposit', transaction);
  return { handled: true, ...(mail ? { mail } : {}) };
}

/**
 * Handles a webhook: verifies its signature (400 when forged), records the event id (a repeated delivery changes
 * nothing), and acts on a completed or expired checkout. A payment to give back is refunded once the record is safe.
 */
export async function handleWebhook(sequelize: Sequelize, config: Config, raw: Buffer, signature: string | undefined): Promise<Outcome> {
  if (!config.payments.webhookSecret || !config.payments.secretKey) throw new HttpProblem(503, 'payments_unconfigured', 'Payments unavailable');
  let event: Stripe.Event;
  try {
    event = client(config).webhooks.constructEvent(raw, signature ?? '', config.payments.webhookSecret);
  } catch {
    throw new HttpProblem(400, 'bad_signature', 'Webhook refused', 'The webhook signature does not verify.');
  }
  // The event is attributed to the workshop whose connected account it names (`account`); an event for no known
  // account is acknowledged and not kept (there is no workshop to keep it under).
  const accountId = typeof event.account === 'string' ? event.account : null;
  const workshopId = accountId ? await lookupWorkshop(sequelize, 'payment_account', accountId) : null;
  if (workshopId === null || accountId === null) return { handled: false };
  if (event.type === 'account.updated') return runAsWorkshop(workshopId, () => accountUpdated(sequelize, event, accountId));
  // A checkout's event counts only when the checkout belongs to that same workshop, and was opened on that account:
  // an event whose account does not own the session changes nothing.
  const sessionId = (event.data.object as { id?: unknown }).id;
  const sessionWorkshop = typeof sessionId === 'string' ? await lookupWorkshop(sequelize, 'payment_session', sessionId) : null;
  if (sessionWorkshop !== workshopId) return { handled: false };
  return runAsWorkshop(workshopId, async () => {
    const payment = await Payment.findOne({ where: { providerSessionId: sessionId as string }, attributes: ['id', 'providerAccountId'] });
    if (!payment || (payment.providerAccountId !== null && payment.providerAccountId !== accountId)) return { handled: false };
    return handleEvent(sequelize, config, event);
  });
}

/** The provider says how far the workshop's account has got: ready once it takes charges, else still onboarding. */
async function accountUpdated(sequelize: Sequelize, event: Stripe.Event, accountId: string): Promise<Outcome> {
  const account = event.data.object as Stripe.Account;
  if (account.id !== accountId) return { handled: false };
  try {
    return await sequelize.transaction(async (transaction) => {
      await PaymentEvent.create({ eventId: event.id, type: event.type, receivedAt: new Date() }, { transaction });
      const workshop = await Workshop.findOne({ where: { paymentAccountId: accountId }, transaction, lock: transaction.LOCK.UPDATE });
      if (!workshop) return { handled: false };
      const state = account.charges_enabled ? 'ready' : 'onboarding';
      if (workshop.paymentAccountState !== state) {
        await workshop.update({ paymentAccountState: state }, { transaction });
        await audit({ userId: null, action: 'workshop.card_payments', entityType: 'workshop', entityId: workshop.id, after: { account: accountId, state } }, transaction);
      }
      return { handled: true };
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) return { handled: false, duplicate: true };
    throw err;
  }
}

async function handleEvent(sequelize: Sequelize, config: Config, event: Stripe.Event): Promise<Outcome> {
  let outcome: Outcome;
  try {
    outcome = await sequelize.transaction(async (transaction) => {
      await PaymentEvent.create({ eventId: event.id, type: event.type, receivedAt: new Date() }, { transaction });
      const session = event.data.object as Stripe.Checkout.Session;
      if (event.type === 'checkout.session.completed') return completed(session, transaction);
      if (event.type === 'checkout.session.expired') {
        const [n] = await Payment.update({ status: 'expired', closedAt: new Date() }, { where: { providerSessionId: session.id, status: 'pending' }, transaction });
        return { handled: n > 0 };
      }
      return { handled: false };
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) return { handled: false, duplicate: true };
    throw err;
  }
  if (outcome.refund) await refundPayment(config, outcome.refund, null).catch(() => undefined);
  const { mail, ...answer } = outcome;
  if (mail) await deliver(config, mail);
  return answer;
}

/**
 * Gives a flagged payment back through the provider's refund call. A refund that fails stays flagged with the
 * provider's reason, for the owner to try again.
 */
export async function refundPayment(config: Config, paymentId: number, actorId: number | null): Promise<PaymentDto> {
  const payment = await Payment.findByPk(paymentId);
  if (!payment) throw problems.notFound('Payment');
  if (payment.status === 'refunded') return paymentDto(payment);
  if (payment.status !== 'paid' || !payment.flag) {
    throw problems.conflict('not_refundable', 'Only a flagged payment (paid twice, or for another amount) is refunded from here; a counted deposit is not.');
  }
  if (!payment.paymentIntent) throw problems.conflict('not_refundable', 'The provider gave no payment reference for this payment: refund it from the provider\u2019s dashboard.');
  const on = await accountOfPayment(payment);
  if (!on) throw problems.conflict('not_refundable', 'This payment names no account at the provider: refund it from the provider\u2019s dashboard.');
  try {
    // Refunded on the account that took the payment.
    const refund = await client(config).refunds.create(
      { payment_intent: payment.paymentIntent, metadata: { payment_id: String(payment.id), quote_id: String(payment.quoteId) } },
      { idempotencyKey: `refund-payment-${payment.id}`, ...onAccount(on) },
    );
    await payment.update({ status: 'refunded', refundId: refund.id, refundedAt: new Date() });
    await audit({ userId: actorId, action: 'payment.refund', entityType: 'quote', entityId: payment.quoteId, after: { payment: payment.id, refund: refund.id, amountMinor: refund.amount } });
  } catch (err) {
    await payment.update({ note: `${payment.note ?? ''} The refund did not go through: ${err instanceof Error ? err.message : String(err)}`.trim() });
    throw unreachable(err);
  }
  return paymentDto(payment);
}

/** Payments the owner should look at: flagged ones, newest first. */
export async function flaggedPayments(): Promise<FlaggedPayment[]> {
  const rows = await Payment.findAll({ where: { flag: { [Op.ne]: null } }, order: [['id', 'DESC']], limit: 200 });
  const quotes = await Quote.findAll({ where: { id: rows.map((r) => r.quoteId) }, attributes: ['id', 'number', 'state', 'estimateId'] });
  const estimates = await Estimate.findAll({ where: { id: quotes.map((q) => q.estimateId) }, attributes: ['id', 'customerId'] });
  const customers = await Customer.findAll({ where: { id: estimates.map((e) => e.customerId) }, attributes: ['id', 'name'] });
  return rows.map((p) => {
    const q = quotes.find((x) => x.id === p.quoteId)!;
    const e = estimates.find((x) => x.id === q.estimateId);
    return { ...paymentDto(p), quote: { id: q.id, number: q.number, state: q.state }, customer: customers.find((c) => c.id === e?.customerId)?.name ?? '' };
  });
}
