import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * Password resets by e-mailed link: only a hash of each token is kept, with its expiry and the moment it was used, so
 * a link works once, for a short while, and a copy of the database opens no account.
 */
export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.createTable('password_resets', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
  });
  await queryInterface.addIndex('password_resets', ['user_id', 'created_at'], { name: 'password_resets_user' });
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('password_resets');
}
