/** The reports and the stock ledger as CSV files safe to open in a spreadsheet (see shared/csv.ts). */
import { csvDecimal as d, toCsv } from '@shared/csv';
import type { AccountingLine, CapacityReport, MoneyReport, QuotesReport } from '@shared/schemas/reports';
import { MOVEMENT_LABELS, type EstimateAccuracy, type StockMovementDto } from '@shared/schemas/stock';

export function quotesCsv(r: QuotesReport): string {
  return toCsv(
    ['Month', 'Sent', 'Opened', 'Accepted', 'Declined', 'Expired'],
    r.months.map((m) => [m.month, m.sent, m.opened, m.accepted, m.declined, m.expired]),
  );
}

export function capacityCsv(r: CapacityReport): string {
  return toCsv(
    ['Week from', `Room booked (${r.roomUnit}-days)`, `Room available (${r.roomUnit}-days)`, 'Room use (%)', 'Polisher hours booked', 'Polisher hours available', 'Polisher use (%)', 'Past'],
    r.weeks.map((w) => [w.week, w.roomBooked, w.roomAvailable, w.roomPct, w.polisherHoursBooked, w.polisherHoursAvailable, w.polisherPct, w.past ? 'yes' : 'no']),
  );
}

export function accuracyCsv(r: EstimateAccuracy): string {
  return toCsv(
    ['Month', 'Finishing system', 'Piece kind', 'Estimated hours', 'Actual hours', 'Actual over estimated', 'Sessions', 'Jobs', 'Materials estimated', 'Materials used', 'Materials actual over estimated', 'Sessions with materials'],
    r.rows.map((x) => [x.month, x.systemName, x.pieceKind, x.estimatedHours, x.actualHours, x.ratio, x.sessions, x.jobs, d(x.estimatedMaterials), d(x.actualMaterials), x.materialsRatio, x.materialSessions]),
  );
}

export function movementsCsv(rows: readonly StockMovementDto[]): string {
  return toCsv(
    ['When', 'Material', 'What', 'Quantity', 'Unit', 'Packs', 'Pack', 'Balance after', 'Value', 'Reason', 'Job', 'Order', 'By'],
    rows.map((m) => [m.at, m.material, MOVEMENT_LABELS[m.kind], m.quantity, m.unit, m.packs, m.pack, m.balanceAfter, m.value, m.reason, m.job?.number, m.order?.number, m.by]),
  );
}

/** Money by month, then the totals of the period. */
export function moneyCsv(r: MoneyReport): string {
  return toCsv(
    ['Month', `Invoiced (${r.currency})`, `Credited (${r.currency})`, `Received (${r.currency})`, `Refunded (${r.currency})`, `Kept (${r.currency})`],
    [
      ...r.months.map((m) => [m.month, d(m.invoiced), d(m.credited), d(m.received), d(m.refunded), d(m.net)]),
      ['Total', d(r.totals.invoiced), d(r.totals.credited), d(r.totals.received), d(r.totals.refunded), d(r.totals.net)],
    ],
  );
}

const TYPE_WORDS: Record<AccountingLine['type'], string> = { invoice: 'Tax invoice', 'credit-note': 'Credit note', payment: 'Payment received', refund: 'Refund made' };

/** The accounting export: one row a document or payment; credit notes and refunds negative. */
export function accountingCsv(lines: readonly AccountingLine[]): string {
  return toCsv(
    ['Date', 'Type', 'Number', 'Customer', 'Quote', 'Net', 'Tax', 'Tax rate (%)', 'Total', 'Currency', 'Method', 'Reference', 'Against invoice'],
    lines.map((l) => [l.date, TYPE_WORDS[l.type], l.number, l.customer, l.quoteNumber, d(l.net), d(l.tax), l.taxPct, d(l.total), l.currency, l.method, l.reference, l.against]),
  );
}
