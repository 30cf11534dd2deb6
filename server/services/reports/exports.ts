/** The reports and the stock ledger as CSV files safe to open in a spreadsheet (see shared/csv.ts). */
import { toCsv } from '@shared/csv';
import type { CapacityReport, QuotesReport } from '@shared/schemas/reports';
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
    ['Month', 'Finishing system', 'Piece kind', 'Estimated hours', 'Actual hours', 'Actual over estimated', 'Sessions', 'Jobs'],
    r.rows.map((x) => [x.month, x.systemName, x.pieceKind, x.estimatedHours, x.actualHours, x.ratio, x.sessions, x.jobs]),
  );
}

export function movementsCsv(rows: readonly StockMovementDto[]): string {
  return toCsv(
    ['When', 'Material', 'What', 'Quantity', 'Unit', 'Packs', 'Pack', 'Balance after', 'Value', 'Reason', 'Job', 'Order', 'By'],
    rows.map((m) => [m.at, m.material, MOVEMENT_LABELS[m.kind], m.quantity, m.unit, m.packs, m.pack, m.balanceAfter, m.value, m.reason, m.job?.number, m.order?.number, m.by]),
  );
}
