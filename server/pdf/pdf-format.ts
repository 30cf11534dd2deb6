/**
 * Formatting for the customer's PDF documents: money, dates, quantities with units, and text made safe for the
 * embedded Lora font (which lacks a few spaces and symbols).
 */
import Decimal from 'decimal.js';

const moneyFormats = new Map<string, Intl.NumberFormat>();

function moneyFormat(currency: string): Intl.NumberFormat | null {
  const code = currency.trim().toUpperCase();
  let fmt = moneyFormats.get(code);
  if (!fmt) {
    try {
      fmt = new Intl.NumberFormat('en-GB', { style: 'currency', currency: code });
    } catch {
      return null;
    }
    moneyFormats.set(code, fmt);
  }
  return fmt;
}

/**
 * A decimal-string amount in its currency, exactly (no binary rounding).
 *
 * @example formatMoney('4994', 'GBP') // "£4,994.00"
 */
export function formatMoney(amount: string, currency: string): string {
  let value: Decimal;
  try {
    value = new Decimal(amount.trim());
  } catch {
    return `${amount} ${currency}`.trim();
  }
  if (!value.isFinite()) return `${amount} ${currency}`.trim();
  const fmt = moneyFormat(currency);
  if (!fmt) return `${value.toFixed(2)} ${currency}`.trim();
  return fmt.format(value.toFixed() as `${number}`);
}

const numberFormat = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 2 });

/** @example formatNumber(1234.5) // "1,234.5" */
export function formatNumber(value: number): string {
  return Number.isFinite(value) ? numberFormat.format(value) : '–';
}

/** @example formatHours(46.5) // "46.5 h" */
export function formatHours(hours: number): string {
  return `${formatNumber(hours)} h`;
}

/** @example formatDays(1) // "1 day" */
export function formatDays(days: number): string {
  return `${formatNumber(days)} ${days === 1 ? 'day' : 'days'}`;
}

/** @example formatPercent(30) // "30%" */
export function formatPercent(pct: number): string {
  return `${formatNumber(pct)}%`;
}

const longDate = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });

/**
 * A local 'YYYY-MM-DD' date in words; anything else is shown as given.
 *
 * @example formatDate('2027-03-12') // "12 March 2027"
 */
export function formatDate(iso: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso.trim());
  if (!m) return iso;
  const t = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
  return Number.isNaN(t) ? iso : longDate.format(t);
}

/** Characters Lora has no glyph for, and what to draw instead. */
const REPLACEMENTS: Record<string, string> = {
  '\u2002': '\u00a0',
  '\u2003': '\u00a0',
  '\u2004': '\u00a0',
  '\u2005': '\u00a0',
  '\u2006': '\u00a0',
  '\u2007': '\u00a0',
  '\u2008': '\u00a0',
  '\u2009': '\u00a0',
  '\u200a': '\u00a0',
  '\u202f': '\u00a0',
  '\u2010': '-',
  '\u2011': '-',
  '\u2212': '-',
  '\u2192': '->',
  '\u2190': '<-',
  '\u2713': '',
  '\u2714': '',
  '\u26a0': '',
  '\t': ' ',
};

/**
 * Text ready for the PDF: Windows line ends folded, control characters and zero-width marks dropped, spaces and
 * symbols the font lacks replaced.
 */
export function pdfText(text: string | null | undefined): string {
  if (!text) return '';
  return text
    .replace(/\r\n?/g, '\n')
    .replace(/[\u2002-\u200a\u202f\u2010\u2011\u2212\u2190\u2192\u2713\u2714\u26a0\t]/g, (ch) => REPLACEMENTS[ch] ?? '')
    .split('')
    .filter((ch) => !isInvisible(ch.charCodeAt(0)))
    .join('');
}

/** Control characters (other than the line feed) and zero-width marks, which would draw as boxes. */
function isInvisible(code: number): boolean {
  return (code < 0x20 && code !== 0x0a) || code === 0x7f || (code >= 0x200b && code <= 0x200d) || code === 0x2060 || code === 0xfeff;
}

/** Paragraphs of a multi-line message: split on blank lines, inner line breaks kept, empty ones dropped. */
export function paragraphs(text: string): string[] {
  return pdfText(text)
    .split(/\n\s*\n/)
    .map((p) => p.replace(/[ \u00a0]+\n/g, '\n').trim())
    .filter((p) => p.length > 0);
}
