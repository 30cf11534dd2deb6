import type { Sequelize } from 'sequelize';
import { ensureDefaults } from './defaults';
import { loadDemo } from './demo';

/** After migrations: the demo workshop where allowed, then the defaults every workshop needs. Both idempotent. */
export async function seed(sequelize: Sequelize, opts: { demo: boolean; log?: (m: string) => void }): Promise<void> {
  if (opts.demo) await loadDemo(sequelize, opts.log);
  await ensureDefaults(sequelize);
}
