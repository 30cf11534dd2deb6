import type { Sequelize } from 'sequelize';
import { allWorkshopIds, installWorkshopSetting, runAsWorkshop } from '../db/workshop-context';
import { createWorkshop } from '../services/workshops';
import { DEFAULT_SETTINGS, ensureDefaults } from './defaults';
import { DEMO_WORKSHOP, loadDemo } from './demo';
import { loadDemoPlanning } from './demo-planning';
import { loadDemoWork } from './demo-work';

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
