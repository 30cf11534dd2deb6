/** Display formatting shared by the owner's pages: money with its currency, percentages, dates. */

const moneyFormats = new Map<string, Intl.NumberFormat>();

/**
 * A decimal string as money in the workshop's currency, without passing through a float: Intl formats the string
 * itself ("11.4000" → "£11.40"; "0.0450" → "£0.045").
 */
export function formatMoney(amount: string, currency: string): string {
  let fmt = moneyFormats.get(currency);
  if (!fmt) {
    fmt = new Intl.NumberFormat('en-GB', { style: 'currency', currency, minimumFractionDigits: 2, maximumFractionDigits: 4 });
    moneyFormats.set(currency, fmt);
  }
  // One minus sign everywhere: the typographic one (U+2212), as the estimate pages write it.
  return fmt.format(amount as Intl.StringNumericLiteral).replace(/^-/, '\u2212');
}

/** A change in percent with its sign: "+8.7 %", "−5.0 %", "0.0 %". */
export function formatChange(pct: string): string {
  const n = Number(pct);
  return `${n > 0 ? '+' : n < 0 ? '\u2212' : ''}${pct.replace(/^-/, '')} %`;
}

export function formatDate(iso: string): string {
  return new Date(iso.length === 10 ? `${iso}T12:00:00Z` : iso).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}

export function formatDateTime(iso: string): string {
  return new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
}

/** Today as YYYY-MM-DD in the user's own calendar. */
export function todayIso(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}
