import type { Sequelize } from 'sequelize';
import { allWorkshopIds, installWorkshopSetting, runAsWorkshop } from '../db/workshop-context';
import { createWorkshop } from '../services/workshops';
import { DEFAULT_SETTINGS, ensureDefaults } from './defaults';
import { DEMO_WORKSHOP, loadDemo } from './demo';
import { loadDemoPlanning } from './demo-planning';
import { loadDemoWork } from './demo-work';
import type { Config } from '../config';
import type { PaymentProvider } from '../fakes/payment-provider';
import { connectDemoPayments } from './demo-payments';

/**
 * After migrations, through the app's role: the first workshop (the demo workshop where allowed), then the defaults
 * every workshop needs, each under its workshop's row-level security scope. Idempotent.
 */
export async function seed(sequelize: Sequelize, opts: { demo: boolean; uploadsDir: string; log?: (m: string) => void }): Promise<void> {
  installWorkshopSetting(sequelize);
  let [first] = await allWorkshopIds(sequelize);
  if (first === undefined) {
    first = await createWorkshop(sequelize, opts.demo ? DEMO_WORKSHOP : { name: 'Your workshop', email: null, phone: null, address: null, settings: DEFAULT_SETTINGS });
    if (opts.demo) opts.log?.('workshop created');
  }
  await runAsWorkshop(first, async () => {
    if (opts.demo) await loadDemo(sequelize, opts.log);
    await ensureDefaults(sequelize);
    // Customers, pieces and estimates need the price list above.
    if (opts.demo) await loadDemoWork(sequelize, opts.uploadsDir, opts.log);
    // Accepted quotes, booked and finished jobs, so the planning board is not empty on first start.
    if (opts.demo) await loadDemoPlanning(sequelize, opts.log);
  });
}

/** The workshops the demo loader fills (in demo mode): the first workshop. */
export async function demoWorkshopIds(sequelize: Sequelize): Promise<number[]> {
  const [first] = await allWorkshopIds(sequelize);
  return first === undefined ? [] : [first];
}

/**
 * Every demo workshop gets a ready card-payment account at the local payment stand-in (`connectDemoPayments`).
 * Called once the stand-in runs (`npm start`, `npm run serve`'s primary, the tests), never with a real provider.
 */
export async function connectDemoWorkshops(sequelize: Sequelize, config: Config, provider: PaymentProvider): Promise<void> {
  for (const id of await demoWorkshopIds(sequelize)) await connectDemoPayments(sequelize, config, provider, id);
}
