import type { Sequelize } from 'sequelize';
import { allWorkshopIds, installWorkshopSetting, lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
import { createWorkshop } from '../services/workshops';
import { ensureDefaults } from './defaults';
import { DEMO_WORKSHOP, DEMO_WORKSHOP_2, loadDemo, type DemoWorkshop } from './demo';
import { DEMO_PLANNING, DEMO_PLANNING_2, loadDemoPlanning, type DemoPlanning } from './demo-planning';
import { DEMO_WORK, DEMO_WORK_2, loadDemoWork, type DemoJob } from './demo-work';

/** Each demo workshop with what it holds, in the order they are made (the first keeps the lowest id). */
export const DEMOS: readonly { workshop: DemoWorkshop; work: readonly DemoJob[]; planning: DemoPlanning }[] = [
  { workshop: DEMO_WORKSHOP, work: DEMO_WORK, planning: DEMO_PLANNING },
  { workshop: DEMO_WORKSHOP_2, work: DEMO_WORK_2, planning: DEMO_PLANNING_2 },
];

/** A demo workshop's id: the workshop its owner's e-mail signs in to, made when there is none yet. */
async function demoWorkshopId(sequelize: Sequelize, demo: DemoWorkshop, log?: (m: string) => void): Promise<number> {
  const known = await lookupWorkshop(sequelize, 'email', demo.users[0]!.email);
  if (known !== null) return known;
  const id = await createWorkshop(sequelize, { name: demo.name, email: demo.email, phone: demo.phone, address: demo.address, settings: demo.settings });
  log?.(`workshop ${demo.name} created`);
  return id;
}
import type { Config } from '../config';
import type { PaymentProvider } from '../fakes/payment-provider';
import { connectDemoPayments } from './demo-payments';

/**
 * After migrations, through the app's role: the defaults every workshop needs, for each workshop there is (each under
 * its own row-level security scope), and where allowed the demo workshops with their people and work. Without the
 * demo no workshop is made: workshops come from sign-up (or `npm run user:add -- … --new-workshop`). Idempotent.
 */
export async function seed(
  sequelize: Sequelize,
  opts: { demo: boolean; uploadsDir: string; log?: (m: string) => void; /** How many of DEMOS to load (all by default). */ demoWorkshops?: number },
): Promise<void> {
  installWorkshopSetting(sequelize);
  const demoIds = new Set<number>();
  if (opts.demo) {
    for (const demo of DEMOS.slice(0, opts.demoWorkshops ?? DEMOS.length)) {
      const id = await demoWorkshopId(sequelize, demo.workshop, opts.log);
      demoIds.add(id);
      const log = (m: string) => opts.log?.(DEMOS.length > 1 ? `${demo.workshop.name}: ${m}` : m);
      await runAsWorkshop(id, async () => {
        await loadDemo(sequelize, demo.workshop, log);
        await ensureDefaults(sequelize);
        // Customers, pieces and estimates need the price list above.
        await loadDemoWork(sequelize, opts.uploadsDir, { users: demo.workshop.users, jobs: demo.work }, log);
        // Accepted quotes, booked and finished jobs, so the planning board is not empty on first start.
        await loadDemoPlanning(sequelize, { users: demo.workshop.users, planning: demo.planning }, log);
      });
    }
  }
  for (const id of await allWorkshopIds(sequelize)) {
    if (!demoIds.has(id)) await runAsWorkshop(id, () => ensureDefaults(sequelize));
  }
}

/** The demo workshops there are (in demo mode): each one its demo owner's e-mail signs in to. */
export async function demoWorkshopIds(sequelize: Sequelize): Promise<number[]> {
  const ids: number[] = [];
  for (const demo of DEMOS) {
    const id = await lookupWorkshop(sequelize, 'email', demo.workshop.users[0]!.email);
    if (id !== null) ids.push(id);
  }
  return ids;
}

/**
 * Every demo workshop gets a ready card-payment account at the local payment stand-in (`connectDemoPayments`).
 * Called once the stand-in runs (`npm start`, `npm run serve`'s primary, the tests), never with a real provider.
 */
export async function connectDemoWorkshops(sequelize: Sequelize, config: Config, provider: PaymentProvider): Promise<void> {
  for (const id of await demoWorkshopIds(sequelize)) await connectDemoPayments(sequelize, config, provider, id);
}
