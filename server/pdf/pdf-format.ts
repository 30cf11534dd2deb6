/**
 * Formatting for the customer's PDF documents: money, dates, quantities with units, and text made safe for the
 * embedded Lora font (which lacks a few spaces and symbols).
 */
import { formatDate as formatDay, formatMoney as formatAmount } from '@shared/format';

/** Numbers, hours, days and percentages read as on every other page (shared/format.ts). */
export { formatDays, formatHours, formatNumber, formatPercent } from '@shared/format';

/**
 * A decimal-string amount in its currency, exactly (no binary rounding), as shared/format.ts writes it; the minus is
 * the hyphen, which the embedded font has.
 *
 * @example formatMoney('4994', 'GBP') // "£4,994.00"
 */
export function formatMoney(amount: string, currency: string): string {
  return formatAmount(amount, currency).replace(/\u2212/g, '-');
}

/**
 * A local 'YYYY-MM-DD' date in words; anything else is shown as given.
 *
 * @example formatDate('2027-03-12') // "12 March 2027"
 */
export function formatDate(iso: string): string {
  return /^\d{4}-\d{2}-\d{2}$/.test(iso.trim()) ? formatDay(iso.trim(), { month: 'long' }) : iso;
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
