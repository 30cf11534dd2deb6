/**
 * Invitations: the owner invites someone by e-mail to join the workshop in a role. The e-mail carries a link with a
 * random token; only the token's SHA-256 is kept here, with the link's expiry, who invited, how often and when it was
 * last sent (and its outbox message), and when it was accepted (by which new user) or revoked. Resending gives a new
 * token (the old link stops working) and a new expiry.
 *
 * The table belongs to a workshop like every other (the pattern of `2026.12.07T00.00.workshop-row-security`):
 * `workshop_id` defaults to the connection's workshop, and a forced `workshop_isolation` policy shows and takes only
 * that workshop's rows. The link itself names no workshop: `shellwright_workshop_of_invitation(hash)` (owner-defined,
 * SECURITY DEFINER, like `2026.12.07T01.00.variation-link-workshop`) answers the workshop of a token's hash, one id and
 * never a row, so the public invitation routes run under it.
 */
import type { MigrationContext } from '../db/migrator';

const SETTING = "NULLIF(current_setting('shellwright.workshop_id', true), '')::integer";
const APP_ROLE = 'shellwright_app';

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run(`
      CREATE TABLE invitations (
        id serial PRIMARY KEY,
        workshop_id integer NOT NULL DEFAULT ${SETTING} REFERENCES workshops (id) ON DELETE CASCADE,
        email varchar(254) NOT NULL,
        role varchar(20) NOT NULL,
        token_hash varchar(64) NOT NULL UNIQUE,
        expires_at timestamptz NOT NULL,
        invited_by integer REFERENCES users (id) ON DELETE SET NULL,
        accepted_at timestamptz,
        accepted_user_id integer REFERENCES users (id) ON DELETE SET NULL,
        revoked_at timestamptz,
        revoked_by integer REFERENCES users (id) ON DELETE SET NULL,
        send_count integer NOT NULL DEFAULT 0,
        last_sent_at timestamptz,
        last_outbox_id integer REFERENCES outbox (id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT invitations_email_lower CHECK (email = lower(email)),
        CONSTRAINT invitations_one_end CHECK (accepted_at IS NULL OR revoked_at IS NULL)
      )`);
    await run('CREATE INDEX invitations_workshop_idx ON invitations (workshop_id)');
    await run('CREATE INDEX invitations_workshop_email ON invitations (workshop_id, email)');
    await run('CREATE INDEX invitations_workshop_created ON invitations (workshop_id, created_at)');
    await run('ALTER TABLE invitations ENABLE ROW LEVEL SECURITY');
    await run('ALTER TABLE invitations FORCE ROW LEVEL SECURITY');
    await run(`CREATE POLICY workshop_isolation ON invitations USING (workshop_id = ${SETTING}) WITH CHECK (workshop_id = ${SETTING})`);
    await run(`
      CREATE FUNCTION shellwright_workshop_of_invitation(p_token_hash text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT workshop_id FROM invitations WHERE token_hash = p_token_hash $$`);
    // The app's role is made at start by server/db/app-role.ts (its default privileges cover new tables); where it
    // already exists, it gets its rights here at once.
    await run(`
      DO $$ BEGIN
        IF EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '${APP_ROLE}') THEN
          GRANT SELECT, INSERT, UPDATE, DELETE ON invitations TO ${APP_ROLE};
          GRANT USAGE, SELECT, UPDATE ON SEQUENCE invitations_id_seq TO ${APP_ROLE};
          GRANT EXECUTE ON FUNCTION shellwright_workshop_of_invitation(text) TO ${APP_ROLE};
        END IF;
      END $$`);
  });
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query('DROP FUNCTION IF EXISTS shellwright_workshop_of_invitation(text)', { transaction });
    await sequelize.query('DROP TABLE IF EXISTS invitations', { transaction });
  });
}
