/**
 * The owner's reports: quotes (sent, opened, accepted, declined, expired by month, how many turn into work and how
 * long customers take to answer), money (invoiced and received by month, held against work not yet done, owed by
 * age, with the accounting export), capacity (the drying room and polishers' hours by week, behind and ahead) and
 * estimates against the bench by finishing system and piece kind. Each for a chosen period, each chart with its
 * table beside it, each downloadable as CSV.
 */
import { Download } from 'lucide-react';
import { Link } from 'react-router-dom';
import { lazy, Suspense, useCallback, useState, type ReactNode } from 'react';
import type { CapacityWeek, HeldDeposit, MoneyMonth, MoneyReport, QuoteMonth } from '@shared/schemas/reports';
import type { EstimateAccuracyRow } from '@shared/schemas/stock';
import { Alert } from '@/components/alert';
import { Card, PageHeader } from '@/components/card';
import { DataTable, type Column } from '@/components/data-table';
import { Spinner } from '@/components/spinner';
import { paths } from '@/config/paths';
import { formatDate, formatMoney, todayIso } from '@/lib/format';
import { useLocalTable } from '@/lib/use-local-table';
import { csvHref, useAccuracyReport, useCapacityReport, useMoneyReport, useQuotesReport, type PeriodParams } from '../api/reports';
import { monthLabel, num, pctText, weekLabel } from '../components/labels';
import { PeriodPicker } from '../components/period-picker';

const QuotesChart = lazy(() => import('../components/quotes-chart'));
const CapacityChart = lazy(() => import('../components/capacity-chart'));
const MoneyChart = lazy(() => import('../components/money-chart'));

function shift(date: string, days: number): string {
  const d = new Date(`${date}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

function CsvLink({ href, what, text = 'CSV' }: { href: string; what: string; text?: string }) {
  return (
    <a href={href} download className="inline-flex items-center gap-1.5 rounded-md border border-walnut-200 bg-white px-2.5 py-1 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
      <Download className="h-3.5 w-3.5" aria-hidden /> {text}
      <span className="sr-only"> of {what}</span>
    </a>
  );
}

function Figure({ label, value, note }: { label: string; value: string; note?: string }) {
  return (
    <div className="rounded-xl border border-parchment-200 bg-white px-4 py-3 shadow-card">
      <p className="text-xs font-semibold tracking-wide text-walnut-500 uppercase">{label}</p>
      <p className="num text-lg font-semibold text-walnut-900">{value}</p>
      {note && <p className="text-xs text-walnut-500">{note}</p>}
    </div>
  );
}

/** A chart and its table side by side on a wide screen, one under the other on a phone. */
function ChartAndTable({ chart, table }: { chart: ReactNode; table: ReactNode }) {
  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
      <div className="min-w-0">
        <Suspense fallback={<Spinner label="Drawing the chart…" />}>{chart}</Suspense>
      </div>
      <div className="min-w-0">{table}</div>
    </div>
  );
}

const quoteColumns: Column<QuoteMonth>[] = [
  { key: 'month', header: 'Month', sortKey: 'month', render: (m) => monthLabel(m.month) },
  { key: 'sent', header: 'Sent', sortKey: 'sent', align: 'right', render: (m) => m.sent },
  { key: 'opened', header: 'Opened', sortKey: 'opened', align: 'right', render: (m) => m.opened },
  { key: 'accepted', header: 'Accepted', sortKey: 'accepted', align: 'right', render: (m) => m.accepted },
  { key: 'declined', header: 'Declined', sortKey: 'declined', align: 'right', render: (m) => m.declined },
  { key: 'expired', header: 'Expired', sortKey: 'expired', align: 'right', render: (m) => m.expired },
];

function QuotesSection() {
  const today = todayIso();
  const [period, setPeriod] = useState<PeriodParams>({ from: `${shift(today, -150).slice(0, 7)}-01`, to: today });
  const q = useQuotesReport(period, true);
  const value = useCallback((m: QuoteMonth, key: string) => m[key as keyof QuoteMonth] as string | number, []);
  const table = useLocalTable(q.data?.months ?? [], { sort: 'month', pageSize: 12, value });
  return (
    <Card title="Quotes" actions={<CsvLink href={csvHref('quotes', period)} what="quotes by month" />}>
      <div className="space-y-4">
        <PeriodPicker label="quotes" value={period} onChange={setPeriod} />
        {q.isPending ? (
          <Spinner label="Counting quotes…" />
        ) : q.isError ? (
          <Alert tone="error" title="The quotes report could not be loaded">{q.error.message}</Alert>
        ) : (
          <>
            <div className="grid grid-cols-1 gap-3 sm:grid-cols-3">
              <Figure label="Sent in the period" value={String(q.data.totals.sent)} note={`${q.data.totals.accepted} accepted · ${q.data.totals.declined} declined · ${q.data.totals.expired} expired`} />
              <Figure label="Turned into work" value={pctText(q.data.conversionPct)} note="of the quotes sent in the period, accepted" />
              <Figure
                label="Time to answer"
                value={q.data.decide.medianDays === null ? '—' : `${num(q.data.decide.medianDays)} days`}
                note={q.data.decide.answered ? `median of ${q.data.decide.answered} answers; mean ${num(q.data.decide.meanDays!)} days` : 'no answers yet'}
              />
            </div>
            <ChartAndTable
              chart={<QuotesChart months={q.data.months} />}
              table={<DataTable caption="Quotes by month" columns={quoteColumns} rowKey={(m) => m.month} {...table} loading={q.isFetching} empty="No months in the period." />}
            />
          </>
        )}
      </div>
    </Card>
  );
}

function CapacitySection() {
  const today = todayIso();
  const [period, setPeriod] = useState<PeriodParams>({ from: shift(today, -28), to: shift(today, 56) });
  const c = useCapacityReport(period, true);
  const unit = c.data?.roomUnit ?? 'bays';
  const columns: Column<CapacityWeek>[] = [
    { key: 'week', header: 'Week from', sortKey: 'week', render: (w) => weekLabel(w.week) },
    { key: 'room', header: `Room (${unit}-days)`, sortKey: 'roomPct', align: 'right', render: (w) => `${num(w.roomBooked)} of ${num(w.roomAvailable)}` },
    { key: 'roomPct', header: 'Room use', sortKey: 'roomPct', align: 'right', render: (w) => <span className={(w.roomPct ?? 0) > 100 ? 'font-semibold text-brick-700' : ''}>{pctText(w.roomPct)}</span> },
    { key: 'hours', header: 'Polisher hours', sortKey: 'polisherPct', align: 'right', render: (w) => `${num(w.polisherHoursBooked)} h of ${num(w.polisherHoursAvailable)} h` },
    { key: 'polisherPct', header: 'Hours use', sortKey: 'polisherPct', align: 'right', render: (w) => <span className={(w.polisherPct ?? 0) > 100 ? 'font-semibold text-brick-700' : ''}>{pctText(w.polisherPct)}</span> },
  ];
  const value = useCallback((w: CapacityWeek, key: string) => w[key as keyof CapacityWeek] as string | number | null, []);
  const table = useLocalTable(c.data?.weeks ?? [], { sort: 'week', pageSize: 13, value });
  return (
    <Card title="Capacity" actions={<CsvLink href={csvHref('capacity', period)} what="capacity by week" />}>
      <div className="space-y-4">
        <PeriodPicker label="capacity" value={period} onChange={setPeriod} />
        {c.isPending ? (
          <Spinner label="Adding up the weeks…" />
        ) : c.isError ? (
          <Alert tone="error" title="The capacity report could not be loaded">{c.error.message}</Alert>
        ) : (
          <>
            <div className="grid grid-cols-1 gap-3 sm:grid-cols-3">
              <Figure label="Weeks behind" value={String(c.data.weeksBehind)} note="before this week" />
              <Figure label="Weeks ahead" value={String(c.data.weeksAhead)} note="this week and after" />
              <Figure
                label="Busiest week"
                value={pctText(Math.max(0, ...c.data.weeks.map((w) => w.roomPct ?? 0)))}
                note={`of the drying room's ${unit}; over 100 % is overbooked`}
              />
            </div>
            <ChartAndTable
              chart={<CapacityChart weeks={c.data.weeks} today={c.data.today} />}
              table={<DataTable caption="Capacity by week" columns={columns} rowKey={(w) => w.week} {...table} loading={c.isFetching} empty="No weeks in the period." />}
            />
          </>
        )}
      </div>
    </Card>
  );
}

type OwedLine = MoneyReport['owed']['rows'][number];
const BUCKET_WORDS: Record<OwedLine['bucket'], string> = { '0-30': 'Up to 30 days', '31-60': '31 to 60 days', '60+': 'Over 60 days' };

function MoneySection() {
  const today = todayIso();
  const [period, setPeriod] = useState<PeriodParams>({ from: `${shift(today, -150).slice(0, 7)}-01`, to: today });
  const m = useMoneyReport(period, true);
  const currency = m.data?.currency ?? 'GBP';
  const money = (a: string) => formatMoney(a, currency);
  const monthColumns: Column<MoneyMonth>[] = [
    { key: 'month', header: 'Month', sortKey: 'month', render: (r) => monthLabel(r.month) },
    { key: 'invoiced', header: 'Invoiced', sortKey: 'invoiced', align: 'right', render: (r) => money(r.invoiced) },
    { key: 'credited', header: 'Credited', sortKey: 'credited', align: 'right', render: (r) => money(r.credited) },
    { key: 'received', header: 'Received', sortKey: 'received', align: 'right', render: (r) => money(r.received) },
    { key: 'refunded', header: 'Refunded', sortKey: 'refunded', align: 'right', render: (r) => money(r.refunded) },
    { key: 'net', header: 'Kept', sortKey: 'net', align: 'right', render: (r) => money(r.net) },
  ];
  const heldColumns: Column<HeldDeposit>[] = [
    { key: 'quote', header: 'Quote', sortKey: 'quoteNumber', render: (r) => r.quoteNumber },
    { key: 'customer', header: 'Customer', sortKey: 'customer', render: (r) => r.customer },
    { key: 'jobs', header: 'Work still to do', render: (r) => (r.openJobs.length ? r.openJobs.join(', ') : 'not planned yet') },
    { key: 'held', header: 'Held', sortKey: 'held', align: 'right', render: (r) => money(r.held) },
    { key: 'agreed', header: 'Agreed', sortKey: 'agreedTotal', align: 'right', render: (r) => money(r.agreedTotal) },
  ];
  const owedColumns: Column<OwedLine>[] = [
    { key: 'invoice', header: 'Invoice', sortKey: 'invoiceNumber', render: (r) => r.invoiceNumber },
    { key: 'customer', header: 'Customer', sortKey: 'customer', render: (r) => r.customer },
    { key: 'on', header: 'Invoiced on', sortKey: 'invoicedOn', render: (r) => formatDate(r.invoicedOn) },
    { key: 'age', header: 'Age', sortKey: 'ageDays', align: 'right', render: (r) => `${r.ageDays} days` },
    { key: 'balance', header: 'Owed', sortKey: 'balance', align: 'right', render: (r) => money(r.balance) },
  ];
  const monthValue = useCallback((r: MoneyMonth, key: string) => r[key as keyof MoneyMonth], []);
  const heldValue = useCallback((r: HeldDeposit, key: string) => (key === 'openJobs' ? r.openJobs.join() : (r[key as keyof HeldDeposit] as string | number | null)), []);
  const owedValue = useCallback((r: OwedLine, key: string) => r[key as keyof OwedLine], []);
  const months = useLocalTable(m.data?.months ?? [], { sort: 'month', pageSize: 12, value: monthValue });
  const held = useLocalTable(m.data?.held.rows ?? [], { sort: 'held', dir: 'desc', pageSize: 10, value: heldValue });
  const owed = useLocalTable(m.data?.owed.rows ?? [], { sort: 'ageDays', dir: 'desc', pageSize: 10, value: owedValue });
  return (
    <Card
      title="Money"
      actions={
        <div className="flex flex-wrap gap-2">
          <CsvLink href={csvHref('money', period)} what="money by month" />
          <CsvLink href={csvHref('accounting', period)} what="invoices, credit notes and payments for the accounts" text="Accounting export" />
        </div>
      }
    >
      <div className="space-y-4">
        <PeriodPicker label="money" value={period} onChange={setPeriod} />
        {m.isPending ? (
          <Spinner label="Adding up the accounts…" />
        ) : m.isError ? (
          <Alert tone="error" title="The money report could not be loaded">{m.error.message}</Alert>
        ) : (
          <>
            <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 xl:grid-cols-4">
              <Figure label="Invoiced in the period" value={money(m.data.totals.invoiced)} note={`less ${money(m.data.totals.credited)} credited; tax included`} />
              <Figure label="Received in the period" value={money(m.data.totals.received)} note={`${money(m.data.totals.refunded)} refunded; ${money(m.data.totals.net)} kept`} />
              <Figure label="Held for work not yet done" value={money(m.data.held.amount)} note={`on ${m.data.held.count} ${m.data.held.count === 1 ? 'agreement' : 'agreements'}, now`} />
              <Figure label="Owed to the workshop" value={money(m.data.owed.total)} note={m.data.owed.buckets.map((b) => `${b.bucket} days: ${money(b.amount)}`).join(' · ')} />
            </div>
            <ChartAndTable
              chart={<MoneyChart months={m.data.months} currency={currency} />}
              table={<DataTable caption="Money by month" columns={monthColumns} rowKey={(r) => r.month} {...months} loading={m.isFetching} empty="No months in the period." />}
            />
            <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
              <div className="min-w-0 space-y-2">
                <h3 className="text-sm font-semibold text-walnut-800">Held against work not yet done</h3>
                <p className="text-xs text-walnut-500">What customers have paid on agreements whose work is not finished (or not planned yet), less refunds. Today&rsquo;s figures, whatever the period.</p>
                <DataTable caption="Money held against work not yet done" columns={heldColumns} rowKey={(r) => r.quoteId} {...held} empty="Nothing is held: no payment waits on unfinished work." />
              </div>
              <div className="min-w-0 space-y-2">
                <h3 className="text-sm font-semibold text-walnut-800">Owed to the workshop, by age</h3>
                <p className="text-xs text-walnut-500">
                  {m.data.owed.buckets.map((b) => `${BUCKET_WORDS[b.bucket]}: ${b.count} (${money(b.amount)})`).join(' · ')}. Today&rsquo;s figures; the full list is on{' '}
                  <Link to={paths.owed} className="font-medium text-walnut-800 underline">Owed to us</Link>.
                </p>
                <DataTable caption="Owed to the workshop by age" columns={owedColumns} rowKey={(r) => r.quoteId} {...owed} empty="Nothing is owed on an invoice." />
              </div>
            </div>
          </>
        )}
      </div>
    </Card>
  );
}

const accuracyColumns: Column<EstimateAccuracyRow>[] = [
  { key: 'month', header: 'Month', sortKey: 'month', render: (r) => monthLabel(r.month) },
  { key: 'system', header: 'Finishing system', sortKey: 'systemName', render: (r) => r.systemName },
  { key: 'kind', header: 'Piece', sortKey: 'pieceKind', render: (r) => r.pieceKind.charAt(0).toUpperCase() + r.pieceKind.slice(1) },
  { key: 'est', header: 'Estimated', sortKey: 'estimatedHours', align: 'right', render: (r) => `${num(r.estimatedHours)} h` },
  { key: 'act', header: 'Actual', sortKey: 'actualHours', align: 'right', render: (r) => `${num(r.actualHours)} h` },
  { key: 'ratio', header: 'Actual ÷ estimated', sortKey: 'ratio', align: 'right', render: (r) => (r.ratio === null ? '—' : `× ${r.ratio.toFixed(2)}`) },
  { key: 'sessions', header: 'Sessions', sortKey: 'sessions', align: 'right', render: (r) => r.sessions },
  {
    key: 'materials',
    header: 'Materials used ÷ estimated',
    sortKey: 'materialsRatio',
    align: 'right',
    render: (r) => (r.materialsRatio === null ? '—' : `× ${r.materialsRatio.toFixed(2)} (${r.actualMaterials} of ${r.estimatedMaterials}, ${r.materialSessions} ${r.materialSessions === 1 ? 'session' : 'sessions'})`),
  },
];

function AccuracySection() {
  const today = todayIso();
  const [period, setPeriod] = useState<PeriodParams>({ from: shift(today, -365), to: today });
  const a = useAccuracyReport(period, true);
  const value = useCallback((r: EstimateAccuracyRow, key: string) => r[key as keyof EstimateAccuracyRow] as string | number | null, []);
  const table = useLocalTable(a.data?.rows ?? [], { sort: 'month', pageSize: 15, value });
  return (
    <Card title="Estimates against the bench" actions={<CsvLink href={csvHref('estimate-accuracy', period)} what="estimated against actual hours" />}>
      <div className="space-y-4">
        <PeriodPicker label="estimate accuracy" value={period} onChange={setPeriod} />
        <p className="text-sm text-walnut-600">
          Hands-on hours and materials (in money, where the session&rsquo;s materials were recorded) of the sessions done, by month, finishing system and piece. Above × 1.00 the estimates fell short. The{' '}
          <Link to={paths.actuals} className="font-medium text-walnut-800 underline">Actuals</Link> page proposes a correction for each finishing system from its own finished jobs, applied only when you confirm it.
        </p>
        {a.isPending ? (
          <Spinner label="Reading the sessions…" />
        ) : a.isError ? (
          <Alert tone="error" title="The report could not be loaded">{a.error.message}</Alert>
        ) : (
          <DataTable caption="Estimated against actual hours" columns={accuracyColumns} rowKey={(r) => `${r.month}-${r.system}-${r.pieceKind}`} {...table} loading={a.isFetching} empty="No session was marked done in the period." />
        )}
      </div>
    </Card>
  );
}

export function ReportsPage() {
  return (
    <div className="space-y-6">
      <PageHeader title="Reports" description="How the business is running: quotes, money, the workshop's capacity and how estimates compare with the bench. Choose a period for each; download any as CSV." />
      <QuotesSection />
      <MoneySection />
      <CapacitySection />
      <AccuracySection />
    </div>
  );
}
