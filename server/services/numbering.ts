/**
 * Record numbers per workshop: estimates, quotes, jobs and purchase orders each count from 1 in every workshop, on
 * their own row of `document_counters` (migration `2026.12.08T20.00`; the account documents count there too, see
 * `allocateNumber` in accounts.ts).
 *
 * The counter moves in one statement inside the caller's transaction: the INSERT makes the workshop's row at 1 the
 * first time, and otherwise ON CONFLICT moves it on by one under the row's lock, which is held until the transaction
 * ends. Two creations in one workshop therefore take numbers one after the other; a creation that rolls back gives its
 * number back, so numbers are gap-free and never given twice. The row's `workshop_id` comes from the connection's
 * workshop setting (the column's default) and row-level security keeps each workshop on its own rows.
 */
import { currentYear } from '@shared/time';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

export const RECORD_KINDS = ['estimate', 'quote', 'job', 'purchase-order'] as const;
export type RecordKind = (typeof RECORD_KINDS)[number];

/** Number formats, as they were: EST-2026-0001, Q-2026-0001, JOB-2026-0001, PO-2026-0001. */
export const RECORD_PREFIX: Record<RecordKind, string> = { estimate: 'EST', quote: 'Q', job: 'JOB', 'purchase-order': 'PO' };

/** The workshop's next count of a kind, taken inside `transaction` (given back if it rolls back). */
export async function nextCount(sequelize: Sequelize, kind: RecordKind, transaction: Transaction): Promise<number> {
  const [row] = await sequelize.query<{ last_number: number }>(
    `INSERT INTO document_counters (kind, last_number) VALUES (:kind, 1)
     ON CONFLICT (workshop_id, kind) DO UPDATE SET last_number = document_counters.last_number + 1
     RETURNING last_number`,
    { replacements: { kind }, type: QueryTypes.SELECT, transaction },
  );
  return Number(row!.last_number);
}

/** The number a record of `kind` shows for a count: prefix, year, count to four digits at least. */
export function formatRecordNumber(kind: RecordKind, count: number, year = currentYear()): string {
  return `${RECORD_PREFIX[kind]}-${year}-${String(count).padStart(4, '0')}`;
}

/** The workshop's next number of a kind, e.g. `EST-2026-0007`. */
export async function nextRecordNumber(sequelize: Sequelize, kind: RecordKind, transaction: Transaction): Promise<string> {
  return formatRecordNumber(kind, await nextCount(sequelize, kind, transaction));
}
