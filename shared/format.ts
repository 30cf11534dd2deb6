/**
 * The one place figures become words: money with its currency, quantities with their units, hours, percentages and
 * dates. The client's pages, the server's messages, the quote PDF and the e-mails all format through here, so the
 * same amount reads the same everywhere. Money never passes through a float: Intl formats the decimal string itself.
 */
import Decimal from 'decimal.js';

/** The typographic minus sign (U+2212), the one the product writes. */
export const MINUS = '\u2212';

const LOCALE = 'en-GB';

const moneyFormats = new Map<string, Intl.NumberFormat | null>();

function moneyFormat(currency: string, exact: boolean): Intl.NumberFormat | null {
  const code = currency.trim().toUpperCase();
  const key = `${code}|${exact}`;
  if (!moneyFormats.has(key)) {
    try {
      moneyFormats.set(key, new Intl.NumberFormat(LOCALE, { style: 'currency', currency: code, ...(exact ? { minimumFractionDigits: 2, maximumFractionDigits: 4 } : {}) }));
    } catch {
      moneyFormats.set(key, null);
    }
  }
  return moneyFormats.get(key)!;
}

function decimalOf(amount: string | number | Decimal): Decimal | null {
  try {
    const d = new Decimal(typeof amount === 'string' ? amount.trim() : amount);
    return d.isFinite() ? d : null;
  } catch {
    return null;
  }
}

export interface MoneyFormat {
  /**
   * Keep up to four decimals (a unit price of 0.045 stays £0.045) instead of rounding to the currency's cents.
   * Totals, deposits and lines use the default.
   */
  exact?: boolean;
}

/**
 * A decimal amount in its currency, with thousands separators and the typographic minus.
 *
 * @example formatMoney('12345.5', 'GBP') // "£12,345.50"
 * @example formatMoney('0.0450', 'GBP', { exact: true }) // "£0.045"
 */
export function formatMoney(amount: string | number | Decimal, currency: string, opts: MoneyFormat = {}): string {
  const value = decimalOf(amount);
  if (!value) return `${String(amount)} ${currency}`.trim();
  const fmt = moneyFormat(currency, opts.exact ?? false);
  if (!fmt) return `${value.toFixed(2)} ${currency}`.trim().replace(/^-/, MINUS);
  const digits = fmt.resolvedOptions().maximumFractionDigits ?? 2;
  const shown = value.toDecimalPlaces(digits, Decimal.ROUND_HALF_UP);
  return fmt.format(shown.toFixed() as Intl.StringNumericLiteral).replace(/^-/, MINUS);
}

/** A signed money change ("+£12.00", "−£3.50", "£0.00"). */
export function formatMoneyDelta(amount: string, currency: string): string {
  const value = decimalOf(amount);
  if (!value || value.isZero()) return formatMoney('0', currency);
  return value.isNegative() ? formatMoney(amount, currency) : `+${formatMoney(amount, currency)}`;
}

const numberFormats = new Map<string, Intl.NumberFormat>();

/** A number with thousands separators and at most `maxDigits` decimals (at least `minDigits`). */
export function formatNumber(value: number, maxDigits = 2, minDigits = 0): string {
  if (!Number.isFinite(value)) return '–';
  const key = `${minDigits}|${maxDigits}`;
  let fmt = numberFormats.get(key);
  if (!fmt) {
    fmt = new Intl.NumberFormat(LOCALE, { minimumFractionDigits: minDigits, maximumFractionDigits: maxDigits });
    numberFormats.set(key, fmt);
  }
  return fmt.format(value);
}

/** A quantity with its unit: "1,250 g", "3.5 L". */
export function formatQuantity(value: number, unit: string, maxDigits = 2): string {
  return `${formatNumber(value, maxDigits)} ${unit}`;
}

/**
 * Hours with their unit. By default up to two decimals ("46.5 h"); `fixed` gives exactly that many ("46.0 h").
 */
export function formatHours(hours: number, opts: { fixed?: number } = {}): string {
  return opts.fixed === undefined ? formatQuantity(hours, 'h') : `${formatNumber(hours, opts.fixed, opts.fixed)} h`;
}

/** "1 day", "3 days". */
export function formatDays(days: number): string {
  return `${formatNumber(days)} ${days === 1 ? 'day' : 'days'}`;
}

/** "3 estimates", "1 estimate". */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString(LOCALE)} ${n === 1 ? one : many}`;
}

/** A percentage: "30%". */
export function formatPercent(pct: number): string {
  return `${formatNumber(pct)}%`;
}

/** A change in percent with its sign, from a decimal string: "+8.7 %", "−5.0 %", "0.0 %". */
export function formatChange(pct: string): string {
  const n = Number(pct);
  return `${n > 0 ? '+' : n < 0 ? MINUS : ''}${pct.replace(/^-/, '')} %`;
}

/** A signed number with its unit ("+3.7 h", "−2 days", "0 h"). */
export function formatDelta(delta: number, unit: string, digits = 1): string {
  if (delta === 0) return `0 ${unit}`;
  return `${delta > 0 ? '+' : MINUS}${formatNumber(Math.abs(delta), digits)} ${unit}`;
}

const DATE_ONLY = /^(\d{4})-(\d{2})-(\d{2})$/;
const dateFormats = {
  short: new Intl.DateTimeFormat(LOCALE, { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' }),
  long: new Intl.DateTimeFormat(LOCALE, { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' }),
};

/**
 * A calendar date ('YYYY-MM-DD') in words, the same day wherever it is read: "12 Mar 2027", or "12 March 2027"
 * with `month: 'long'`. An instant (a timestamp) is shown on its UTC day; anything unreadable is shown as given.
 */
export function formatDate(value: string | Date, opts: { month?: 'short' | 'long' } = {}): string {
  const fmt = dateFormats[opts.month ?? 'short'];
  if (value instanceof Date) return Number.isNaN(value.getTime()) ? '' : fmt.format(value);
  const m = DATE_ONLY.exec(value.trim());
  const t = m ? Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : new Date(value).getTime();
  return Number.isNaN(t) ? value : fmt.format(t);
}

const localFormats = {
  day: new Intl.DateTimeFormat(LOCALE, { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' }),
  longDay: new Intl.DateTimeFormat(LOCALE, { weekday: 'short', day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' }),
};

/** A workshop-local date or date-time ("2026-12-07" or "2026-12-07T08:00") read as written, never shifted by a zone. */
function localInstant(local: string): number {
  return Date.parse(`${local.length === 10 ? `${local}T00:00` : local.slice(0, 16)}:00Z`);
}

/** A workshop-local day: "Mon 7 Dec". */
export function formatDay(local: string): string {
  return localFormats.day.format(localInstant(local));
}

/** A workshop-local day with its year: "Mon, 7 Dec 2026". */
export function formatLongDay(local: string): string {
  return localFormats.longDay.format(localInstant(local));
}

/** A workshop-local date-time: "Mon 7 Dec, 08:00"; a dash when there is none. */
export function formatDayTime(local: string | null): string {
  if (!local) return '\u2014';
  return `${formatDay(local)}, ${local.slice(11, 16)}`;
}

/** Hands-on time with its unit: "7.5 h", or "45 min" below an hour. */
export function formatWorkTime(hours: number): string {
  if (hours > 0 && hours < 1) return `${Math.round(hours * 60)} min`;
  return formatHours(hours);
}

/** A rest between coats: hours up to two days, days beyond ("26.4 h", "7.7 days"); "none" for no rest. */
export function formatRest(hours: number): string {
  if (hours <= 0) return 'none';
  return hours < 48 ? formatWorkTime(hours) : `${formatNumber(hours / 24, 1)} days`;
}

/** A duration in minutes: "1 day 3 h 20 min". */
export function formatDuration(min: number): string {
  const days = Math.floor(min / 1440);
  const h = Math.floor((min % 1440) / 60);
  const m = Math.round(min % 60);
  return [days ? plural(days, 'day') : '', h ? `${h} h` : '', m ? `${m} min` : ''].filter(Boolean).join(' ') || '0 min';
}
