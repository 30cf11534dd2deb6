import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * Messages to the customer after the quote.
 * - `message_templates`: per workshop, one editable template (subject and body, plain text with named placeholders)
 *   for each kind of message; the texts the product came with are written here for every workshop there is (a later
 *   workshop reads the same texts from the code until its owner edits one).
 * - `message_settings`: per workshop, after how many days an unanswered quote gets its reminder, and how many days
 *   before a quote expires the other reminder goes.
 * - `outbox`: which customer a message is for, which job, what kind of message it is, when it is due to go (a
 *   reminder), and a unique key for the event that made it, so an event repeated (a webhook delivered twice, a job
 *   run by two instances) makes one message only. Messages already in the outbox for a quote get the quote's
 *   customer.
 * The durable queue that sends and schedules them is pg-boss, in its own schema (`pgboss`), created by pg-boss itself
 * when the app starts: it is not part of these migrations.
 */
const TEMPLATES: Record<string, { subject: string; body: string }> = {
  acceptance: {
    subject: 'Your quote {quote_number} is accepted: thank you',
    body: 'Thank you for accepting quote {quote_number} for the {piece}, {amount} in all.\n\nThe next step is the deposit: you can pay it on your page, where the quote and its terms are kept:\n{link}\n\nWe will write again with the dates once the work is booked.',
  },
  'deposit-receipt': {
    subject: 'Your deposit for quote {quote_number}',
    body: 'Thank you for your deposit of {amount} for the {piece}. We will write with the dates as soon as the work is booked in our drying room.',
  },
  booking: {
    subject: 'Dates for your {piece}',
    body: 'The work on the {piece} (quote {quote_number}) is booked: {dates}.\n\nYou can follow it on your page:\n{link}',
  },
  'dates-changed': {
    subject: 'New dates for your {piece}',
    body: 'The dates for the work on the {piece} (quote {quote_number}) have changed: it is now booked {dates}.\n\nWe are sorry for any trouble this causes. Your page shows the latest:\n{link}',
  },
  ready: {
    subject: 'Your {piece} is ready',
    body: 'The work on the {piece} is finished and it is ready for collection or delivery. Please let us know which suits you.\n\nWhat is still to pay, if anything, is on your page:\n{link}',
  },
  'balance-due': {
    subject: 'The balance for quote {quote_number}',
    body: 'The work on the {piece} is invoiced. The balance still to pay is {amount}; you can pay it by card on your page:\n{link}',
  },
  'quote-unanswered': {
    subject: 'Your quote {quote_number} from {workshop}',
    body: 'We sent you quote {quote_number} for the {piece} a little while ago and wondered whether you had any questions. It stays open until {dates}:\n{link}',
  },
  'quote-expiring': {
    subject: 'Quote {quote_number} expires on {dates}',
    body: 'Quote {quote_number} for the {piece} is open until {dates}. After that date we would need to price the work again. You can read it and accept it on your page:\n{link}',
  },
};

export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.createTable('message_templates', {
    workshop_id: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true, references: { model: 'workshops', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(24), allowNull: false, primaryKey: true },
    subject: { type: DataTypes.STRING(200), allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    edited: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    updated_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  for (const [kind, t] of Object.entries(TEMPLATES)) {
    await sequelize.query(
      `INSERT INTO message_templates (workshop_id, kind, subject, body, edited, updated_at) SELECT id, :kind, :subject, :body, false, now() FROM workshops`,
      { replacements: { kind, subject: t.subject, body: t.body } },
    );
  }

  await queryInterface.createTable('message_settings', {
    workshop_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: 'workshops', key: 'id' }, onDelete: 'CASCADE' },
    unanswered_after_days: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 7 },
    expiring_before_days: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 3 },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await sequelize.query('ALTER TABLE message_settings ADD CONSTRAINT message_settings_days CHECK (unanswered_after_days BETWEEN 1 AND 60 AND expiring_before_days BETWEEN 1 AND 30)');

  await queryInterface.addColumn('outbox', 'customer_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'customers', key: 'id' }, onDelete: 'SET NULL' });
  await queryInterface.addColumn('outbox', 'job_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'jobs', key: 'id' }, onDelete: 'SET NULL' });
  await queryInterface.addColumn('outbox', 'kind', { type: DataTypes.STRING(24), allowNull: true });
  await queryInterface.addColumn('outbox', 'send_after', { type: DataTypes.DATE, allowNull: true });
  await queryInterface.addColumn('outbox', 'dedupe_key', { type: DataTypes.STRING(120), allowNull: true });
  await sequelize.query('CREATE UNIQUE INDEX outbox_dedupe_key ON outbox (dedupe_key) WHERE dedupe_key IS NOT NULL');
  await sequelize.query('CREATE INDEX outbox_customer ON outbox (customer_id, created_at) WHERE customer_id IS NOT NULL');
  await sequelize.query(
    `UPDATE outbox o SET customer_id = e.customer_id FROM quotes q JOIN estimates e ON e.id = q.estimate_id WHERE q.id = o.quote_id AND o.customer_id IS NULL`,
  );
  await sequelize.query(`UPDATE outbox o SET customer_id = d.customer_id FROM account_documents d WHERE d.outbox_id = o.id AND o.customer_id IS NULL`);
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('DROP INDEX IF EXISTS outbox_customer');
  await sequelize.query('DROP INDEX IF EXISTS outbox_dedupe_key');
  for (const column of ['dedupe_key', 'send_after', 'kind', 'job_id', 'customer_id']) await queryInterface.removeColumn('outbox', column);
  await queryInterface.dropTable('message_settings');
  await queryInterface.dropTable('message_templates');
}
