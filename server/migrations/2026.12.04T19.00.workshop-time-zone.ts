import type { MigrationContext } from '../db/migrator';

/**
 * `settings.timeZone`: the workshop's own time zone (an IANA name), which says what "today" means for quotes,
 * prices and the planning board. Workshops that have none yet get Europe/London, the demo workshop's zone; an owner
 * changes it on the settings page.
 */
export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query(`UPDATE workshops SET settings = settings || '{"timeZone": "Europe/London"}'::jsonb WHERE NOT settings ? 'timeZone'`);
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query(`UPDATE workshops SET settings = settings - 'timeZone'`);
}
