/** A second workshop for isolation tests: its own row, defaults, and one user per role (their e-mails unique per call). */
import { randomBytes } from 'node:crypto';
import type { Sequelize } from 'sequelize';
import { ROLES, type Role } from '../../shared/schemas/auth';
import { runAsWorkshop } from '../../server/db/workshop-context';
import { User } from '../../server/models';
import { DEFAULT_SETTINGS, ensureDefaults } from '../../server/seeders/defaults';
import { hashPassword } from '../../server/services/users';
import { createWorkshop } from '../../server/services/workshops';

export const OTHER_PASSWORD = 'another-workshop-pass';

export interface OtherWorkshop {
  id: number;
  emails: Record<Role, string>;
}

export async function createOtherWorkshop(sequelize: Sequelize, name = 'Quillon Row Restorers'): Promise<OtherWorkshop> {
  const tag = randomBytes(4).toString('hex');
  const id = await createWorkshop(sequelize, { name, email: `hello-${tag}@quillon-row.example`, phone: null, address: null, settings: DEFAULT_SETTINGS });
  const passwordHash = await hashPassword(OTHER_PASSWORD);
  const emails = {} as Record<Role, string>;
  await runAsWorkshop(id, async () => {
    await ensureDefaults(sequelize);
    for (const role of ROLES) {
      emails[role] = `${role}-${tag}@quillon-row.example`;
      await User.create({ email: emails[role], name: `${role[0]!.toUpperCase()}${role.slice(1)} of ${name}`, role, passwordHash, lastLoginAt: null });
    }
  });
  return { id, emails };
}
