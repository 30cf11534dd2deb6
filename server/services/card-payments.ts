/**
 * The workshop's own account with the payment provider (a connected account): the owner connects it from the
 * settings page, finishes the provider's set-up form, and comes back; deposits and balances are then taken on it.
 */
import type Stripe from 'stripe';
import type { Sequelize } from 'sequelize';
import { CARD_PAYMENTS_RETURN, type CardPayments } from '@shared/schemas/card-payments';
import type { Config } from '../config';
import { problems } from '../http/problem';
import { Payment, Quote, Workshop } from '../models';
import { audit } from './audit';
import { client, onAccount, unreachable } from './payment-provider';

function dtoOf(config: Config, w: Workshop): CardPayments {
  return { state: w.paymentAccountState, accountId: w.paymentAccountId, configured: Boolean(config.payments.secretKey) };
}

async function current(): Promise<Workshop> {
  const w = await Workshop.findOne({ order: [['id', 'ASC']] });
  if (!w) throw problems.notFound('The workshop');
  return w;
}

export async function getCardPayments(config: Config): Promise<CardPayments> {
  return dtoOf(config, await current());
}

/** The state the provider's account record means. */
export function stateOfAccount(account: Pick<Stripe.Account, 'charges_enabled'>): 'onboarding' | 'ready' {
  return account.charges_enabled ? 'ready' : 'onboarding';
}

/**
 * Creates the workshop's account at the provider when it has none (under the workshop row's lock, so two clicks make
 * one account), and answers the address of the provider's set-up form for it. 409 once the account is ready.
 */
export async function connectCardPayments(sequelize: Sequelize, config: Config, actorId: number): Promise<{ url: string }> {
  if (!config.payments.secretKey) {
    throw problems.conflict('payments_unconfigured', 'No payment provider is configured on this installation: its keys must be set before a workshop can connect.');
  }
  const stripe = client(config);
  const accountId = await sequelize.transaction(async (transaction) => {
    const w = await Workshop.findOne({ order: [['id', 'ASC']], transaction, lock: transaction.LOCK.UPDATE });
    if (!w) throw problems.notFound('The workshop');
    if (w.paymentAccountState === 'ready') throw problems.conflict('payments_connected', 'Card payments are already set up for this workshop.');
    if (w.paymentAccountId) return w.paymentAccountId;
    let account: Stripe.Account;
    try {
      account = await stripe.accounts.create({
        type: 'standard',
        ...(w.email ? { email: w.email } : {}),
        business_profile: { name: w.name },
        metadata: { workshop_id: String(w.id) },
      });
    } catch (err) {
      throw unreachable(err);
    }
    await w.update({ paymentAccountId: account.id, paymentAccountState: stateOfAccount(account) }, { transaction });
    await audit({ userId: actorId, action: 'workshop.card_payments', entityType: 'workshop', entityId: w.id, after: { account: account.id, state: stateOfAccount(account) } }, transaction);
    return account.id;
  });
  try {
    const link = await stripe.accountLinks.create({
      account: accountId,
      type: 'account_onboarding',
      return_url: `${config.publicUrl}/settings?${CARD_PAYMENTS_RETURN}=back`,
      refresh_url: `${config.publicUrl}/settings?${CARD_PAYMENTS_RETURN}=again`,
    });
    return { url: link.url };
  } catch (err) {
    throw unreachable(err);
  }
}

/** Asks the provider how far the account has got (the owner is back from its form) and keeps the answer. */
export async function refreshCardPayments(sequelize: Sequelize, config: Config, actorId: number): Promise<CardPayments> {
  const w = await current();
  // Nothing to ask when there is no account, or no provider to ask (the state kept stands).
  if (!w.paymentAccountId || !config.payments.secretKey) return dtoOf(config, w);
  let account: Stripe.Account;
  try {
    account = await client(config).accounts.retrieve(w.paymentAccountId);
  } catch (err) {
    throw unreachable(err);
  }
  const state = stateOfAccount(account);
  return sequelize.transaction(async (transaction) => {
    const locked = (await Workshop.findByPk(w.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (locked.paymentAccountId === account.id && locked.paymentAccountState !== state) {
      await locked.update({ paymentAccountState: state }, { transaction });
      await audit({ userId: actorId, action: 'workshop.card_payments', entityType: 'workshop', entityId: locked.id, after: { account: account.id, state } }, transaction);
    }
    return dtoOf(config, locked);
  });
}

/**
 * Disconnects the workshop's account, so that another can be connected (or none). Under the workshop row's lock,
 * which every new checkout waits for (`workshopPaymentAccount` reads the row FOR SHARE): each checkout still open on
 * the account is closed at the provider and here, and then the workshop has no account. A checkout the provider says
 * was paid meanwhile stops it (409): its webhook is on its way and is counted first. Payments taken on the account
 * keep its name, so a late webhook still counts and a refund still goes to it (the account lookup reads them). The
 * owner names the account being disconnected; another one connected since is left alone (409).
 */
export async function disconnectCardPayments(sequelize: Sequelize, config: Config, actorId: number, accountId: string): Promise<CardPayments> {
  return sequelize.transaction(async (transaction) => {
    const w = await Workshop.findOne({ order: [['id', 'ASC']], transaction, lock: transaction.LOCK.UPDATE });
    if (!w) throw problems.notFound('The workshop');
    const former = w.paymentAccountId;
    if (!former) throw problems.conflict('payments_not_connected', 'Card payments are not connected: there is nothing to disconnect.');
    if (former !== accountId) throw problems.conflict('payments_account_changed', 'The card payment account has changed since this page was opened: reload the page to see the one connected now.');
    const open = await Payment.findAll({ where: { status: 'pending', providerAccountId: former }, order: [['id', 'ASC']], transaction, lock: transaction.LOCK.UPDATE });
    if (open.length > 0) {
      const stripe = client(config);
      for (const p of open) {
        let status: string | null;
        try {
          const session = await stripe.checkout.sessions.retrieve(p.providerSessionId, {}, onAccount(former));
          status = session.status;
          if (status === 'open') status = (await stripe.checkout.sessions.expire(p.providerSessionId, {}, onAccount(former))).status;
        } catch (err) {
          throw unreachable(err);
        }
        if (status === 'complete') {
          const quote = await Quote.findByPk(p.quoteId, { attributes: ['id', 'number'], transaction });
          throw problems.conflict(
            'payment_in_progress',
            `A customer has just paid by card${quote ? ` on quote ${quote.number}` : ''} and the payment is still being recorded. Try again in a few minutes.`,
          );
        }
        await p.update({ status: 'cancelled', closedAt: new Date() }, { transaction });
      }
    }
    await w.update({ paymentAccountId: null, paymentAccountState: 'none' }, { transaction });
    await audit(
      { userId: actorId, action: 'workshop.card_payments', entityType: 'workshop', entityId: w.id, before: { account: former }, after: { account: null, state: 'none', closedCheckouts: open.length } },
      transaction,
    );
    return dtoOf(config, w);
  });
}
