/**
 * Each workshop takes card payments on its own account with the payment provider (a connected account): the
 * account's id and how far its set-up has gone (`none`: not connected; `onboarding`: created, the owner has not
 * finished the provider's form; `ready`: the provider takes charges on it). Every checkout remembers the account it
 * was opened on, so closing or refunding it goes to the same account. The owner's lookup answers the workshop of an
 * account id (one id, never a row), so a webhook for a connected account runs under that workshop.
 */
import type { MigrationContext } from '../db/migrator';

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run(`ALTER TABLE workshops ADD COLUMN payment_account_id varchar(120) NULL`);
    await run(`ALTER TABLE workshops ADD COLUMN payment_account_state varchar(12) NOT NULL DEFAULT 'none'`);
    await run(`ALTER TABLE workshops ADD CONSTRAINT workshops_payment_account_state CHECK (payment_account_state IN ('none', 'onboarding', 'ready'))`);
    await run(`ALTER TABLE workshops ADD CONSTRAINT workshops_payment_account_known CHECK ((payment_account_id IS NULL) = (payment_account_state = 'none'))`);
    // An account belongs to one workshop across the service (ids are the provider's, unique everywhere).
    await run(`ALTER TABLE workshops ADD CONSTRAINT workshops_payment_account_id UNIQUE (payment_account_id)`);
    await run(`ALTER TABLE payments ADD COLUMN provider_account_id varchar(120) NULL`);
    await run(`
      CREATE FUNCTION shellwright_workshop_of_payment_account(p_account_id text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT id FROM workshops WHERE payment_account_id = p_account_id $$`);
  });
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run('DROP FUNCTION IF EXISTS shellwright_workshop_of_payment_account(text)');
    await run('ALTER TABLE payments DROP COLUMN IF EXISTS provider_account_id');
    await run('ALTER TABLE workshops DROP CONSTRAINT IF EXISTS workshops_payment_account_id');
    await run('ALTER TABLE workshops DROP CONSTRAINT IF EXISTS workshops_payment_account_known');
    await run('ALTER TABLE workshops DROP CONSTRAINT IF EXISTS workshops_payment_account_state');
    await run('ALTER TABLE workshops DROP COLUMN IF EXISTS payment_account_state');
    await run('ALTER TABLE workshops DROP COLUMN IF EXISTS payment_account_id');
  });
}
