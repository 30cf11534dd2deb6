/**
 * The invented demo workshop: its settings and one user per role. Idempotent: a second run adds nothing twice.
 * Demo users exist only through this loader, which production runs only with SHELLWRIGHT_DEMO=1.
 */
import type { Sequelize } from 'sequelize';
import type { Role } from '@shared/schemas/auth';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { User, Workshop } from '../models';
import { hashPassword } from '../services/users';

export const DEMO_PASSWORD = 'shellwright-demo';

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: 'owner@example.com', name: 'Ottilie Marchbank', role: 'owner' },
  { email: 'estimator@example.com', name: 'Ewan Pellow', role: 'estimator' },
  { email: 'sales@example.com', name: 'Saskia Threlfall', role: 'sales' },
  { email: 'workshop@example.com', name: 'Wilf Oakeshott', role: 'workshop' },
];

export const DEMO_SETTINGS: WorkshopSettings = {
  currency: 'GBP',
  taxRatePct: 20,
  units: 'metric',
  workingWeek: [
    { day: 'mon', open: '08:00', close: '16:30' },
    { day: 'tue', open: '08:00', close: '16:30' },
    { day: 'wed', open: '08:00', close: '16:30' },
    { day: 'thu', open: '08:00', close: '16:30' },
    { day: 'fri', open: '08:00', close: '15:00' },
  ],
  closedDates: ['2026-12-24', '2026-12-25', '2026-12-28', '2026-12-29', '2026-12-30', '2026-12-31', '2027-01-01'],
};

export async function loadDemo(sequelize: Sequelize, log: (m: string) => void = () => {}): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    const workshop = await Workshop.findOne({ transaction });
    if (!workshop) {
      await Workshop.create(
        {
          name: 'Larkspur Lane Polishing Workshop',
          email: 'hello@larkspur-polishing.example',
          phone: '01632 960 418',
          address: 'Unit 4, Tannery Yard\nLarkspur Lane\nMiddlecombe MC4 7QT',
          settings: DEMO_SETTINGS,
        },
        { transaction },
      );
      log('demo: workshop created');
    }
    for (const demo of DEMO_USERS) {
      const [, created] = await User.findOrCreate({
        where: { email: demo.email },
        defaults: { ...demo, passwordHash, lastLoginAt: null },
        transaction,
      });
      if (created) log(`demo: user ${demo.email} (${demo.role}) created`);
    }
  });
}
