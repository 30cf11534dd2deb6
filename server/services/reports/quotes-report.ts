/**
 * Quotes by month for a period: sent, opened by the customer, accepted, declined and expired (each counted in the
 * month it happened; an expiry on the quote's last valid day), the share of the period's sent quotes that were
 * accepted, and how long customers took to answer.
 */
import { QueryTypes } from 'sequelize';
import type { Period } from '@shared/schemas/reports';
import type { QuoteMonth, QuotesReport } from '@shared/schemas/reports';
import { Quote } from '../../models';

/** Every month from the period's first to its last, as YYYY-MM. */
export function monthsOf(from: string, to: string): string[] {
  const out: string[] = [];
  let y = Number(from.slice(0, 4));
  let m = Number(from.slice(5, 7));
  const last = to.slice(0, 7);
  for (;;) {
    const key = `${y}-${String(m).padStart(2, '0')}`;
    out.push(key);
    if (key >= last) break;
    m++;
    if (m > 12) {
      m = 1;
      y++;
    }
  }
  return out;
}

function median(values: number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

const oneDecimal = (n: number) => Math.round(n * 10) / 10;

export async function quotesReport(p: Period): Promise<QuotesReport> {
  const sequelize = Quote.sequelize!;
  const replacements = { from: p.from, to: p.to };
  const inPeriod = (col: string) => `${col} >= CAST(:from AS date) AND ${col} < CAST(:to AS date) + 1`;
  const count = async (col: string, where = 'TRUE') =>
    sequelize.query<{ month: string; n: string }>(
      `SELECT to_char(${col}, 'YYYY-MM') AS month, count(*) AS n FROM quotes WHERE ${inPeriod(col)} AND ${where} GROUP BY 1`,
      { replacements, type: QueryTypes.SELECT },
    );
  const [sent, opened, accepted, declined, expired] = await Promise.all([
    count('sent_at'),
    count('viewed_at'),
    count('accepted_at'),
    count('declined_at'),
    // Unanswered past its date: expired, whether or not the nightly sweep has marked it yet.
    count('valid_until', `(state = 'expired' OR (state IN ('quoted', 'viewed') AND valid_until < current_date))`),
  ]);
  const months: QuoteMonth[] = monthsOf(p.from, p.to).map((month) => {
    const of = (rows: { month: string; n: string }[]) => Number(rows.find((r) => r.month === month)?.n ?? 0);
    return { month, sent: of(sent), opened: of(opened), accepted: of(accepted), declined: of(declined), expired: of(expired) };
  });
  const totals = months.reduce((t, m) => ({ sent: t.sent + m.sent, opened: t.opened + m.opened, accepted: t.accepted + m.accepted, declined: t.declined + m.declined, expired: t.expired + m.expired }), { sent: 0, opened: 0, accepted: 0, declined: 0, expired: 0 });
  const cohort = await sequelize.query<{ sent: string; won: string }>(
    `SELECT count(*) AS sent, count(accepted_at) AS won FROM quotes WHERE ${inPeriod('sent_at')}`,
    { replacements, type: QueryTypes.SELECT },
  );
  const decided = await sequelize.query<{ days: string }>(
    `SELECT EXTRACT(EPOCH FROM (COALESCE(accepted_at, declined_at) - sent_at)) / 86400 AS days
       FROM quotes WHERE ${inPeriod('sent_at')} AND COALESCE(accepted_at, declined_at) IS NOT NULL`,
    { replacements, type: QueryTypes.SELECT },
  );
  const days = decided.map((d) => Math.max(0, Number(d.days)));
  const sentN = Number(cohort[0]?.sent ?? 0);
  return {
    from: p.from,
    to: p.to,
    months,
    totals,
    conversionPct: sentN === 0 ? null : oneDecimal((Number(cohort[0]!.won) / sentN) * 100),
    decide: {
      answered: days.length,
      medianDays: days.length ? oneDecimal(median(days)!) : null,
      meanDays: days.length ? oneDecimal(days.reduce((t, d) => t + d, 0) / days.length) : null,
    },
  };
}
