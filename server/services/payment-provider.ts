/**
 * The payment provider's side of money, shared by deposits (payments.ts) and the job's account (accounts.ts): the
 * SDK client, amounts in the currency's minor unit, the API's shape of a payment, and lapsing checkouts whose time
 * at the provider has run out.
 */
import { Op, type Transaction } from 'sequelize';
import Stripe from 'stripe';
import { money } from '@shared/money';
import type { PaymentDto } from '@shared/schemas/quotes';
import type { Config } from '../config';
import { HttpProblem } from '../http/problem';
import { Payment, Workshop } from '../models';

/** How long a checkout stays open at the provider (the provider accepts 30 minutes to 24 hours). */
export const CHECKOUT_MINUTES = 60;

function digitsOf(currency: string): number {
  return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

/** An amount in the currency's minor unit (pence for GBP, yen for JPY), as the provider counts it. */
export function minorUnits(amount: string, currency: string): number {
  return money(amount).times(10 ** digitsOf(currency)).toDecimalPlaces(0).toNumber();
}

export function fromMinor(minor: number | string, currency: string): string {
  const digits = digitsOf(currency);
  return money(String(minor)).dividedBy(10 ** digits).toFixed(2);
}

/** The provider's SDK client for this configuration (503 when card payments are not set up). */
export function paymentClient(config: Config): Stripe {
  return client(config);
}

export function client(config: Config): Stripe {
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

/** The SDK's request options that make a call on a workshop's connected account (the Stripe-Account header). */
export function onAccount(accountId: string): Stripe.RequestOptions {
  return { stripeAccount: accountId };
}

export const cardPaymentsNotSetUp = () =>
  new HttpProblem(409, 'payments_not_set_up', 'Card payments not set up', 'Card payments are not set up for this workshop: please pay another way, or ask the workshop.');

/** Whether the workshop the code runs under has an account ready to take card payments. */
export async function cardPaymentsReady(config: Config, transaction?: Transaction): Promise<boolean> {
  if (!config.payments.secretKey) return false;
  const w = await Workshop.findOne({ attributes: ['id', 'paymentAccountId', 'paymentAccountState'], order: [['id', 'ASC']], transaction });
  return Boolean(w?.paymentAccountId) && w?.paymentAccountState === 'ready';
}

/**
 * The connected account the current workshop takes card payments on; 409 when it has none ready. Inside a
 * transaction the workshop's row is read FOR SHARE, so a checkout being opened and the owner disconnecting the account
 * wait for each other: the disconnection closes every checkout opened before it, and none opens on the account after.
 */
export async function workshopPaymentAccount(transaction?: Transaction): Promise<string> {
  const w = await Workshop.findOne({ attributes: ['id', 'paymentAccountId', 'paymentAccountState'], order: [['id', 'ASC']], transaction, ...(transaction ? { lock: transaction.LOCK.SHARE } : {}) });
  if (!w?.paymentAccountId || w.paymentAccountState !== 'ready') throw cardPaymentsNotSetUp();
  return w.paymentAccountId;
}

/**
 * The account a checkout lives on: the one it was opened on, or (for a checkout recorded before workshops had
 * accounts of their own) the workshop's account; null when there is none.
 */
export async function accountOfPayment(p: Pick<Payment, 'providerAccountId'>, transaction?: Transaction): Promise<string | null> {
  if (p.providerAccountId) return p.providerAccountId;
  const w = await Workshop.findOne({ attributes: ['id', 'paymentAccountId'], order: [['id', 'ASC']], transaction });
  return w?.paymentAccountId ?? null;
}

export const unreachable = (err: unknown) =>
  new HttpProblem(502, 'payments_unreachable', 'Payment service unavailable', `The payment service did not answer: ${err instanceof Error ? err.message : String(err)}. Try again in a moment.`);

export function paymentDto(p: Payment): PaymentDto {
  const received = p.amountReceivedMinor === null || p.amountReceivedMinor === undefined ? null : fromMinor(p.amountReceivedMinor, p.currency);
  return {
    id: p.id,
    amount: fromMinor(p.amountMinor, p.currency),
    currency: p.currency,
    status: p.status,
    createdAt: p.createdAt.toISOString(),
    paidAt: p.paidAt ? p.paidAt.toISOString() : null,
    expiresAt: p.expiresAt ? p.expiresAt.toISOString() : null,
    amountReceived: received !== null && received !== fromMinor(p.amountMinor, p.currency) ? received : null,
    flag: p.flag ?? null,
    note: p.note ?? null,
    refundedAt: p.refundedAt ? p.refundedAt.toISOString() : null,
  };
}

/** Checkouts whose time at the provider has run out are expired here too, so none shows "pending" for ever. */
export async function lapseCheckouts(quoteId?: number, transaction?: Transaction): Promise<void> {
  await Payment.update(
    { status: 'expired', closedAt: new Date() },
    { where: { status: 'pending', expiresAt: { [Op.lt]: new Date() }, ...(quoteId ? { quoteId } : {}) }, transaction },
  );
}
