/**
 * `npm run user:add -- <email> "<name>" <role>`: adds a user from a shell, e.g. the first owner of a new workshop.
 * The password is read from NEW_USER_PASSWORD, or from the first line of standard input.
 */
import readline from 'node:readline';
import { CreateUserSchema } from '@shared/schemas/auth';
import { loadConfig } from '../config';
import { resolveDatabaseUrl } from '../db/connect';
import { createSequelize } from '../db/sequelize';
import { allWorkshopIds, installWorkshopSetting, runAsWorkshop } from '../db/workshop-context';
import { initModels } from '../models';
import { createUser } from '../services/users';

async function readPassword(): Promise<string> {
  if (process.env.NEW_USER_PASSWORD) return process.env.NEW_USER_PASSWORD;
  process.stdout.write('Password for the new user (at least 10 characters): ');
  const rl = readline.createInterface({ input: process.stdin });
  const line = await new Promise<string>((resolve) => rl.once('line', resolve));
  rl.close();
  return line.trim();
}

async function main(): Promise<void> {
  const [command, email, name, role] = process.argv.slice(2);
  if (command !== 'add' || !email || !name || !role) throw new Error('usage: npm run user:add -- <email> "<name>" <owner|estimator|sales|workshop>');
  const parsed = CreateUserSchema.safeParse({ email, name, role, password: await readPassword() });
  if (!parsed.success) throw new Error(parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; '));
  const sequelize = createSequelize(await resolveDatabaseUrl(loadConfig()));
  installWorkshopSetting(sequelize);
  initModels(sequelize);
  try {
    // The user joins SHELLWRIGHT_WORKSHOP_ID when given, else the first workshop (a one-workshop installation).
    const workshopId = Number(process.env.SHELLWRIGHT_WORKSHOP_ID) || (await allWorkshopIds(sequelize))[0];
    if (!workshopId) throw new Error('there is no workshop yet: start the app once first');
    const user = await runAsWorkshop(workshopId, () => createUser(sequelize, null, parsed.data));
    console.log(`added ${user.email} (${user.role})`);
  } finally {
    await sequelize.close();
  }
}

main().catch((err: unknown) => {
  console.error(`[users] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
