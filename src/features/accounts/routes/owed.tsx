import { Link } from 'react-router-dom';
import { AGEING_BUCKETS, AGEING_LABELS, type AgeingBucket, type OwedRow } from '@shared/schemas/accounts';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { PagedTable } from '@/components/paged-table';
import { pathTo } from '@/config/paths';
import { formatDate, formatMoney } from '@/lib/format';
import { useTableState } from '@/lib/use-table-state';
import { useOwed, useSendReminder, type OwedQuery } from '../api/accounts';
import { InvoiceStageSetting } from '../components/invoice-stage';

const PAGE_SIZE = 25;

/** Sends the customer the balance-due message again, through the message queue; says what happened in the row. */
function ReminderButton({ row }: { row: OwedRow }) {
  const send = useSendReminder(row.quoteId);
  if (send.isSuccess) {
    return (
      <span role="status" className="text-sm text-moss-700">
        Reminder queued to {send.data.to}
      </span>
    );
  }
  return (
    <span className="inline-flex flex-col items-start gap-1">
      <Button size="sm" variant="secondary" busy={send.isPending} onClick={() => send.mutate()} aria-label={`Send a reminder to ${row.customer.name} for ${row.invoiceNumber}`}>
        Send a reminder
      </Button>
      {send.isError && (
        <span role="alert" className="max-w-64 text-xs text-brick-700">
          {send.error.message}
        </span>
      )}
    </span>
  );
}

/** What customers owe on invoices issued, oldest first by default, in age buckets of 0–30, 31–60 and over 60 days. */
export function OwedPage() {
  const table = useTableState({ sort: 'age', dir: 'desc', filters: ['bucket'] });
  const bucket = (table.state.filters.bucket as AgeingBucket) || undefined;
  const owed = useOwed({ sort: table.state.sort as OwedQuery['sort'], dir: table.state.dir, bucket, page: table.state.page, pageSize: PAGE_SIZE });
  const columns: Column<OwedRow>[] = [
    { key: 'invoice', header: 'Invoice', sortKey: 'invoice', render: (r) => <span className="num whitespace-nowrap">{r.invoiceNumber}</span> },
    { key: 'customer', header: 'Customer', sortKey: 'customer', render: (r) => <Link to={pathTo.customer(r.customer.id)} className="hover:text-amber-700 hover:underline">{r.customer.name}</Link> },
    { key: 'invoicedOn', header: 'Invoiced', render: (r) => <span className="num whitespace-nowrap">{formatDate(r.invoicedOn)}</span> },
    {
      key: 'age',
      header: 'Age',
      sortKey: 'age',
      align: 'right',
      render: (r) => (
        <span className="whitespace-nowrap">
          <span className="num">{r.ageDays} {r.ageDays === 1 ? 'day' : 'days'}</span>
          <span className={`ml-2 rounded-full border px-2 py-0.5 text-xs ${r.bucket === '60+' ? 'border-brick-600/40 bg-brick-100 text-brick-700' : r.bucket === '31-60' ? 'border-amber-500/50 bg-amber-50 text-amber-800' : 'border-walnut-200 text-walnut-600'}`}>{AGEING_LABELS[r.bucket]}</span>
        </span>
      ),
    },
    { key: 'invoiced', header: 'Invoiced amount', align: 'right', render: (r) => <span className="num">{formatMoney(r.invoiced, r.currency)}</span> },
    { key: 'balance', header: 'Owed', sortKey: 'balance', align: 'right', render: (r) => <strong className="num">{formatMoney(r.balance, r.currency)}</strong> },
    { key: 'account', header: 'Account', render: (r) => <Link to={pathTo.account(r.quoteId)} className="font-medium text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700">Open {r.quoteNumber}</Link> },
    // The page is for the owner and sales (takePayments), who may send reminders.
    { key: 'reminder', header: 'Reminder', render: (r) => <ReminderButton row={r} /> },
  ];
  const totals = owed.data?.buckets ?? [];
  return (
    <>
      <PageHeader title="Owed to us" description="Balances on invoices issued and not yet paid, by how long ago the invoice went out." />
      <div className="mb-4 grid grid-cols-1 gap-3 sm:grid-cols-3" data-testid="owed-buckets">
        {AGEING_BUCKETS.map((b) => {
          const of = totals.filter((t) => t.bucket === b);
          return (
            <button
              key={b}
              type="button"
              onClick={() => table.setFilter('bucket', bucket === b ? '' : b)}
              aria-pressed={bucket === b}
              className={`rounded-lg border px-4 py-3 text-left ${bucket === b ? 'border-amber-500 bg-amber-50' : 'border-parchment-200 bg-white'} shadow-card`}
            >
              <span className="block text-xs uppercase tracking-wide text-walnut-500">{AGEING_LABELS[b]}</span>
              <span className="num block font-serif text-xl font-semibold text-walnut-900">
                {of.length === 0 ? 'Nothing' : of.map((t) => formatMoney(t.amount, t.currency)).join(' + ')}
              </span>
              <span className="block text-xs text-walnut-500">{of.reduce((n, t) => n + t.count, 0)} invoices</span>
            </button>
          );
        })}
      </div>
      <PagedTable
        caption="Owed to us"
        columns={columns}
        rowKey={(r) => r.quoteId}
        query={owed}
        table={table}
        pageSize={PAGE_SIZE}
        empty={bucket ? `Nothing owed ${AGEING_LABELS[bucket]} old.` : 'Nothing is owed: every invoice is paid.'}
        errorTitle="The list could not be loaded"
      />
      <div className="mt-6">
        <InvoiceStageSetting />
      </div>
    </>
  );
}

export const Component = OwedPage;
