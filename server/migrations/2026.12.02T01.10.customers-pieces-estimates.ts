import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

/** Customers, their pieces with condition photos, estimates and their immutable revisions. */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.createTable('customers', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: true },
    phone: { type: DataTypes.STRING(40), allowNull: true },
    address: { type: DataTypes.STRING(500), allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await sequelize.query('CREATE INDEX customers_name_lower ON customers (lower(name), id)');
  await queryInterface.addIndex('customers', ['updated_at'], { name: 'customers_updated_at' });

  await queryInterface.createTable('pieces', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    customer_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'customers', key: 'id' }, onDelete: 'RESTRICT' },
    kind: { type: DataTypes.STRING(20), allowNull: false },
    description: { type: DataTypes.STRING(200), allowNull: false },
    maker: { type: DataTypes.STRING(120), allowNull: true },
    year: { type: DataTypes.INTEGER, allowNull: true },
    serial: { type: DataTypes.STRING(60), allowNull: true },
    dimensions: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    condition_notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await queryInterface.addIndex('pieces', ['customer_id'], { name: 'pieces_customer' });
  await queryInterface.addIndex('pieces', ['updated_at'], { name: 'pieces_updated_at' });

  await queryInterface.createTable('piece_photos', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    piece_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'pieces', key: 'id' }, onDelete: 'CASCADE' },
    file_name: { type: DataTypes.STRING(80), allowNull: false },
    thumb_name: { type: DataTypes.STRING(80), allowNull: false },
    mime: { type: DataTypes.STRING(40), allowNull: false },
    bytes: { type: DataTypes.INTEGER, allowNull: false },
    width: { type: DataTypes.INTEGER, allowNull: false },
    height: { type: DataTypes.INTEGER, allowNull: false },
    caption: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('piece_photos', ['piece_id'], { name: 'piece_photos_piece' });

  await sequelize.query('CREATE SEQUENCE estimate_number_seq START 1');
  await queryInterface.createTable('estimates', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    customer_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'customers', key: 'id' }, onDelete: 'RESTRICT' },
    piece_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'pieces', key: 'id' }, onDelete: 'RESTRICT' },
    owner_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    title: { type: DataTypes.STRING(160), allowNull: false },
    state: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'draft' },
    valid_until: { type: DataTypes.DATEONLY, allowNull: false },
    revision_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    current_revision_id: { type: DataTypes.INTEGER, allowNull: true },
    total: { type: DataTypes.DECIMAL(14, 2), allowNull: false, defaultValue: 0 },
    labour_hours: { type: DataTypes.DECIMAL(10, 2), allowNull: false, defaultValue: 0 },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  for (const column of ['updated_at', 'state', 'customer_id', 'total', 'labour_hours']) {
    await queryInterface.addIndex('estimates', ['archived', column], { name: `estimates_archived_${column}` });
  }

  await queryInterface.createTable('estimate_revisions', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    estimate_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'estimates', key: 'id' }, onDelete: 'CASCADE' },
    number: { type: DataTypes.INTEGER, allowNull: false },
    input: { type: DataTypes.JSONB, allowNull: false },
    result: { type: DataTypes.JSONB, allowNull: false },
    catalog_version: { type: DataTypes.STRING(40), allowNull: false },
    /** The price list and settings the revision was priced with, so it can always be explained. */
    catalog: { type: DataTypes.JSONB, allowNull: false },
    total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    labour_hours: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
    note: { type: DataTypes.STRING(1000), allowNull: false, defaultValue: '' },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('estimate_revisions', ['estimate_id', 'number'], { unique: true, name: 'estimate_revisions_number' });
  await sequelize.query(
    'ALTER TABLE estimates ADD CONSTRAINT estimates_current_revision_fk FOREIGN KEY (current_revision_id) REFERENCES estimate_revisions (id) ON DELETE SET NULL',
  );
  // Revisions are never edited: a change makes a new one.
  await sequelize.query(`
    CREATE FUNCTION estimate_revisions_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'estimate revisions are immutable' USING ERRCODE = 'P0001';
    END $$`);
  await sequelize.query(
    'CREATE TRIGGER estimate_revisions_no_update BEFORE UPDATE ON estimate_revisions FOR EACH ROW EXECUTE FUNCTION estimate_revisions_immutable()',
  );
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('ALTER TABLE estimates DROP CONSTRAINT IF EXISTS estimates_current_revision_fk');
  await queryInterface.dropTable('estimate_revisions');
  await sequelize.query('DROP FUNCTION IF EXISTS estimate_revisions_immutable()');
  await queryInterface.dropTable('estimates');
  await sequelize.query('DROP SEQUENCE IF EXISTS estimate_number_seq');
  await queryInterface.dropTable('piece_photos');
  await queryInterface.dropTable('pieces');
  await queryInterface.dropTable('customers');
}
