
import { Link } from 'react-router-dom';
import { PAYMENT_FLAG_LABELS, QUOTE_STATES, QUOTE_STATE_LABELS, type QuoteState, type QuoteSummary } from '@shared/schemas/quotes';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { SearchBox } from '@/components/search-box';
import { PagedTable } from '@/components/paged-table';
import { pathTo } from '@/config/paths';
import { useCan } from '@/lib/permissions';
import { useCalcCatalog } from '@/lib/catalog';
import { formatDate, formatMoney } from '@/lib/format';
import { useTableState } from '@/lib/use-table-state';
import { useFlaggedPayments, useQuotes, type QuoteListQueryInput } from '../api/quotes';
import { OptionReport } from '../components/option-report';
import { Pipeline } from '../components/pipeline';
import { QuoteStateBadge } from '../components/quote-state-badge';

const PAGE_SIZE = 25;
const link = 'hover:text-amber-700 hover:underline';

function DateCell({ at }: { at: string | null }) {
  if (!at) return <span className="text-walnut-300">—</span>;
  return <span className="num whitespace-nowrap text-walnut-700">{formatDate(at)}</span>;
}

/** Payments that did not count as a deposit, for the owner: what happened and whether it was refunded. */
function FlaggedPayments({ enabled }: { enabled: boolean }) {
  const flagged = useFlaggedPayments(enabled);
  if (!flagged.data || flagged.data.length === 0) return null;
  return (
    <section aria-labelledby="flagged-heading" className="mb-6 rounded-xl border border-brick-600/40 bg-brick-100/40 px-4 py-3" data-testid="flagged-payments">
      <h2 id="flagged-heading" className="text-base font-semibold text-brick-700">Payments to look at</h2>
      <ul className="mt-1 divide-y divide-brick-600/20 text-sm">
        {flagged.data.map((p) => (
          <li key={p.id} className="flex flex-wrap items-baseline justify-between gap-2 py-1.5">
            <span>
              <Link className="num font-medium text-walnut-900 underline decoration-amber-400" to={pathTo.quote(p.quote.id)}>{p.quote.number}</Link>{' '}
              {p.customer}: <strong>{PAYMENT_FLAG_LABELS[p.flag!]}</strong>
              {p.note && <span className="block text-xs text-walnut-600">{p.note}</span>}
            </span>
            <span className="num whitespace-nowrap">
              {formatMoney(p.amountReceived ?? p.amount, p.currency)} · {p.status === 'refunded' ? 'refunded' : 'not refunded'}
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}

/** Every quote: search, filter by state, sort and page on the server; the pipeline above for sales and the owner. */
export function QuotesPage() {
  const table = useTableState({ sort: 'updatedAt', dir: 'desc', filters: ['state'] });
  const seller = useCan().sendQuotes;
  const calc = useCalcCatalog();
  const query: QuoteListQueryInput = {
    q: table.state.q || undefined,
    state: (table.state.filters.state as QuoteState) || undefined,
    sort: table.state.sort as QuoteListQueryInput['sort'],
    dir: table.state.dir,
    page: table.state.page,
    pageSize: PAGE_SIZE,
  };
  const quotes = useQuotes(query);

  const columns: Column<QuoteSummary>[] = [
    {
      key: 'number',
      header: 'Number',
      sortKey: 'number',
      render: (q) => (
        <Link to={pathTo.quote(q.id)} className="num whitespace-nowrap font-semibold text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700">
          {q.number}
        </Link>
      ),
    },
    { key: 'customer', header: 'Customer', render: (q) => <Link className={link} to={pathTo.customer(q.customer.id)}>{q.customer.name}</Link> },
    {
      key: 'estimate',
      header: 'Estimate',
      sortKey: 'customer',
      render: (q) => (
        <Link className={link} to={pathTo.estimate(q.estimate.id)}>
          <span className="num">{q.estimate.number}</span> <span className="text-xs text-walnut-500">rev. {q.estimate.revision}</span>
          <span className="block max-w-56 truncate text-xs text-walnut-500">{q.estimate.title}</span>
        </Link>
      ),
    },
    { key: 'state', header: 'State', sortKey: 'state', render: (q) => <QuoteStateBadge state={q.state} /> },
    { key: 'total', header: 'Total', sortKey: 'total', align: 'right', render: (q) => <span className="whitespace-nowrap font-medium">{formatMoney(q.total, q.currency)}</span> },
    { key: 'deposit', header: 'Deposit', align: 'right', render: (q) => <span className="whitespace-nowrap">{formatMoney(q.deposit, q.currency)}</span> },
    { key: 'validUntil', header: 'Valid until', sortKey: 'validUntil', render: (q) => <DateCell at={q.validUntil} /> },
    {
      key: 'progress',
      header: 'Sent · opened · answered',
      render: (q) => {
        const steps: [string, string | null][] = [
          ['Sent', q.sentAt],
          ['Opened', q.viewedAt],
          [q.declinedAt ? 'Declined' : 'Accepted', q.declinedAt ?? q.acceptedAt],
          ['Deposit paid', q.depositPaidAt],
        ];
        const done = steps.filter((st): st is [string, string] => st[1] !== null);
        if (done.length === 0) return <span className="text-xs text-walnut-400">Not sent yet</span>;
        return (
          <ul className="space-y-0.5 text-xs">
            {done.map(([label, at]) => (
              <li key={label} className="whitespace-nowrap">
                <span className="text-walnut-500">{label}</span> <span className="num text-walnut-800">{formatDate(at)}</span>
              </li>
            ))}
          </ul>
        );
      },
    },
  ];

  return (
    <>
      <PageHeader title="Quotes" description="Priced estimates offered to customers: what was sent, opened, accepted and paid." />
      <FlaggedPayments enabled={seller} />
      <OptionReport enabled={seller} />
      {seller && calc.data && (
        <Pipeline currency={calc.data.settings.pricing.currency} active={table.state.filters.state ?? ''} onPick={(s) => table.setFilter('state', s)} />
      )}
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <SearchBox value={table.state.q} onSearch={table.setSearch} label="Search quotes by quote or estimate number, title or e-mail" placeholder="Quote or estimate number, title, e-mail" showLabel className="w-80" />
        <div>
          <label htmlFor="quote-state" className="block text-xs font-medium uppercase tracking-wide text-walnut-600">State</label>
          <select id="quote-state" value={table.state.filters.state} onChange={(e) => table.setFilter('state', e.target.value)} className="mt-0.5 rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
            <option value="">Any state</option>
            {QUOTE_STATES.map((s) => (
              <option key={s} value={s}>{QUOTE_STATE_LABELS[s]}</option>
            ))}
          </select>
        </div>
      </div>
      <PagedTable
        caption="Quotes"
        columns={columns}
        rowKey={(q) => q.id}
        query={quotes}
        table={table}
        pageSize={PAGE_SIZE}
        empty={table.state.q || table.state.filters.state ? 'No quote matches.' : 'No quote yet. Quotes are prepared from a priced estimate.'}
        errorTitle="Quotes could not be loaded"
      />
    </>
  );
}

/** The route module's component for React Router's lazy loading. */
export const Component = QuotesPage;
