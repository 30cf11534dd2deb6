/**
 * The demo workshops take card payments on accounts of their own at the local payment stand-in, ready, so the demo's
 * deposits and balances can be paid after `npm start` without the owner going through the set-up form first. Only
 * ever against the local stand-in (it finishes the set-up as the owner would on its page); production, which sets
 * the payment keys and runs no stand-in, connects no account here.
 */
import type { Sequelize } from 'sequelize';
import type { Config } from '../config';
import { runAsWorkshop } from '../db/workshop-context';
import type { PaymentProvider } from '../fakes/payment-provider';
import { Workshop } from '../models';
import { client } from '../services/payment-provider';

/**
 * Makes sure one demo workshop has a ready account at the stand-in: the one it holds when the stand-in knows it
 * (the stand-in's state file kept it), taken back by the stand-in when it does not (a stand-in started afresh, as in
 * each test file), or a new one created through the SDK and set up. Idempotent; answers the account id.
 */
export async function connectDemoPayments(sequelize: Sequelize, config: Config, provider: PaymentProvider, workshopId: number): Promise<string> {
  return runAsWorkshop(workshopId, async () => {
    const w = await Workshop.findByPk(workshopId);
    if (!w) throw new Error(`no workshop ${workshopId}`);
    const stripe = client(config);
    let accountId = w.paymentAccountId;
    if (accountId && !provider.accounts.has(accountId)) provider.rememberAccount(accountId, { email: w.email, name: w.name });
    if (!accountId) {
      const account = await stripe.accounts.create({ type: 'standard', ...(w.email ? { email: w.email } : {}), business_profile: { name: w.name }, metadata: { workshop_id: String(w.id) } });
      accountId = account.id;
    }
    let account = await stripe.accounts.retrieve(accountId);
    if (!account.charges_enabled) {
      await provider.completeOnboarding(accountId, { notify: false });
      account = await stripe.accounts.retrieve(accountId);
    }
    const state = account.charges_enabled ? 'ready' : 'onboarding';
    if (w.paymentAccountId !== accountId || w.paymentAccountState !== state) {
      await sequelize.transaction((transaction) => w.update({ paymentAccountId: accountId, paymentAccountState: state }, { transaction }));
    }
    return accountId;
  });
}
