import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

/** The price list and the estimator's defaults: species, finishing systems, materials with packs and price history, labour rates. */
export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.createTable('species', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(80), allowNull: false },
    pores: { type: DataTypes.STRING(12), allowNull: false },
    needs_grain_fill: { type: DataTypes.BOOLEAN, allowNull: false },
    absorbency: { type: DataTypes.DECIMAL(6, 3), allowNull: false },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });

  await queryInterface.createTable('finishing_systems', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(80), allowNull: false },
    description: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
    /** The ordered stages, validated by the shared StageSchema on every write. */
    stages: { type: DataTypes.JSONB, allowNull: false },
    preset: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });

  await queryInterface.createTable('materials', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    kind: { type: DataTypes.STRING(20), allowNull: false },
    unit: { type: DataTypes.STRING(10), allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });

  await queryInterface.createTable('material_packs', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    material_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'materials', key: 'id' }, onDelete: 'CASCADE' },
    size: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
    label: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
    supplier: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    supplier_code: { type: DataTypes.STRING(60), allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await queryInterface.addIndex('material_packs', ['material_id'], { name: 'material_packs_material' });
  await queryInterface.addIndex('material_packs', ['supplier', 'supplier_code'], { name: 'material_packs_supplier_code' });

  // A pack's price over time: a new price takes an effective date and keeps the old one.
  await queryInterface.createTable('pack_prices', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    pack_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'material_packs', key: 'id' }, onDelete: 'CASCADE' },
    price: { type: DataTypes.DECIMAL(12, 4), allowNull: false },
    effective_from: { type: DataTypes.DATEONLY, allowNull: false },
    user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    source: { type: DataTypes.STRING(120), allowNull: false, defaultValue: 'manual' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('pack_prices', ['pack_id', 'effective_from'], { name: 'pack_prices_pack_date' });

  await queryInterface.createTable('labour_rates', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(80), allowNull: false },
    per_hour: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
    ...timestamps,
  });
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  for (const table of ['labour_rates', 'pack_prices', 'material_packs', 'materials', 'finishing_systems', 'species']) {
    await queryInterface.dropTable(table);
  }
}
