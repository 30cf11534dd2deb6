import type { Sequelize } from 'sequelize';
import { ensureDefaults } from './defaults';
import { loadDemo } from './demo';
import { loadDemoPlanning } from './demo-planning';
import { loadDemoWork } from './demo-work';

/** After migrations: the demo workshop where allowed, then the defaults every workshop needs. Both idempotent. */
export async function seed(sequelize: Sequelize, opts: { demo: boolean; uploadsDir: string; log?: (m: string) => void }): Promise<void> {
  if (opts.demo) await loadDemo(sequelize, opts.log);
  await ensureDefaults(sequelize);
  // Customers, pieces and estimates need the price list above.
  if (opts.demo) await loadDemoWork(sequelize, opts.uploadsDir, opts.log);
  // Accepted quotes, booked and finished jobs, so the planning board is not empty on first start.
  if (opts.demo) await loadDemoPlanning(sequelize, opts.log);
}
