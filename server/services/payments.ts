/**
 * Deposits through the payment provider's official SDK: a checkout session for the accepted quote's deposit, and
 * the signed webhook that says it was paid. Webhooks are verified and handled once per event id.
 */
import Stripe from 'stripe';
import { UniqueConstraintError, type Sequelize } from 'sequelize';
import { money } from '@shared/money';
import type { Config } from '../config';
import { HttpProblem } from '../http/problem';
import { Estimate, Payment, PaymentEvent, Quote } from '../models';
import { audit } from './audit';

/** An amount in the currency's minor unit (pence for GBP, yen for JPY), as the provider counts it. */
export function minorUnits(amount: string, currency: string): number {
  const digits = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
  return money(amount).times(10 ** digits).toDecimalPlaces(0).toNumber();
}

function client(config: Config): Stripe {
  const { apiUrl, secretKey } = config.payments;
  if (!secretKey) throw new HttpProblem(503, 'payments_unconfigured', 'Payments unavailable', 'Card payments are not set up for this workshop.');
  if (!apiUrl) return new Stripe(secretKey, { maxNetworkRetries: 1, telemetry: false });
  const url = new URL(apiUrl);
  return new Stripe(secretKey, {
    host: url.hostname,
    port: Number(url.port || (url.protocol === 'https:' ? 443 : 80)),
    protocol: url.protocol === 'https:' ? 'https' : 'http',
    maxNetworkRetries: 0,
    telemetry: false,
  });
}

/** Opens a checkout for a deposit and records it as pending; returns where to send the customer. */
export async function startCheckout(config: Config, quote: Quote, returnUrl: string, description: string, email: string | null): Promise<string> {
  const amount = minorUnits(String(quote.acceptedDeposit ?? quote.deposit), quote.currency);
  if (amount <= 0) throw new HttpProblem(409, 'no_deposit', 'No deposit due', 'This quote asks for no deposit.');
  let session: Stripe.Checkout.Session;
  try {
    session = await client(config).checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: quote.currency.toLowerCase(), unit_amount: amount, product_data: { name: description } } }],
      success_url: `${returnUrl}?deposit=paid`,
      cancel_url: `${returnUrl}?deposit=cancelled`,
      client_reference_id: quote.number,
      ...(email ? { customer_email: email } : {}),
      metadata: { quote_id: String(quote.id), quote_number: quote.number },
    });
  } catch (err) {
    throw new HttpProblem(502, 'payments_unreachable', 'Payment service unavailable', `The payment service did not answer: ${err instanceof Error ? err.message : String(err)}. Try again in a moment.`);
  }
  if (!session.url) throw new HttpProblem(502, 'payments_unreachable', 'Payment service unavailable', 'The payment service gave no checkout address.');
  await Payment.create({ quoteId: quote.id, providerSessionId: session.id, amountMinor: amount, currency: quote.currency, paidAt: null });
  return session.url;
}

/**
 * Handles a webhook: verifies its signature (400 when forged), records the event id (a repeated delivery changes
 * nothing), and marks the deposit paid when the amount and currency match what was asked.
 */
export async function handleWebhook(sequelize: Sequelize, config: Config, raw: Buffer, signature: string | undefined): Promise<{ handled: boolean; duplicate?: boolean }> {
  if (!config.payments.webhookSecret || !config.payments.secretKey) throw new HttpProblem(503, 'payments_unconfigured', 'Payments unavailable');
  let event: Stripe.Event;
  try {
    event = client(config).webhooks.constructEvent(raw, signature ?? '', config.payments.webhookSecret);
  } catch {
    throw new HttpProblem(400, 'bad_signature', 'Webhook refused', 'The webhook signature does not verify.');
  }
  try {
    return await sequelize.transaction(async (transaction) => {
      await PaymentEvent.create({ eventId: event.id, type: event.type, receivedAt: new Date() }, { transaction });
      if (event.type !== 'checkout.session.completed') return { handled: false };
      const session = event.data.object as Stripe.Checkout.Session;
      const payment = await Payment.findOne({ where: { providerSessionId: session.id }, transaction, lock: transaction.LOCK.UPDATE });
      if (!payment) return { handled: false };
      const amountOk = Number(payment.amountMinor) === session.amount_total && payment.currency.toLowerCase() === String(session.currency).toLowerCase();
      if (!amountOk || session.payment_status !== 'paid') return { handled: false };
      if (payment.status !== 'paid') await payment.update({ status: 'paid', paidAt: new Date() }, { transaction });
      const quote = await Quote.findByPk(payment.quoteId, { transaction, lock: transaction.LOCK.UPDATE });
      if (quote && quote.state === 'accepted') {
        await quote.update({ state: 'deposit-paid', depositPaidAt: new Date() }, { transaction });
        await Estimate.update({ state: 'deposit-paid' }, { where: { id: quote.estimateId }, transaction });
        await audit({ userId: null, action: 'quote.deposit_paid', entityType: 'quote', entityId: quote.id, after: { amountMinor: session.amount_total, session: session.id } }, transaction);
      }
      return { handled: true };
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) return { handled: false, duplicate: true };
    throw err;
  }
}
