import type { Sequelize } from 'sequelize';
import { DisconnectCardPaymentsSchema } from '@shared/schemas/card-payments';
import type { Config } from '../config';
import { parseOr400 } from '../http/problem';
import { secureRouter, type RouteInfo } from '../http/guard';
import { connectCardPayments, disconnectCardPayments, getCardPayments, refreshCardPayments } from '../services/card-payments';

/** The workshop's own account with the payment provider, on the owner's settings page. */
export function cardPaymentRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/settings/card-payments', table);
  r.get('', 'editSettings', async (_req, res) => {
    res.json(await getCardPayments(config));
  });
  /** Creates the account when there is none and answers the address of the provider's set-up form. */
  r.post('/connect', 'editSettings', async (req, res) => {
    res.json(await connectCardPayments(sequelize, config, req.user!.id));
  });
  /** Back from the provider's form: asks the provider how far the account has got. */
  r.post('/refresh', 'editSettings', async (req, res) => {
    res.json(await refreshCardPayments(sequelize, config, req.user!.id));
  });
  /** Closes the checkouts still open on the account and leaves the workshop without one, to connect another. */
  r.post('/disconnect', 'editSettings', async (req, res) => {
    res.json(await disconnectCardPayments(sequelize, config, req.user!.id, parseOr400(DisconnectCardPaymentsSchema, req.body).accountId));
  });
  return r.router;
}
