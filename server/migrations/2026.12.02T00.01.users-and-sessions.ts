import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.createTable('users', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.STRING(20), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    last_login_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.sequelize.query('CREATE UNIQUE INDEX users_email_lower ON users (lower(email))');
  await queryInterface.sequelize.query(
    "ALTER TABLE users ADD CONSTRAINT users_role_check CHECK (role IN ('owner','estimator','sales','workshop'))",
  );

  // The session store's table (connect-pg-simple's layout).
  await queryInterface.createTable('session', {
    sid: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
    sess: { type: DataTypes.JSON, allowNull: false },
    expire: { type: 'TIMESTAMP(6)', allowNull: false },
  });
  await queryInterface.addIndex('session', ['expire'], { name: 'session_expire' });
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('session');
  await queryInterface.dropTable('users');
}
