import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.createTable('workshops', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: true },
    phone: { type: DataTypes.STRING(40), allowNull: true },
    address: { type: DataTypes.TEXT, allowNull: true },
    settings: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });

  await queryInterface.createTable('audit_log', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    action: { type: DataTypes.STRING(60), allowNull: false },
    entity_type: { type: DataTypes.STRING(60), allowNull: false },
    entity_id: { type: DataTypes.STRING(60), allowNull: true },
    before: { type: DataTypes.JSONB, allowNull: true },
    after: { type: DataTypes.JSONB, allowNull: true },
  });
  await queryInterface.addIndex('audit_log', ['at'], { name: 'audit_log_at' });
  await queryInterface.addIndex('audit_log', ['entity_type', 'entity_id'], { name: 'audit_log_entity' });
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('audit_log');
  await queryInterface.dropTable('workshops');
}
