import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * Supplier price files between preview and apply. The parsed preview is kept here (not in a server's memory) so
 * that any instance can apply it, and the apply step applies exactly what was shown.
 */
export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.createTable('price_file_previews', {
    id: { type: DataTypes.UUID, primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    file_name: { type: DataTypes.STRING(200), allowNull: false },
    content_hash: { type: DataTypes.STRING(64), allowNull: false },
    preview: { type: DataTypes.JSONB, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    applied_at: { type: DataTypes.DATE, allowNull: true },
  });
  await queryInterface.addIndex('price_file_previews', ['expires_at'], { name: 'price_file_previews_expiry' });
  // The audit log page filters by user.
  await queryInterface.addIndex('audit_log', ['user_id', 'at'], { name: 'audit_log_user_at' });
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.removeIndex('audit_log', 'audit_log_user_at');
  await queryInterface.dropTable('price_file_previews');
}
