/**
 * The money report and the accounting export, read from the accounts' own tables (`account_documents`,
 * `account_entries`; see docs/accounts.md) so they can never disagree with a customer's account:
 *
 * - by month of the period: tax invoices issued and credit notes against them (on the day issued, in the workshop's
 *   time zone), payments received and refunds made (on the day received), and what was kept (received − refunded);
 * - now: money held against work not yet done (what was received on agreements with a job still to finish, or not
 *   yet planned), and what customers owe on their invoices by age, from the same query as the "Owed to us" list;
 * - the accounting export: one line a tax invoice, credit note, payment or refund of the period, credit notes and
 *   refunds negative, for the workshop's bookkeeping.
 *
 * All money is decimal, summed by PostgreSQL's numeric and sent as strings.
 */
import Decimal from 'decimal.js';
import { QueryTypes } from 'sequelize';
import { sumMoney } from '@shared/money';
import { PAYMENT_METHOD_LABELS, type PaymentMethod } from '@shared/schemas/accounts';
import { localToday } from '@shared/schemas/dates';
import type { AccountingLine, HeldDeposit, MoneyMonth, MoneyReport, Period } from '@shared/schemas/reports';
import { DEFAULT_TIME_ZONE } from '@shared/time';
import { Quote } from '../../models';
import { listOwed } from '../accounts';
import { loadSettings } from '../catalog';
import { monthsOf } from './quotes-report';

const fixed = (v: Decimal.Value | null | undefined) => new Decimal(v ?? 0).toDecimalPlaces(2, Decimal.ROUND_HALF_UP).toFixed(2);

/** How many held agreements and owed invoices the report lists (the figures count them all). */
export const MONEY_ROWS = 200;

async function zoneAndCurrency(): Promise<{ tz: string; currency: string }> {
  const { settings } = await loadSettings();
  return { tz: settings.timeZone ?? DEFAULT_TIME_ZONE, currency: settings.pricing.currency };
}

/** Documents' local day: the moment issued, in the workshop's time zone. */
const issuedDay = `(d.issued_at AT TIME ZONE :tz)::date`;

export async function moneyReport(p: Period): Promise<MoneyReport> {
  const sequelize = Quote.sequelize!;
  const { tz, currency } = await zoneAndCurrency();
  const replacements = { from: p.from, to: p.to, tz, currency };
  const [docs, entries] = await Promise.all([
    sequelize.query<{ month: string; kind: string; amount: string }>(
      `SELECT to_char(${issuedDay}, 'YYYY-MM') AS month, d.kind, sum(d.total) AS amount
         FROM account_documents d
        WHERE d.kind IN ('invoice', 'credit-note') AND d.currency = :currency
          AND ${issuedDay} BETWEEN CAST(:from AS date) AND CAST(:to AS date)
        GROUP BY 1, 2`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ month: string; kind: string; amount: string }>(
      `SELECT to_char(e.received_on, 'YYYY-MM') AS month, e.kind, sum(e.amount) AS amount
         FROM account_entries e
        WHERE e.currency = :currency AND e.received_on BETWEEN CAST(:from AS date) AND CAST(:to AS date)
        GROUP BY 1, 2`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  const of = (rows: { month: string; kind: string; amount: string }[], month: string, kind: string) => rows.find((r) => r.month === month && r.kind === kind)?.amount ?? '0';
  const months: MoneyMonth[] = monthsOf(p.from, p.to).map((month) => {
    const received = of(entries, month, 'payment');
    const refunded = of(entries, month, 'refund');
    return {
      month,
      invoiced: fixed(of(docs, month, 'invoice')),
      credited: fixed(of(docs, month, 'credit-note')),
      received: fixed(received),
      refunded: fixed(refunded),
      net: fixed(new Decimal(received).minus(refunded)),
    };
  });
  const sum = (k: keyof Omit<MoneyMonth, 'month'>) => sumMoney(months.map((m) => m[k])).toFixed(2);
  const totals = { invoiced: sum('invoiced'), credited: sum('credited'), received: sum('received'), refunded: sum('refunded'), net: sum('net') };

  const [held, owedPage] = await Promise.all([heldDeposits(currency), listOwed({ sort: 'age', dir: 'desc', page: 1, pageSize: 100 })]);
  const buckets = (['0-30', '31-60', '60+'] as const).map((bucket) => {
    const b = owedPage.buckets.filter((x) => x.bucket === bucket && x.currency === currency);
    return { bucket, count: b.reduce((t, x) => t + x.count, 0), amount: sumMoney(b.map((x) => x.amount)).toFixed(2) };
  });
  return {
    from: p.from,
    to: p.to,
    currency,
    months,
    totals,
    held,
    owed: {
      total: sumMoney(buckets.map((b) => b.amount)).toFixed(2),
      buckets,
      rows: owedPage.rows
        .filter((r) => r.currency === currency)
        .map((r) => ({ quoteId: r.quoteId, quoteNumber: r.quoteNumber, invoiceNumber: r.invoiceNumber, invoicedOn: r.invoicedOn, ageDays: r.ageDays, bucket: r.bucket, customer: r.customer.name, balance: r.balance })),
    },
  };
}

/**
 * Money held against work not yet done: on every agreement (an accepted quote, deposit paid or not) with a job not
 * finished or no job yet, what the customer has paid less what was refunded, when above zero.
 */
async function heldDeposits(currency: string): Promise<MoneyReport['held']> {
  const sequelize = Quote.sequelize!;
  const rows = await sequelize.query<{ quote_id: number; quote_number: string; customer: string; agreed: string; held: string; open_jobs: string[] | null; deposit_paid_at: Date | null }>(
    `WITH agreements AS (
       SELECT q.id AS quote_id, q.number AS quote_number, c.name AS customer, q.accepted_total AS agreed, q.deposit_paid_at,
              COALESCE((SELECT sum(e.amount) FROM account_entries e WHERE e.quote_id = q.id AND e.kind = 'payment'), 0)
                - COALESCE((SELECT sum(e.amount) FROM account_entries e WHERE e.quote_id = q.id AND e.kind = 'refund'), 0) AS held,
              (SELECT array_agg(j.number ORDER BY j.id) FROM jobs j WHERE j.quote_id = q.id AND j.state NOT IN ('finished', 'cancelled')) AS open_jobs,
              (SELECT count(*) FROM jobs j WHERE j.quote_id = q.id AND j.state <> 'cancelled') AS live_jobs
         FROM quotes q
         JOIN estimates es ON es.id = q.estimate_id
         JOIN customers c ON c.id = es.customer_id
        WHERE q.state IN ('accepted', 'deposit-paid') AND q.accepted_total IS NOT NULL AND q.currency = :currency)
     SELECT * FROM agreements WHERE held > 0 AND (live_jobs = 0 OR open_jobs IS NOT NULL)
     ORDER BY held DESC, quote_id DESC`,
    { replacements: { currency }, type: QueryTypes.SELECT },
  );
  const list: HeldDeposit[] = rows.map((r) => ({
    quoteId: r.quote_id,
    quoteNumber: r.quote_number,
    customer: r.customer,
    agreedTotal: fixed(r.agreed),
    held: fixed(r.held),
    openJobs: r.open_jobs ?? [],
    depositPaidOn: r.deposit_paid_at ? localToday(new Date(r.deposit_paid_at)) : null,
  }));
  return { count: list.length, amount: sumMoney(list.map((r) => r.held)).toFixed(2), rows: list.slice(0, MONEY_ROWS) };
}

/**
 * The accounting export of a period: every tax invoice and credit note issued and every payment received or refund
 * made, in date order. A payment carries its receipt's number; a refund the credit note it went with.
 */
export async function accountingLines(p: Period): Promise<AccountingLine[]> {
  const sequelize = Quote.sequelize!;
  const { tz } = await zoneAndCurrency();
  const replacements = { from: p.from, to: p.to, tz };
  const [docs, entries] = await Promise.all([
    sequelize.query<{ id: number; kind: 'invoice' | 'credit-note'; number: string; day: string; customer: string; quote_number: string; net: string; tax: string; tax_pct: string; total: string; currency: string; against: string | null }>(
      `SELECT d.id, d.kind, d.number, to_char(${issuedDay}, 'YYYY-MM-DD') AS day, c.name AS customer, q.number AS quote_number,
              d.net, d.tax, d.tax_pct, d.total, d.currency, inv.number AS against
         FROM account_documents d
         JOIN quotes q ON q.id = d.quote_id
         JOIN customers c ON c.id = d.customer_id
         LEFT JOIN account_documents inv ON inv.id = d.invoice_id
        WHERE d.kind IN ('invoice', 'credit-note') AND ${issuedDay} BETWEEN CAST(:from AS date) AND CAST(:to AS date)`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ id: number; kind: 'payment' | 'refund'; day: string; customer: string; quote_number: string; amount: string; currency: string; method: PaymentMethod; reference: string | null; receipt: string | null; credit_note: string | null }>(
      `SELECT e.id, e.kind, to_char(e.received_on, 'YYYY-MM-DD') AS day, c.name AS customer, q.number AS quote_number, e.amount, e.currency,
              e.method, e.reference,
              (SELECT r.number FROM account_documents r WHERE r.entry_id = e.id AND r.kind = 'receipt' ORDER BY r.id LIMIT 1) AS receipt,
              cn.number AS credit_note
         FROM account_entries e
         JOIN quotes q ON q.id = e.quote_id
         JOIN estimates es ON es.id = q.estimate_id
         JOIN customers c ON c.id = es.customer_id
         LEFT JOIN account_documents cn ON cn.id = e.credit_note_id
        WHERE e.received_on BETWEEN CAST(:from AS date) AND CAST(:to AS date)`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  const neg = (v: string) => new Decimal(v).negated().toFixed(2);
  const lines: (AccountingLine & { order: number })[] = [
    ...docs.map((d) => {
      const sign = d.kind === 'credit-note' ? neg : fixed;
      return {
        order: d.kind === 'invoice' ? 0 : 1,
        type: d.kind,
        number: d.number,
        date: d.day,
        customer: d.customer,
        quoteNumber: d.quote_number,
        net: sign(d.net),
        tax: sign(d.tax),
        taxPct: Number(d.tax_pct),
        total: sign(d.total),
        currency: d.currency,
        method: null,
        reference: null,
        against: d.against,
      };
    }),
    ...entries.map((e) => ({
      order: e.kind === 'payment' ? 2 : 3,
      type: e.kind,
      number: e.kind === 'payment' ? e.receipt : e.credit_note,
      date: e.day,
      customer: e.customer,
      quoteNumber: e.quote_number,
      net: null,
      tax: null,
      taxPct: null,
      total: e.kind === 'refund' ? neg(e.amount) : fixed(e.amount),
      currency: e.currency,
      method: PAYMENT_METHOD_LABELS[e.method],
      reference: e.reference || null,
      against: null,
    })),
  ];
  lines.sort((a, b) => a.date.localeCompare(b.date) || a.order - b.order || (a.number ?? '').localeCompare(b.number ?? ''));
  return lines.map(({ order: _order, ...l }) => l);
}
