/**
 * `npm run user:add -- <email> "<name>" <role> [--workshop <id> | --new-workshop "<workshop name>"]`: adds a user
 * from a shell, e.g. the first owner of a new workshop.
 *
 * - `--workshop <id>` (or SHELLWRIGHT_WORKSHOP_ID): the user joins that workshop.
 * - `--new-workshop "<name>"`: a new workshop of that name is made (with the defaults every workshop starts with) and
 *   the user, who must then be its owner, joins it.
 * - Neither: the user joins the only workshop there is; with none or several, the command says which option to give.
 *
 * The password is read from NEW_USER_PASSWORD, or from the first line of standard input. Everything runs through the
 * app's role, under the workshop's row-level security, as the app itself does.
 */
import readline from 'node:readline';
import { parseArgs } from 'node:util';
import type { Sequelize } from 'sequelize';
import { CreateUserSchema } from '@shared/schemas/auth';
import { loadConfig } from '../config';
import { ensureAppRole } from '../db/app-role';
import { resolveDatabaseUrl } from '../db/connect';
import { createAppSequelize } from '../db/sequelize';
import { allWorkshopIds, lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
import { initModels } from '../models';
import { DEFAULT_SETTINGS, ensureDefaults } from '../seeders/defaults';
import { createUser } from '../services/users';
import { createWorkshop } from '../services/workshops';

const USAGE = 'usage: npm run user:add -- <email> "<name>" <owner|estimator|sales|workshop> [--workshop <id> | --new-workshop "<workshop name>"]';

async function readPassword(): Promise<string> {
  if (process.env.NEW_USER_PASSWORD) return process.env.NEW_USER_PASSWORD;
  process.stdout.write('Password for the new user (at least 10 characters): ');
  const rl = readline.createInterface({ input: process.stdin });
  const line = await new Promise<string>((resolve) => rl.once('line', resolve));
  rl.close();
  return line.trim();
}

/** The command line: the user's fields and where they go. */
function parseUserArgs(argv: string[]): { email: string; name: string; role: string; workshop?: number; newWorkshop?: string } {
  const { values, positionals } = parseArgs({ args: argv, allowPositionals: true, options: { workshop: { type: 'string' }, 'new-workshop': { type: 'string' } } });
  const [command, email, name, role, ...rest] = positionals;
  if (command !== 'add' || !email || !name || !role || rest.length > 0) throw new Error(USAGE);
  const rawWorkshop = values.workshop ?? process.env.SHELLWRIGHT_WORKSHOP_ID;
  const newWorkshop = values['new-workshop']?.trim();
  if (rawWorkshop !== undefined && newWorkshop !== undefined) throw new Error('give either --workshop or --new-workshop, not both');
  if (newWorkshop !== undefined && (newWorkshop.length === 0 || newWorkshop.length > 200)) throw new Error('--new-workshop needs a name of 1 to 200 characters');
  if (newWorkshop !== undefined && role !== 'owner') throw new Error('the first user of a new workshop is its owner: give the role owner');
  let workshop: number | undefined;
  if (rawWorkshop !== undefined) {
    workshop = Number(rawWorkshop);
    if (!/^\d+$/.test(rawWorkshop.trim()) || !Number.isSafeInteger(workshop) || workshop < 1) throw new Error(`--workshop must be a workshop's number, not "${rawWorkshop}"`);
  }
  return { email, name, role, workshop, newWorkshop };
}

/** The workshop the new user joins (made first with `newWorkshop`). */
async function workshopForNewUser(sequelize: Sequelize, where: { workshop?: number; newWorkshop?: string }): Promise<number> {
  if (where.newWorkshop !== undefined) {
    const id = await createWorkshop(sequelize, { name: where.newWorkshop, email: null, phone: null, address: null, settings: DEFAULT_SETTINGS });
    await runAsWorkshop(id, () => ensureDefaults(sequelize));
    return id;
  }
  const ids = await allWorkshopIds(sequelize);
  if (where.workshop !== undefined) {
    if (!ids.includes(where.workshop)) throw new Error(`there is no workshop ${where.workshop}${ids.length ? ` (workshops: ${ids.join(', ')})` : ''}`);
    return where.workshop;
  }
  if (ids.length === 1) return ids[0]!;
  if (ids.length === 0) throw new Error('there is no workshop yet: make one with --new-workshop "<workshop name>" (the user becomes its owner)');
  throw new Error(`there are ${ids.length} workshops (${ids.join(', ')}): name the one the user joins with --workshop <id>`);
}

async function main(): Promise<void> {
  const args = parseUserArgs(process.argv.slice(2));
  const parsed = CreateUserSchema.safeParse({ email: args.email, name: args.name, role: args.role, password: await readPassword() });
  if (!parsed.success) throw new Error(parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; '));
  const sequelize = createAppSequelize(await ensureAppRole(await resolveDatabaseUrl(loadConfig())));
  initModels(sequelize);
  try {
    // Sign-in addresses are unique across the service: check before a new workshop is made for nobody.
    if ((await lookupWorkshop(sequelize, 'email', parsed.data.email)) !== null) throw new Error(`${parsed.data.email} already has an account`);
    const workshopId = await workshopForNewUser(sequelize, args);
    const user = await runAsWorkshop(workshopId, () => createUser(sequelize, null, parsed.data));
    console.log(`added ${user.email} (${user.role}) to workshop ${workshopId}${args.newWorkshop ? ` (new: ${args.newWorkshop})` : ''}`);
  } finally {
    await sequelize.close();
  }
}

main().catch((err: unknown) => {
  console.error(`[users] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
