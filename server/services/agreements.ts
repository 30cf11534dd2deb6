/**
 * The agreed figures of estimates, for the screens that list them (the estimate, the customer's record): the
 * accepted quote's total with the extras the customer took, the deposit and the balance.
 */
import { Op } from 'sequelize';
import { agreedFigures } from '@shared/schemas/quotes';
import type { EstimateAgreement } from '@shared/schemas/estimates';
import { Quote, QuoteLine } from '../models';

export async function agreementsOf(estimateIds: readonly number[]): Promise<Map<number, EstimateAgreement>> {
  const out = new Map<number, EstimateAgreement>();
  if (estimateIds.length === 0) return out;
  // The estimates a customer chose in an accepted quote: the quote's agreed figures (for a quote of several pieces,
  // the figures of the whole agreement, which the estimate is part of).
  const lines = await QuoteLine.findAll({ where: { estimateId: { [Op.in]: [...estimateIds] }, agreed: true } });
  // Most estimates listed were never agreed: no second round trip for them.
  if (lines.length === 0) return out;
  const quotes = await Quote.findAll({ where: { id: { [Op.in]: lines.map((l) => l.quoteId) }, state: { [Op.in]: ['accepted', 'deposit-paid'] } } });
  for (const line of lines) {
    const q = quotes.find((x) => x.id === line.quoteId);
    if (!q) continue;
    if (q.acceptedTotal === null || q.acceptedDeposit === null) continue;
    const extras = agreedFigures({ total: Number(q.total).toFixed(2), depositPct: Number(q.depositPct), extras: q.extras }, q.acceptedExtras ?? []).extras;
    const total = Number(q.acceptedTotal).toFixed(2);
    const deposit = Number(q.acceptedDeposit).toFixed(2);
    out.set(line.estimateId, {
      quoteId: q.id,
      quoteNumber: q.number,
      total,
      deposit,
      balance: ((Math.round(Number(total) * 100) - Math.round(Number(deposit) * 100)) / 100).toFixed(2),
      extras: extras.map((x) => x.label),
      depositPaid: q.state === 'deposit-paid',
    });
  }
  return out;
}

/** Adds each estimate's agreed figures (null when no quote of it is accepted). */
export async function withAgreements<T extends { id: number }>(rows: T[]): Promise<(T & { agreed: EstimateAgreement | null })[]> {
  const map = await agreementsOf(rows.map((r) => r.id));
  return rows.map((r) => ({ ...r, agreed: map.get(r.id) ?? null }));
}
