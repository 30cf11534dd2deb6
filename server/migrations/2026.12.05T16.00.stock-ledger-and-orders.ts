import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * The stock ledger and purchase orders. Every change to stock on hand is a movement (materials used in a session,
 * an order received, a count, a quantity set by hand) with the balance after it, so the shelf can be traced.
 * Quantities are in the material's own unit (g, mL, sheet, each); the pack and the number of packs are kept beside
 * them, as the workshop counts what it buys. `value` is the money the movement stands for: materials used at the
 * price paid for their pack, an order received at the price paid.
 */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('CREATE SEQUENCE purchase_order_number_seq START 1');
  await queryInterface.createTable('purchase_orders', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    supplier: { type: DataTypes.STRING(120), allowNull: false },
    state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    total: { type: DataTypes.DECIMAL(12, 2), allowNull: false },
    /** The delivery the supplier promised; low-stock warnings count the need until then. */
    expected_on: { type: DataTypes.DATEONLY, allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    sent_to: { type: DataTypes.STRING(254), allowNull: true },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    outbox_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'outbox', key: 'id' }, onDelete: 'SET NULL' },
    received_at: { type: DataTypes.DATE, allowNull: true },
    cancelled_at: { type: DataTypes.DATE, allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('purchase_orders', ['state', 'supplier'], { name: 'purchase_orders_state_supplier' });

  await queryInterface.createTable('purchase_order_lines', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    order_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'purchase_orders', key: 'id' }, onDelete: 'CASCADE' },
    material_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'materials', key: 'id' }, onDelete: 'RESTRICT' },
    pack_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'material_packs', key: 'id' }, onDelete: 'RESTRICT' },
    packs: { type: DataTypes.INTEGER, allowNull: false },
    pack_size: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
    /** Price of one pack in the price list when ordered. */
    pack_price: { type: DataTypes.DECIMAL(12, 4), allowNull: false },
    received_packs: { type: DataTypes.INTEGER, allowNull: true },
    /** Price of one pack actually paid, when the order came in. */
    paid_price: { type: DataTypes.DECIMAL(12, 4), allowNull: true },
  });
  await queryInterface.addIndex('purchase_order_lines', ['order_id'], { name: 'purchase_order_lines_order' });
  await queryInterface.addIndex('purchase_order_lines', ['material_id'], { name: 'purchase_order_lines_material' });

  await queryInterface.createTable('stock_movements', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    material_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'materials', key: 'id' }, onDelete: 'CASCADE' },
    pack_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'material_packs', key: 'id' }, onDelete: 'SET NULL' },
    /** use | receive | count | set */
    kind: { type: DataTypes.STRING(10), allowNull: false },
    /** Signed, in the material's unit: used is negative, received positive. */
    quantity: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
    packs: { type: DataTypes.DECIMAL(12, 3), allowNull: true },
    balance_after: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
    /** Price of one pack the value was worked out at. */
    pack_price: { type: DataTypes.DECIMAL(12, 4), allowNull: true },
    value: { type: DataTypes.DECIMAL(12, 2), allowNull: true },
    reason: { type: DataTypes.TEXT, allowNull: true },
    job_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'jobs', key: 'id' }, onDelete: 'SET NULL' },
    session_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'job_sessions', key: 'id' }, onDelete: 'SET NULL' },
    order_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'purchase_orders', key: 'id' }, onDelete: 'SET NULL' },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('stock_movements', ['material_id', 'id'], { name: 'stock_movements_material' });
  await queryInterface.addIndex('stock_movements', ['job_id'], { name: 'stock_movements_job' });
  await sequelize.query(`ALTER TABLE stock_movements ADD CONSTRAINT stock_movements_kind CHECK (kind IN ('use', 'receive', 'count', 'set'))`);
  await sequelize.query(`ALTER TABLE purchase_orders ADD CONSTRAINT purchase_orders_state CHECK (state IN ('draft', 'sent', 'received', 'cancelled'))`);
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('stock_movements');
  await queryInterface.dropTable('purchase_order_lines');
  await queryInterface.dropTable('purchase_orders');
  await sequelize.query('DROP SEQUENCE IF EXISTS purchase_order_number_seq');
}
