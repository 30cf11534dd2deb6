const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "2026-11" → "Nov 2026" */
export function monthLabel(month: string): string {
  return `${MONTHS[Number(month.slice(5, 7)) - 1] ?? month} ${month.slice(0, 4)}`;
}

/** "2026-11-30" → "30 Nov" */
export function weekLabel(date: string): string {
  return `${Number(date.slice(8, 10))} ${MONTHS[Number(date.slice(5, 7)) - 1] ?? ''}`;
}

const nf = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });
export const num = (n: number) => nf.format(n).replace(/^-/, '\u2212');
export const pctText = (n: number | null) => (n === null ? '—' : `${num(n)} %`);
