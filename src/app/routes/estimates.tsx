import { Archive, ArchiveRestore, CopyPlus } from 'lucide-react';

import { Link, useNavigate } from 'react-router-dom';
import { ESTIMATE_STATE_LABELS, ESTIMATE_STATES, type EstimateState, type EstimateSummary } from '@shared/schemas/estimates';
import { PIECE_KIND_LABELS, type PieceKind } from '@shared/schemas/customers';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { SearchBox } from '@/components/search-box';
import { PagedTable } from '@/components/paged-table';
import { paths, pathTo } from '@/config/paths';
import { CustomerPicker } from '@/features/customers/components/customer-picker';
import { EstimateQuoteDate } from '@/features/quotes/components/estimate-quote-date';
import { useTableState } from '@/lib/use-table-state';
import { useArchiveEstimate, useDuplicateEstimate, useEstimates, type EstimateListQueryInput } from '@/features/estimates/api/estimates';
import { StateBadge } from '@/components/estimate-state-badge';
import { formatHours, formatMoney, formatWhen } from '@/lib/format-figures';
import { useCan } from '@/lib/permissions';

const PAGE_SIZE = 25;

/** Every estimate the workshop holds: search, filter by state and customer, sort and page on the server. */
export function EstimatesPage() {
  const table = useTableState({ sort: 'updatedAt', dir: 'desc', filters: ['state', 'customerId', 'archived'] });
  const can = useCan();
  const navigate = useNavigate();
  const archive = useArchiveEstimate();
  const duplicate = useDuplicateEstimate();
  const customerId = Number(table.state.filters.customerId) || undefined;
  const archived = table.state.filters.archived === 'true';
  const query: EstimateListQueryInput = {
    q: table.state.q || undefined,
    state: (table.state.filters.state as EstimateState) || undefined,
    customerId,
    archived: archived ? 'true' : 'false',
    sort: table.state.sort as EstimateListQueryInput['sort'],
    dir: table.state.dir,
    page: table.state.page,
    pageSize: PAGE_SIZE,
  };
  const estimates = useEstimates(query);
  const link = 'hover:text-amber-700 hover:underline';

  const columns: Column<EstimateSummary>[] = [
    {
      key: 'number',
      header: 'Number',
      sortKey: 'number',
      render: (e) => (
        <Link to={pathTo.estimate(e.id)} className="num font-semibold text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700">
          {e.number}
        </Link>
      ),
    },
    { key: 'customer', header: 'Customer', sortKey: 'customer', render: (e) => <Link className={link} to={pathTo.customer(e.customer.id)}>{e.customer.name}</Link> },
    {
      key: 'piece',
      header: 'Piece',
      render: (e) => (
        <Link className={link} to={pathTo.piece(e.piece.id)}>
          {e.piece.description}
          <span className="block text-xs text-walnut-500">{PIECE_KIND_LABELS[e.piece.kind as PieceKind] ?? e.piece.kind}</span>
        </Link>
      ),
    },
    {
      key: 'state',
      header: 'State',
      sortKey: 'state',
      render: (e) => (
        <>
          <StateBadge state={e.state} />
          <EstimateQuoteDate estimateId={e.id} state={e.state} />
        </>
      ),
    },
    { key: 'labourHours', header: 'Hours', sortKey: 'labourHours', align: 'right', render: (e) => formatHours(e.labourHours) },
    { key: 'total', header: 'Total', sortKey: 'total', align: 'right', render: (e) => <span className="font-medium">{formatMoney(e.total, e.currency)}</span> },
    { key: 'updatedAt', header: 'Updated', sortKey: 'updatedAt', render: (e) => <span className="num whitespace-nowrap text-walnut-600">{formatWhen(e.updatedAt)}</span> },
  ];
  if (can.editEstimates) {
    columns.push({
      key: 'actions',
      header: 'Actions',
      render: (e) => (
        <div className="flex gap-1">
          <Button size="sm" variant="ghost" aria-label={`Duplicate ${e.number}`} title="Duplicate" onClick={() => duplicate.mutate({ id: e.id }, { onSuccess: (copy) => navigate(pathTo.estimate(copy.id)) })}>
            <CopyPlus className="h-3.5 w-3.5" aria-hidden />
          </Button>
          <Button
            size="sm"
            variant="ghost"
            aria-label={`${e.archived ? 'Restore' : 'Archive'} ${e.number}`}
            title={e.archived ? 'Restore' : 'Archive'}
            onClick={() => {
              if (e.archived || window.confirm(`Archive estimate ${e.number}? It leaves this list but is kept with its revisions.`)) archive.mutate({ id: e.id, archived: !e.archived });
            }}
          >
            {e.archived ? <ArchiveRestore className="h-3.5 w-3.5" aria-hidden /> : <Archive className="h-3.5 w-3.5" aria-hidden />}
          </Button>
        </div>
      ),
    });
  }

  const actionError = archive.error ?? duplicate.error;
  return (
    <>
      <PageHeader
        title="Estimates"
        description={can.editEstimates ? 'Priced French-polishing jobs. Start a new one from a customer’s piece.' : 'Priced French-polishing jobs, newest first.'}
        actions={
          can.editEstimates && (
            <Link to={paths.customers} className="inline-flex items-center gap-2 rounded-md bg-walnut-800 px-4 py-2 text-sm font-medium text-parchment-50 shadow-sm hover:bg-walnut-700">
              New estimate: pick a customer
            </Link>
          )
        }
      />
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <SearchBox value={table.state.q} onSearch={table.setSearch} label="Search estimates by number, title, customer or piece" placeholder="Number, title, customer or piece" showLabel className="w-72" />
        <div>
          <label htmlFor="estimate-state" className="block text-xs font-medium uppercase tracking-wide text-walnut-600">
            State
          </label>
          <select
            id="estimate-state"
            value={table.state.filters.state}
            onChange={(e) => table.setFilter('state', e.target.value)}
            className="mt-0.5 rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm"
          >
            <option value="">Any state</option>
            {ESTIMATE_STATES.map((s) => (
              <option key={s} value={s}>
                {ESTIMATE_STATE_LABELS[s]}
              </option>
            ))}
          </select>
        </div>
        <CustomerPicker value={customerId} onChange={(id) => table.setFilter('customerId', id === undefined ? '' : String(id))} />
        <label className="mb-2 inline-flex items-center gap-2 text-sm text-walnut-700">
          <input type="checkbox" className="h-4 w-4 accent-amber-600" checked={archived} onChange={(e) => table.setFilter('archived', e.target.checked ? 'true' : '')} />
          Show archived instead
        </label>
      </div>
      {actionError && (
        <div className="mb-4">
          <Alert tone="error" title="That did not work">{actionError.message}</Alert>
        </div>
      )}
      <PagedTable
        caption="Estimates"
        columns={columns}
        rowKey={(e) => e.id}
        query={estimates}
        table={table}
        pageSize={PAGE_SIZE}
        empty={archived ? 'No archived estimate matches.' : 'No estimate matches. Estimates start from a customer’s piece.'}
        errorTitle="Estimates could not be loaded"
      />
    </>
  );
}
