/**
 * Estimate, quote, job and purchase-order numbers count per workshop, from 1 in each, in `document_counters` beside the
 * account documents' (receipts, invoices, credit notes): one row per workshop and kind holding the last number given.
 *
 * Each workshop's counters start at the highest number it has already issued of that kind (the digits after the
 * number's last dash, whatever the year), so nothing issued repeats. The global sequences the numbers came from
 * (`estimate_number_seq`, …) are left in place, unused, so code of another branch that still names them keeps
 * working until it moves over.
 *
 * `down` removes the new counters and the kinds, and moves each global sequence past every number any workshop has
 * issued, so the old code's next number cannot meet one given per workshop.
 */
import type { MigrationContext } from '../db/migrator';

const KINDS = [
  { kind: 'estimate', table: 'estimates', seq: 'estimate_number_seq' },
  { kind: 'quote', table: 'quotes', seq: 'quote_number_seq' },
  { kind: 'job', table: 'jobs', seq: 'job_number_seq' },
  { kind: 'purchase-order', table: 'purchase_orders', seq: 'purchase_order_number_seq' },
] as const;

const ACCOUNT_KINDS = `'receipt', 'invoice', 'credit-note'`;
const ALL_KINDS = `${ACCOUNT_KINDS}, ${KINDS.map((k) => `'${k.kind}'`).join(', ')}`;

/** The number's trailing digits (EST-2026-0042 → 42); 0 for a number without any. */
const seqOf = (column: string) => `COALESCE(NULLIF(substring(${column} from '([0-9]+)$'), '')::bigint, 0)`;

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query('ALTER TABLE document_counters DROP CONSTRAINT document_counters_kind');
  await sequelize.query(`ALTER TABLE document_counters ADD CONSTRAINT document_counters_kind CHECK (kind IN (${ALL_KINDS}))`);
  for (const { kind, table } of KINDS) {
    // The owner runs migrations (row-level security does not bind it), so this sees every workshop's rows.
    await sequelize.query(
      `INSERT INTO document_counters (workshop_id, kind, last_number)
       SELECT w.id, :kind, COALESCE((SELECT max(${seqOf('t.number')}) FROM ${table} t WHERE t.workshop_id = w.id), 0)
         FROM workshops w
       ON CONFLICT (workshop_id, kind) DO UPDATE SET last_number = GREATEST(document_counters.last_number, EXCLUDED.last_number)`,
      { replacements: { kind } },
    );
  }
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  for (const { kind, table, seq } of KINDS) {
    // setval(seq, v, called): with v = 0 (nothing issued anywhere) the sequence starts again at 1.
    await sequelize.query(
      `SELECT setval('${seq}', GREATEST(v, 1), v > 0) FROM (SELECT GREATEST(
         (SELECT CASE WHEN is_called THEN last_value ELSE 0 END FROM ${seq}),
         COALESCE((SELECT max(${seqOf('number')}) FROM ${table}), 0),
         COALESCE((SELECT max(last_number) FROM document_counters WHERE kind = :kind), 0)) AS v) AS m`,
      { replacements: { kind } },
    );
  }
  await sequelize.query(`DELETE FROM document_counters WHERE kind NOT IN (${ACCOUNT_KINDS})`);
  await sequelize.query('ALTER TABLE document_counters DROP CONSTRAINT document_counters_kind');
  await sequelize.query(`ALTER TABLE document_counters ADD CONSTRAINT document_counters_kind CHECK (kind IN (${ACCOUNT_KINDS}))`);
}
