import type { MigrationContext } from '../db/migrator';

/**
 * Failed sign-in counters, shared by every instance behind a load balancer: one row per counted key (an address or
 * an account) with its points and the epoch milliseconds when the window ends. The layout is the one the rate
 * limiter's PostgreSQL store (rate-limiter-flexible) reads and writes.
 */
export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query(`
    CREATE TABLE login_attempts (
      key varchar(255) PRIMARY KEY,
      points integer NOT NULL DEFAULT 0,
      expire bigint
    )`);
  await sequelize.query('CREATE INDEX login_attempts_expire ON login_attempts (expire)');
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('login_attempts');
}
