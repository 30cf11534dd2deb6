import type { MigrationContext } from '../db/migrator';

/**
 * Tells every server instance when what it caches changed: a NOTIFY on `shellwright_cache` when a change to a user
 * (`user:<id>`) or to anything the catalog is built from (`catalog`) commits, whoever made it. Notifications go out
 * at commit and not at all on rollback.
 */
const CATALOG_TABLES = ['workshops', 'species', 'finishing_systems', 'materials', 'material_packs', 'pack_prices', 'labour_rates'];

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query(`
    CREATE FUNCTION shellwright_notify_user() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM pg_notify('shellwright_cache', 'user:' || (CASE WHEN TG_OP = 'DELETE' THEN OLD.id ELSE NEW.id END));
      RETURN NULL;
    END $$`);
  await sequelize.query(`
    CREATE FUNCTION shellwright_notify_catalog() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM pg_notify('shellwright_cache', 'catalog');
      RETURN NULL;
    END $$`);
  await sequelize.query('CREATE TRIGGER users_notify_cache AFTER UPDATE OR DELETE ON users FOR EACH ROW EXECUTE FUNCTION shellwright_notify_user()');
  for (const table of CATALOG_TABLES) {
    await sequelize.query(
      `CREATE TRIGGER ${table}_notify_cache AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION shellwright_notify_catalog()`,
    );
  }
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  for (const table of CATALOG_TABLES) await sequelize.query(`DROP TRIGGER ${table}_notify_cache ON ${table}`);
  await sequelize.query('DROP TRIGGER users_notify_cache ON users');
  await sequelize.query('DROP FUNCTION shellwright_notify_catalog()');
  await sequelize.query('DROP FUNCTION shellwright_notify_user()');
}
