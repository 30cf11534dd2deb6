/** Display formatting shared by the owner's pages: money with its currency, percentages, dates. */

import { formatDate as formatDay, formatMoney as formatAmount } from '@shared/format';

/** Money formatting and percentages come from the one formatting module (shared/format.ts). */
export { formatChange } from '@shared/format';

/**
 * A decimal string as money in the workshop's currency, keeping up to four decimals for unit prices
 * ("11.4000" → "£11.40"; "0.0450" → "£0.045").
 */
export function formatMoney(amount: string, currency: string): string {
  return formatAmount(amount, currency, { exact: true });
}

export function formatDate(iso: string): string {
  return formatDay(iso);
}

export function formatDateTime(iso: string): string {
  return new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
}

/** Today as YYYY-MM-DD in the workshop's time zone (shared/time.ts). */
export { today as todayIso } from '@shared/time';
