/**
 * A variation's signed link (`/v/:token`) names no workshop, as a quote's link does not: the owner's lookup answers the
 * workshop of a variation by its token's hash (one id, never a row), so the public variation routes run under it.
 */
import type { MigrationContext } from '../db/migrator';

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query(`
    CREATE FUNCTION shellwright_workshop_of_variation_token(p_token_hash text) RETURNS integer
      LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
      AS $$ SELECT workshop_id FROM job_variations WHERE token_hash = p_token_hash $$`);
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('DROP FUNCTION IF EXISTS shellwright_workshop_of_variation_token(text)');
}
