/**
 * A workshop can disconnect its card-payment account and connect another. Money taken on the former account stays
 * the workshop's: every checkout names the account it was opened on (filled in here for the checkouts recorded before
 * the column existed, from their workshop's account), and the owner's lookup of an account's workshop also answers
 * through those checkouts, so a late webhook from a former account still runs under its workshop and a payment taken
 * there is still refunded there.
 *
 * `down` restores the lookup that reads the workshop's current account only and drops the index; the account names
 * filled in on old checkouts stay (they are true, and the earlier code reads them the same way).
 */
import type { MigrationContext } from '../db/migrator';

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run(`
      UPDATE payments p SET provider_account_id = w.payment_account_id
        FROM workshops w
       WHERE p.workshop_id = w.id AND p.provider_account_id IS NULL AND w.payment_account_id IS NOT NULL`);
    await run('CREATE INDEX payments_provider_account ON payments (provider_account_id) WHERE provider_account_id IS NOT NULL');
    await run(`
      CREATE OR REPLACE FUNCTION shellwright_workshop_of_payment_account(p_account_id text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$
          SELECT id FROM (
            SELECT id, 0 AS rank FROM workshops WHERE payment_account_id = p_account_id
            UNION ALL
            (SELECT workshop_id, 1 FROM payments WHERE provider_account_id = p_account_id LIMIT 1)
          ) found ORDER BY rank LIMIT 1
        $$`);
  });
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run(`
      CREATE OR REPLACE FUNCTION shellwright_workshop_of_payment_account(p_account_id text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT id FROM workshops WHERE payment_account_id = p_account_id $$`);
    await run('DROP INDEX IF EXISTS payments_provider_account');
  });
}
