import { DataTypes, QueryTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * A job's account after the agreement.
 * - `document_counters`: one row per workshop and kind of document (receipt, invoice, credit note) holding the last
 *   number given. A number is taken by locking the row (FOR UPDATE) inside the transaction that issues the document,
 *   so a number is used if and only if its document is committed: no gaps, no duplicates (a sequence could skip).
 * - `account_documents`: every receipt, tax invoice and credit note issued, with the figures and the words printed
 *   on it. An issued document is never changed or deleted (a trigger refuses it); only the message that sent it may
 *   be noted. One invoice per agreement.
 * - `account_entries`: the payments ledger: payments received (card through the provider, bank transfer, cash,
 *   cheque) and refunds made. A card payment appears at most once (unique `payment_id`).
 * - `account_settings`: when the owner lets invoices be issued.
 * - `payments.purpose`: a card checkout is for the deposit or for the balance; the one-counted-deposit rule now
 *   counts deposits only.
 * Deposits already paid are entered in the ledger (no receipts are issued for them after the fact).
 */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.createTable('document_counters', {
    workshop_id: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true, references: { model: 'workshops', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(16), allowNull: false, primaryKey: true },
    last_number: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
  });
  await sequelize.query(`ALTER TABLE document_counters ADD CONSTRAINT document_counters_kind CHECK (kind IN ('receipt', 'invoice', 'credit-note'))`);
  await sequelize.query(`ALTER TABLE document_counters ADD CONSTRAINT document_counters_positive CHECK (last_number >= 0)`);
  await sequelize.query(
    `INSERT INTO document_counters (workshop_id, kind, last_number)
     SELECT w.id, k.kind, 0 FROM workshops w CROSS JOIN (VALUES ('receipt'), ('invoice'), ('credit-note')) AS k(kind)`,
  );

  await queryInterface.createTable('account_documents', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    workshop_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'workshops', key: 'id' }, onDelete: 'RESTRICT' },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    seq: { type: DataTypes.INTEGER, allowNull: false },
    number: { type: DataTypes.STRING(20), allowNull: false },
    quote_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'quotes', key: 'id' }, onDelete: 'RESTRICT' },
    customer_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'customers', key: 'id' }, onDelete: 'RESTRICT' },
    /** A credit note: the invoice it credits. */
    invoice_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'account_documents', key: 'id' }, onDelete: 'RESTRICT' },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    /** The document's amount, tax included (a credit note: the amount credited). */
    total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    net: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    tax: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    tax_pct: { type: DataTypes.DECIMAL(5, 2), allowNull: false },
    tax_label: { type: DataTypes.STRING(40), allowNull: false },
    /** What was still owed once the document was issued. */
    balance_due: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: true },
    /** Everything printed on the document, as issued. */
    content: { type: DataTypes.JSONB, allowNull: false },
    issued_at: { type: DataTypes.DATE, allowNull: false },
    issued_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    outbox_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'outbox', key: 'id' }, onDelete: 'SET NULL' },
  });
  await sequelize.query(`ALTER TABLE account_documents ADD CONSTRAINT account_documents_kind CHECK (kind IN ('receipt', 'invoice', 'credit-note'))`);
  await sequelize.query(`ALTER TABLE account_documents ADD CONSTRAINT account_documents_figures CHECK (total >= 0 AND tax >= 0 AND net + tax = total AND balance_due >= 0)`);
  await sequelize.query(`ALTER TABLE account_documents ADD CONSTRAINT account_documents_credit CHECK ((kind = 'credit-note') = (invoice_id IS NOT NULL))`);
  await sequelize.query('CREATE UNIQUE INDEX account_documents_seq ON account_documents (workshop_id, kind, seq)');
  await sequelize.query('CREATE UNIQUE INDEX account_documents_number ON account_documents (workshop_id, number)');
  await sequelize.query(`CREATE UNIQUE INDEX account_documents_one_invoice ON account_documents (quote_id) WHERE kind = 'invoice'`);
  await sequelize.query('CREATE INDEX account_documents_quote ON account_documents (quote_id)');

  await queryInterface.createTable('account_entries', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    quote_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'quotes', key: 'id' }, onDelete: 'RESTRICT' },
    kind: { type: DataTypes.STRING(10), allowNull: false },
    method: { type: DataTypes.STRING(16), allowNull: false },
    amount: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    received_on: { type: DataTypes.DATEONLY, allowNull: false },
    reference: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    /** A card payment: the provider checkout it came from (at most once). */
    payment_id: { type: DataTypes.INTEGER, allowNull: true, unique: true, references: { model: 'payments', key: 'id' }, onDelete: 'RESTRICT' },
    /** A refund: the credit note it gives back money for. */
    credit_note_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'account_documents', key: 'id' }, onDelete: 'RESTRICT' },
    recorded_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await sequelize.query(`ALTER TABLE account_entries ADD CONSTRAINT account_entries_kind CHECK (kind IN ('payment', 'refund'))`);
  await sequelize.query(`ALTER TABLE account_entries ADD CONSTRAINT account_entries_method CHECK (method IN ('card', 'bank-transfer', 'cash', 'cheque'))`);
  await sequelize.query('ALTER TABLE account_entries ADD CONSTRAINT account_entries_amount CHECK (amount > 0)');
  await sequelize.query('CREATE INDEX account_entries_quote ON account_entries (quote_id)');

  // A receipt acknowledges one ledger entry.
  await queryInterface.addColumn('account_documents', 'entry_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'account_entries', key: 'id' }, onDelete: 'RESTRICT' });
  await sequelize.query('CREATE UNIQUE INDEX account_documents_one_receipt ON account_documents (entry_id) WHERE entry_id IS NOT NULL');

  // Issued documents are never edited or deleted: only the message that sent them may be noted.
  await sequelize.query(`
    CREATE FUNCTION account_documents_issued() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'DELETE' THEN
        RAISE EXCEPTION 'account document % was issued: it is never deleted, only credited', OLD.number USING ERRCODE = 'check_violation';
      END IF;
      IF (to_jsonb(NEW) - 'outbox_id') IS DISTINCT FROM (to_jsonb(OLD) - 'outbox_id') THEN
        RAISE EXCEPTION 'account document % was issued: it is never changed, only credited', OLD.number USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END $$`);
  await sequelize.query(`CREATE TRIGGER account_documents_issued BEFORE UPDATE OR DELETE ON account_documents FOR EACH ROW EXECUTE FUNCTION account_documents_issued()`);

  await queryInterface.createTable('account_settings', {
    workshop_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: 'workshops', key: 'id' }, onDelete: 'CASCADE' },
    invoice_stage: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'finished' },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await sequelize.query(`ALTER TABLE account_settings ADD CONSTRAINT account_settings_stage CHECK (invoice_stage IN ('accepted', 'deposit-paid', 'finished'))`);

  await queryInterface.addColumn('payments', 'purpose', { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'deposit' });
  await sequelize.query(`ALTER TABLE payments ADD CONSTRAINT payments_purpose CHECK (purpose IN ('deposit', 'balance'))`);
  await sequelize.query('DROP INDEX IF EXISTS payments_one_deposit');
  await sequelize.query(`CREATE UNIQUE INDEX payments_one_deposit ON payments (quote_id) WHERE status = 'paid' AND flag IS NULL AND purpose = 'deposit'`);

  await sequelize.query(
    `INSERT INTO account_entries (quote_id, kind, method, amount, currency, received_on, reference, note, payment_id, created_at)
     SELECT p.quote_id, 'payment', 'card', q.accepted_deposit, q.currency, COALESCE(p.paid_at, q.deposit_paid_at, now())::date,
            COALESCE(p.payment_intent, p.provider_session_id), 'Deposit', p.id, now()
       FROM payments p JOIN quotes q ON q.id = p.quote_id
      WHERE p.status = 'paid' AND p.flag IS NULL AND q.accepted_deposit > 0`,
  );
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  const [balance] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM payments WHERE purpose = 'balance' AND status = 'paid' AND flag IS NULL`, { type: QueryTypes.SELECT });
  if (Number(balance?.n ?? 0) > 0) {
    throw new Error('Balance payments have been taken by card: the one-deposit rule cannot go back to counting every paid payment.');
  }
  await sequelize.query('DROP INDEX IF EXISTS payments_one_deposit');
  await sequelize.query(`CREATE UNIQUE INDEX payments_one_deposit ON payments (quote_id) WHERE status = 'paid' AND flag IS NULL`);
  await sequelize.query('ALTER TABLE payments DROP CONSTRAINT IF EXISTS payments_purpose');
  await queryInterface.removeColumn('payments', 'purpose');
  await queryInterface.dropTable('account_settings');
  await sequelize.query('DROP TRIGGER IF EXISTS account_documents_issued ON account_documents');
  await sequelize.query('DROP FUNCTION IF EXISTS account_documents_issued()');
  await sequelize.query('DROP INDEX IF EXISTS account_documents_one_receipt');
  await queryInterface.removeColumn('account_documents', 'entry_id');
  await queryInterface.dropTable('account_entries');
  await queryInterface.dropTable('account_documents');
  await queryInterface.dropTable('document_counters');
}
