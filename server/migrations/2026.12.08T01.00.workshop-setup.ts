/**
 * The first-run checklist's own record, one row per workshop: when the owner last saved the settings page with the
 * drying room on it (the checklist's "drying room reviewed"), and whether they put the checklist away. Everything
 * else the checklist shows is read from the data itself. Its own workshop column and `workshop_isolation` policy.
 */
import type { MigrationContext } from '../db/migrator';

const SETTING = "NULLIF(current_setting('shellwright.workshop_id', true), '')::integer";

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    await run(`
      CREATE TABLE workshop_setup (
        workshop_id integer PRIMARY KEY DEFAULT ${SETTING} REFERENCES workshops (id) ON DELETE CASCADE,
        drying_room_saved_at timestamptz,
        drying_room_saved_by integer REFERENCES users (id) ON DELETE SET NULL,
        checklist_dismissed_at timestamptz,
        checklist_dismissed_by integer REFERENCES users (id) ON DELETE SET NULL,
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await run('ALTER TABLE workshop_setup ENABLE ROW LEVEL SECURITY');
    await run('ALTER TABLE workshop_setup FORCE ROW LEVEL SECURITY');
    await run(`CREATE POLICY workshop_isolation ON workshop_setup USING (workshop_id = ${SETTING}) WITH CHECK (workshop_id = ${SETTING})`);
  });
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('DROP TABLE IF EXISTS workshop_setup');
}
