import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/** Quotes sent to customers, the mail outbox and deposit payments. */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('CREATE SEQUENCE quote_number_seq START 1');
  await queryInterface.createTable('quotes', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    estimate_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'estimates', key: 'id' }, onDelete: 'RESTRICT' },
    revision_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'estimate_revisions', key: 'id' }, onDelete: 'RESTRICT' },
    state: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'draft' },
    message: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    extras: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    discount_pct: { type: DataTypes.DECIMAL(5, 2), allowNull: false, defaultValue: 0 },
    deposit_pct: { type: DataTypes.DECIMAL(5, 2), allowNull: false },
    valid_until: { type: DataTypes.DATEONLY, allowNull: false },
    /** The priced breakdown as quoted (lines, total, deposit), fixed when the quote is made. */
    pricing: { type: DataTypes.JSONB, allowNull: false },
    total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    deposit: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    recipient: { type: DataTypes.STRING(254), allowNull: true },
    /** sha256 of the customer's link token; the token itself is never stored. */
    token_hash: { type: DataTypes.STRING(64), allowNull: true, unique: true },
    revoked: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    viewed_at: { type: DataTypes.DATE, allowNull: true },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_name: { type: DataTypes.STRING(160), allowNull: true },
    accepted_ip: { type: DataTypes.STRING(64), allowNull: true },
    accepted_extras: { type: DataTypes.JSONB, allowNull: true },
    accepted_total: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
    accepted_deposit: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
    declined_at: { type: DataTypes.DATE, allowNull: true },
    decline_reason: { type: DataTypes.STRING(1000), allowNull: true },
    deposit_paid_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('quotes', ['estimate_id'], { name: 'quotes_estimate' });
  await queryInterface.addIndex('quotes', ['state', 'updated_at'], { name: 'quotes_state_updated' });

  await queryInterface.createTable('outbox', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    quote_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'quotes', key: 'id' }, onDelete: 'SET NULL' },
    to_address: { type: DataTypes.STRING(254), allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    text_body: { type: DataTypes.TEXT, allowNull: false },
    html_body: { type: DataTypes.TEXT, allowNull: false },
    attachment_name: { type: DataTypes.STRING(200), allowNull: true },
    attachment: { type: DataTypes.BLOB, allowNull: true },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'queued' },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_error: { type: DataTypes.TEXT, allowNull: true },
    message_id: { type: DataTypes.STRING(300), allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    sent_at: { type: DataTypes.DATE, allowNull: true },
  });
  await queryInterface.addIndex('outbox', ['created_at'], { name: 'outbox_created' });

  await queryInterface.createTable('payments', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    quote_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'quotes', key: 'id' }, onDelete: 'RESTRICT' },
    provider_session_id: { type: DataTypes.STRING(120), allowNull: false, unique: true },
    amount_minor: { type: DataTypes.BIGINT, allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'pending' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    paid_at: { type: DataTypes.DATE, allowNull: true },
  });
  await queryInterface.addIndex('payments', ['quote_id'], { name: 'payments_quote' });

  // Every provider event handled once: a repeated delivery finds its id here and changes nothing.
  await queryInterface.createTable('payment_events', {
    event_id: { type: DataTypes.STRING(120), primaryKey: true },
    type: { type: DataTypes.STRING(80), allowNull: false },
    received_at: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('payment_events');
  await queryInterface.dropTable('payments');
  await queryInterface.dropTable('outbox');
  await queryInterface.dropTable('quotes');
  await sequelize.query('DROP SEQUENCE IF EXISTS quote_number_seq');
}
