/**
 * A quote's price: from an estimate revision with its discount and deposit, several lines combined, the price shown, and the figures agreed.
 */
import { estimate as runEstimate } from '@shared/calc';
import { money, percentOf } from '@shared/money';
import { agreedFigures, type AgreedFigures, type QuotePricing } from '@shared/schemas/quotes';
import { type EstimateRevision, type Quote, type QuoteLine } from '../../models';

// ---------------------------------------------------------------------------------------------- pricing

/** Prices a revision again as quoted: its own price list snapshot, the quote's discount and deposit. */
export function quotePricing(revision: EstimateRevision, discountPct: number, depositPct: number): QuotePricing {
  const catalog = { ...revision.catalog, pricing: { ...revision.catalog.pricing, depositPct } };
  const result = runEstimate({ ...revision.input, discountPct }, catalog);
  return {
    lines: result.price.lines,
    total: result.price.total,
    depositPct,
    deposit: result.price.deposit,
    balance: result.price.balance,
    taxLabel: catalog.pricing.taxLabel,
    taxPct: catalog.pricing.taxPct,
    currency: result.price.currency,
  };
}

const COMBINED_LABELS: Record<string, string> = { materials: 'Materials', labour: 'Labour', overhead: 'Workshop overhead', margin: 'Margin', discount: 'Discount', rounding: 'Rounding' };

/**
 * The price of several lines taken together (the quote's recommended choice): their price lines added by kind, the
 * total their sum, the deposit the percentage of it (to the cent, as at acceptance).
 */
export function combinedPricing(pricings: readonly QuotePricing[], depositPct: number): QuotePricing {
  if (pricings.length === 1) return pricings[0]!;
  const first = pricings[0]!;
  const cents = (x: string) => Math.round(Number(x) * 100);
  const lines: QuotePricing['lines'] = [];
  for (const p of pricings) {
    for (const l of p.lines) {
      const at = lines.findIndex((x) => x.code === l.code);
      if (at < 0) lines.push({ ...l });
      else {
        const same = lines[at]!.label === l.label;
        lines[at] = { code: l.code, label: same ? l.label : l.code === 'tax' ? first.taxLabel : (COMBINED_LABELS[l.code] ?? l.label), amount: ((cents(lines[at]!.amount) + cents(l.amount)) / 100).toFixed(2) };
      }
    }
  }
  const total = (pricings.reduce((t, p) => t + cents(p.total), 0) / 100).toFixed(2);
  const figures = agreedFigures({ total, depositPct, extras: [] }, []);
  return { lines, total, depositPct, deposit: figures.deposit, balance: figures.balance, taxLabel: first.taxLabel, taxPct: first.taxPct, currency: first.currency };
}

/**
 * The price a quote shows: its own (the recommended choice) until accepted; once a quote of several lines is
 * accepted, the chosen lines' price added up. Also the lines it is the price of.
 */
export function shownPricing(quote: Pick<Quote, 'pricing' | 'depositPct'>, lines: readonly QuoteLine[]): { pricing: QuotePricing; lines: QuoteLine[] } {
  const chosen = lines.filter((l) => l.chosen);
  if (lines.length > 1 && chosen.length > 0) return { pricing: combinedPricing(chosen.map((l) => l.pricing), Number(quote.depositPct)), lines: chosen };
  return { pricing: quote.pricing, lines: lines.length > 1 ? lines.filter((l) => l.recommended) : [...lines] };
}

export function withTax(price: string, taxPct: number): string {
  return money(price).plus(percentOf(price, taxPct)).toFixed(2);
}

/** The total, deposit and balance once the customer has chosen which extras they take. */
export function acceptedAmounts(q: Pick<Quote, 'total' | 'extras' | 'depositPct'>, extraIds: readonly string[]): AgreedFigures {
  return agreedFigures({ total: Number(q.total).toFixed(2), depositPct: Number(q.depositPct), extras: q.extras }, extraIds);
}

/** What the customer agreed to, from an accepted quote's record (null before acceptance). */
export function agreedOf(q: Quote): AgreedFigures | null {
  if (q.acceptedTotal === null || q.acceptedDeposit === null) return null;
  const figures = acceptedAmounts(q, q.acceptedExtras ?? []);
  // The stored figures are what was agreed; the recomputation only supplies the extras and their hours.
  const total = Number(q.acceptedTotal).toFixed(2);
  const deposit = Number(q.acceptedDeposit).toFixed(2);
  return { ...figures, total, deposit, balance: money(total).minus(money(deposit)).toFixed(2) };
}

/** The agreement a piece has: the chosen line of an accepted quote naming it, with that quote (null if none). */
