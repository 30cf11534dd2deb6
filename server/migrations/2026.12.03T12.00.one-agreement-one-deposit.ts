import { DataTypes, QueryTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * The agreement rules, kept by the database itself so that no two requests can break them however they interleave:
 * - one accepted quote per estimate (the piece of work), and one live job per estimate;
 * - the accepted deposit is the deposit percentage of the accepted total, to the cent;
 * - at most one open checkout per quote, and at most one payment counted as a quote's deposit.
 * Payments gain what the provider told us (checkout address, expiry, payment id, amount received), a flag when a
 * payment needs the owner's attention, and the refund made for it.
 */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  const twice = await sequelize.query<{ estimate_id: number }>(
    `SELECT estimate_id FROM quotes WHERE state IN ('accepted', 'deposit-paid') GROUP BY estimate_id HAVING count(*) > 1`,
    { type: QueryTypes.SELECT },
  );
  if (twice.length > 0) {
    throw new Error(`Estimates with more than one accepted quote (ids ${twice.map((r) => r.estimate_id).join(', ')}): withdraw all but one before migrating.`);
  }
  // Issue-per-piece later: this index names the estimate; a quote of several pieces moves it to the quote's lines.
  await sequelize.query(`CREATE UNIQUE INDEX quotes_one_agreement ON quotes (estimate_id) WHERE state IN ('accepted', 'deposit-paid')`);
  await sequelize.query(`CREATE UNIQUE INDEX jobs_live_estimate ON jobs (estimate_id) WHERE state <> 'cancelled'`);
  await sequelize.query(
    `ALTER TABLE quotes ADD CONSTRAINT quotes_accepted_deposit CHECK (
       (accepted_total IS NULL AND accepted_deposit IS NULL)
       OR (accepted_total IS NOT NULL AND accepted_deposit = round(accepted_total * deposit_pct / 100, 2)))`,
  );

  await queryInterface.addColumn('payments', 'checkout_url', { type: DataTypes.TEXT, allowNull: true });
  await queryInterface.addColumn('payments', 'expires_at', { type: DataTypes.DATE, allowNull: true });
  await queryInterface.addColumn('payments', 'payment_intent', { type: DataTypes.STRING(120), allowNull: true });
  await queryInterface.addColumn('payments', 'amount_received_minor', { type: DataTypes.BIGINT, allowNull: true });
  await queryInterface.addColumn('payments', 'flag', { type: DataTypes.STRING(24), allowNull: true });
  await queryInterface.addColumn('payments', 'note', { type: DataTypes.TEXT, allowNull: true });
  await queryInterface.addColumn('payments', 'refund_id', { type: DataTypes.STRING(120), allowNull: true });
  await queryInterface.addColumn('payments', 'refunded_at', { type: DataTypes.DATE, allowNull: true });
  await queryInterface.addColumn('payments', 'closed_at', { type: DataTypes.DATE, allowNull: true });
  await sequelize.query(
    `ALTER TABLE payments ADD CONSTRAINT payments_status CHECK (status IN ('pending', 'paid', 'cancelled', 'expired', 'refunded'))`,
  );
  await sequelize.query(
    `ALTER TABLE payments ADD CONSTRAINT payments_flag CHECK (flag IS NULL OR flag IN ('duplicate', 'amount-mismatch', 'unknown-checkout'))`,
  );
  // Checkouts left open side by side before this rule: only the newest of a quote's stays open.
  await sequelize.query(
    `UPDATE payments SET status = 'expired', closed_at = now()
      WHERE status = 'pending' AND id NOT IN (SELECT max(id) FROM payments WHERE status = 'pending' GROUP BY quote_id)`,
  );
  // A deposit paid twice before this rule: the later payment is flagged for the owner.
  await sequelize.query(
    `UPDATE payments SET flag = 'duplicate', note = 'Paid after the deposit was already paid (found when upgrading).'
      WHERE status = 'paid' AND id NOT IN (SELECT min(id) FROM payments WHERE status = 'paid' GROUP BY quote_id)`,
  );
  await sequelize.query(`CREATE UNIQUE INDEX payments_one_open ON payments (quote_id) WHERE status = 'pending'`);
  await sequelize.query(`CREATE UNIQUE INDEX payments_one_deposit ON payments (quote_id) WHERE status = 'paid' AND flag IS NULL`);
  await sequelize.query('CREATE INDEX payments_flagged ON payments (flag) WHERE flag IS NOT NULL');
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('DROP INDEX IF EXISTS payments_flagged');
  await sequelize.query('DROP INDEX IF EXISTS payments_one_deposit');
  await sequelize.query('DROP INDEX IF EXISTS payments_one_open');
  await sequelize.query('ALTER TABLE payments DROP CONSTRAINT IF EXISTS payments_flag');
  await sequelize.query('ALTER TABLE payments DROP CONSTRAINT IF EXISTS payments_status');
  for (const column of ['closed_at', 'refunded_at', 'refund_id', 'note', 'flag', 'amount_received_minor', 'payment_intent', 'expires_at', 'checkout_url']) {
    await queryInterface.removeColumn('payments', column);
  }
  await sequelize.query('ALTER TABLE quotes DROP CONSTRAINT IF EXISTS quotes_accepted_deposit');
  await sequelize.query('DROP INDEX IF EXISTS jobs_live_estimate');
  await sequelize.query('DROP INDEX IF EXISTS quotes_one_agreement');
}
