/**
 * The agreed figures of estimates, for the screens that list them (the estimate, the customer's record): the
 * accepted quote's total with the extras the customer took, the deposit and the balance.
 */
import { agreedFigures } from '@shared/schemas/quotes';
import type { QuoteExtra } from '@shared/schemas/quotes';
import type { EstimateAgreement } from '@shared/schemas/estimates';
import { plannedSelect } from '../db/planned';
import { Quote } from '../models';

interface AgreedRow {
  estimate_id: number;
  id: number;
  number: string;
  state: string;
  total: string;
  deposit_pct: string;
  extras: QuoteExtra[];
  accepted_extras: string[] | null;
  accepted_total: string | null;
  accepted_deposit: string | null;
}

export async function agreementsOf(estimateIds: readonly number[]): Promise<Map<number, EstimateAgreement>> {
  const out = new Map<number, EstimateAgreement>();
  if (estimateIds.length === 0) return out;
  // The estimates a customer chose in an accepted quote: the quote's agreed figures (for a quote of several pieces,
  // the figures of the whole agreement, which the estimate is part of).
  // One read: the agreed lines of these estimates with their accepted quote's figures, its plan kept per connection.
  const rows = await plannedSelect<AgreedRow>(
    Quote.sequelize!,
    `SELECT l.estimate_id, q.id, q.number, q.state, q.total, q.deposit_pct, q.extras, q.accepted_extras, q.accepted_total, q.accepted_deposit
       FROM quote_lines l JOIN quotes q ON q.id = l.quote_id
      WHERE l.estimate_id = ANY($1::int[]) AND l.agreed AND q.state IN ('accepted', 'deposit-paid')
      ORDER BY l.id`,
    { bind: [[...estimateIds]] },
  );
  for (const q of rows) {
    if (q.accepted_total === null || q.accepted_deposit === null) continue;
    const extras = agreedFigures({ total: Number(q.total).toFixed(2), depositPct: Number(q.deposit_pct), extras: q.extras }, q.accepted_extras ?? []).extras;
    const total = Number(q.accepted_total).toFixed(2);
    const deposit = Number(q.accepted_deposit).toFixed(2);
    out.set(q.estimate_id, {
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
