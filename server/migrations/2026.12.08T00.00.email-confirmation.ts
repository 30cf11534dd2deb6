/**
 * A workshop's owner who signs up confirms their e-mail address before they can sign in.
 *
 * - `users.email_confirmed_at`: when the address was confirmed. Every user there was (the demo's, those an owner
 *   added) counts as confirmed from their creation, and so does every user added later by an owner (the column's
 *   DEFAULT is now()); only the sign-up writes NULL, until its link is opened.
 * - `email_confirmations`: the links sent, by the SHA-256 of their token (never the token), with an expiry and the
 *   moment they were used. Its own workshop column and `workshop_isolation` policy (as migration 2026.12.07T00.00).
 * - `shellwright_workshop_of_email_confirmation(hash)`: the public confirm path learns its workshop from the
 *   token's hash (one id, never a row), as the variation links do (2026.12.07T01.00).
 */
import type { MigrationContext } from '../db/migrator';

const SETTING = "NULLIF(current_setting('shellwright.workshop_id', true), '')::integer";

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run('ALTER TABLE users ADD COLUMN email_confirmed_at timestamptz DEFAULT now()');
    await run('UPDATE users SET email_confirmed_at = created_at');
    await run(`
      CREATE TABLE email_confirmations (
        id serial PRIMARY KEY,
        workshop_id integer NOT NULL DEFAULT ${SETTING} REFERENCES workshops (id) ON DELETE CASCADE,
        user_id integer NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        token_hash varchar(64) NOT NULL UNIQUE,
        created_at timestamptz NOT NULL DEFAULT now(),
        expires_at timestamptz NOT NULL,
        used_at timestamptz
      )`);
    await run('CREATE INDEX email_confirmations_workshop_idx ON email_confirmations (workshop_id)');
    await run('CREATE INDEX email_confirmations_user_idx ON email_confirmations (user_id)');
    await run('ALTER TABLE email_confirmations ENABLE ROW LEVEL SECURITY');
    await run('ALTER TABLE email_confirmations FORCE ROW LEVEL SECURITY');
    await run(`CREATE POLICY workshop_isolation ON email_confirmations USING (workshop_id = ${SETTING}) WITH CHECK (workshop_id = ${SETTING})`);
    await run(`
      CREATE FUNCTION shellwright_workshop_of_email_confirmation(p_token_hash text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT workshop_id FROM email_confirmations WHERE token_hash = p_token_hash $$`);
  });
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run('DROP FUNCTION IF EXISTS shellwright_workshop_of_email_confirmation(text)');
    await run('DROP TABLE IF EXISTS email_confirmations');
    await run('ALTER TABLE users DROP COLUMN IF EXISTS email_confirmed_at');
  });
}
