/**
 * Display formats that need no unit library (so that list pages stay light): money, hours, days and dates.
 * Every figure leaves here with its unit.
 */

const symbols = new Map<string, string>();

function currencySymbol(currency: string): string {
  let s = symbols.get(currency);
  if (s === undefined) {
    try {
      s = new Intl.NumberFormat('en-GB', { style: 'currency', currency }).formatToParts(0).find((p) => p.type === 'currency')?.value ?? `${currency} `;
    } catch {
      s = `${currency} `;
    }
    symbols.set(currency, s);
  }
  return s;
}

/**
 * A decimal money string with its currency symbol and thousands separators, without going through floating point.
 *
 * @example formatMoney('12345.5', 'GBP') // "£12,345.50"
 */
export function formatMoney(amount: string, currency: string): string {
  const negative = amount.trim().startsWith('-');
  const [whole = '0', frac = ''] = amount.trim().replace(/^[-+]/, '').split('.');
  const grouped = whole.replace(/^0+(?=\d)/, '').replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  const cents = `${frac}00`.slice(0, 2);
  return `${negative ? '−' : ''}${currencySymbol(currency)}${grouped}.${cents}`;
}

/** A signed money change ("+£12.00", "−£3.50", "£0.00"). */
export function formatMoneyDelta(amount: string, currency: string): string {
  const zero = /^-?0*(\.0*)?$/.test(amount.trim());
  if (zero) return formatMoney('0', currency);
  return amount.trim().startsWith('-') ? formatMoney(amount, currency) : `+${formatMoney(amount, currency)}`;
}

/** Hours to a tenth. */
export function formatHours(hours: number): string {
  return `${hours.toLocaleString('en-GB', { minimumFractionDigits: 1, maximumFractionDigits: 1 })} h`;
}

export function formatDays(days: number): string {
  return `${days} ${days === 1 ? 'day' : 'days'}`;
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;
}

/** A signed number with its unit ("+3.7 h"). */
export function formatDelta(delta: number, unit: string, digits = 1): string {
  const text = Math.abs(delta).toLocaleString('en-GB', { maximumFractionDigits: digits, minimumFractionDigits: 0 });
  if (delta === 0) return `0 ${unit}`;
  return `${delta > 0 ? '+' : '−'}${text} ${unit}`;
}

function toDate(text: string): Date {
  // Local date-times from the engine carry no zone: read them as they are written.
  return /^\d{4}-\d{2}-\d{2}$/.test(text) ? new Date(`${text}T00:00:00`) : new Date(text);
}

export function formatDate(text: string): string {
  const d = toDate(text);
  return Number.isNaN(d.getTime()) ? text : d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric' });
}

export function formatDateTime(text: string): string {
  const d = toDate(text);
  return Number.isNaN(d.getTime()) ? text : d.toLocaleString('en-GB', { weekday: 'short', day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' });
}

export function formatWhen(text: string): string {
  const d = toDate(text);
  return Number.isNaN(d.getTime()) ? text : d.toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
}

/** Today as a local date (YYYY-MM-DD). */
export function todayLocal(): string {
  const d = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}
