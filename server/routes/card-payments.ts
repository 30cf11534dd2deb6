import type { Sequelize } from 'sequelize';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { connectCardPayments, getCardPayments, refreshCardPayments } from '../services/card-payments';

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
  return r.router;
}
