/**
 * Decimal money: amounts are decimal.js values inside and decimal strings outside. Never floating point.
 */
import Decimal from 'decimal.js';

/** A money amount or any other exact decimal. */
export type Money = Decimal;

/** What a money amount may be read from: a decimal string (preferred), an integer, or another Money. */
export type MoneyInput = string | number | Decimal;

/** Thrown when a value cannot be read as an exact decimal amount. */
export class MoneyError extends Error {
  constructor(value: unknown) {
    super(`Cannot read ${JSON.stringify(String(value))} as a decimal amount`);
    this.name = 'MoneyError';
  }
}

/**
 * Reads a decimal amount. Strings are read exactly; numbers only when they are safe integers or have a short
 * decimal expansion (prices should arrive as strings).
 *
 * @example money('12.50').toFixed(2) // "12.50"
 */
export function money(value: MoneyInput): Money {
  if (value instanceof Decimal) return value;
  if (typeof value === 'number' && !Number.isFinite(value)) throw new MoneyError(value);
  if (typeof value === 'string' && !/^-?(\d+(\.\d*)?|\.\d+)$/.test(value.trim())) throw new MoneyError(value);
  return new Decimal(typeof value === 'string' ? value.trim() : String(value));
}

/** Zero. */
export const ZERO: Money = new Decimal(0);

/**
 * Adds amounts exactly.
 *
 * @example sumMoney(['0.10', '0.20']).toString() // "0.3"
 */
export function sumMoney(values: readonly MoneyInput[]): Money {
  return values.reduce<Money>((total, v) => total.plus(money(v)), ZERO);
}

/**
 * A percentage of an amount, exact (not rounded).
 *
 * @example percentOf('200', 20).toString() // "40"
 */
export function percentOf(amount: MoneyInput, pct: number | string): Money {
  return money(amount).times(money(pct)).dividedBy(100);
}

/**
 * Rounds to a step (0.01, 1, 5, ...) half away from zero.
 *
 * @example roundToStep('12.345', '0.01').toFixed(2) // "12.35"
 * @example roundToStep('1232.50', '5').toFixed(2) // "1235.00"
 */
export function roundToStep(amount: MoneyInput, step: MoneyInput): Money {
  const s = money(step);
  if (s.lte(0)) throw new MoneyError(step);
  return money(amount).dividedBy(s).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).times(s);
}

/**
 * Rounds to cents (half away from zero).
 *
 * @example toCents('1.005').toFixed(2) // "1.01"
 */
export function toCents(amount: MoneyInput): Money {
  return money(amount).toDecimalPlaces(2, Decimal.ROUND_HALF_UP);
}

/**
 * The decimal string of an amount in cents, always two decimals.
 *
 * @example formatAmount(money('3')) // "3.00"
 */
export function formatAmount(amount: MoneyInput): string {
  return toCents(amount).toFixed(2);
}

/**
 * Integer count of ten-thousandths of a unit, for exact comparisons in searches.
 *
 * @example toMinorUnits('0.125') // 1250
 */
export function toMinorUnits(amount: MoneyInput): number {
  return money(amount).times(10_000).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber();
}
