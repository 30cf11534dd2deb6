import type { MigrationContext } from '../db/migrator';

/**
 * Tells every server instance when a stored session it may hold in memory changed: a NOTIFY on `shellwright_cache`
 * (`session:<sha-256 of the id>`, never the id itself) when a session's data is rewritten, when it is deleted before
 * its expiry (signed out, signed out everywhere, a password reset), or when its expiry is brought forward. A later
 * expiry (the store's periodic touch) sends nothing: an instance holding the earlier one reads the session again
 * when that passes. Notifications go out at commit and not at all on rollback.
 */
export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query(`
    CREATE FUNCTION shellwright_notify_session() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM pg_notify('shellwright_cache', 'session:' || encode(sha256(convert_to(OLD.sid, 'UTF8')), 'hex'));
      RETURN NULL;
    END $$`);
  await sequelize.query('CREATE TRIGGER session_data_notify_cache AFTER UPDATE OF sess ON session FOR EACH ROW EXECUTE FUNCTION shellwright_notify_session()');
  await sequelize.query(
    'CREATE TRIGGER session_sooner_notify_cache AFTER UPDATE OF expire ON session FOR EACH ROW WHEN (NEW.expire < OLD.expire) EXECUTE FUNCTION shellwright_notify_session()',
  );
  // Deleting expired sessions (the store's pruning) needs no word: no instance trusts a copy past its expiry.
  await sequelize.query(
    'CREATE TRIGGER session_deleted_notify_cache AFTER DELETE ON session FOR EACH ROW WHEN (OLD.expire > now()) EXECUTE FUNCTION shellwright_notify_session()',
  );
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  for (const name of ['session_deleted_notify_cache', 'session_sooner_notify_cache', 'session_data_notify_cache']) await sequelize.query(`DROP TRIGGER ${name} ON session`);
  await sequelize.query('DROP FUNCTION shellwright_notify_session()');
}
