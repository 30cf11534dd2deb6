import Decimal from 'decimal.js';

export type Direction = 'up' | 'down' | 'same';

export interface TotalChange {
  /** New minus old, as a decimal string with two places. */
  amount: string;
  /** The change in percent of the old total, to one place; null when the old total was zero. */
  pct: string | null;
  direction: Direction;
}

/** How a total moves from old to new, worked out in decimals (never floats). */
export function totalChange(oldTotal: string, newTotal: string): TotalChange {
  const before = new Decimal(oldTotal);
  const diff = new Decimal(newTotal).minus(before);
  const rounded = diff.toDecimalPlaces(2, Decimal.ROUND_HALF_UP);
  const direction: Direction = rounded.isZero() ? 'same' : rounded.isPositive() ? 'up' : 'down';
  const pct = before.isZero() ? null : diff.dividedBy(before).times(100).toDecimalPlaces(1, Decimal.ROUND_HALF_UP).toFixed(1);
  return { amount: direction === 'same' ? '0.00' : rounded.toFixed(2), pct: pct === '-0.0' ? '0.0' : pct, direction };
}

/** The sum of decimal strings. */
export function sumTotals(values: readonly string[]): string {
  return values.reduce((acc, v) => acc.plus(v), new Decimal(0)).toFixed(2);
}
