import { Archive, ArchiveRestore, Mail, MapPin, NotebookPen, Pencil, Phone, Plus } from 'lucide-react';
import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { PIECE_KIND_LABELS, type Piece } from '@shared/schemas/customers';
import type { EstimateSummary } from '@shared/schemas/estimates';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { DataTable, type Column } from '@/components/data-table';
import { Spinner } from '@/components/spinner';
import { StateBadge } from '@/components/estimate-state-badge';
import { pathTo } from '@/config/paths';
import { formatHours, formatMoney, formatWhen } from '@/lib/format-figures';
import { useCan } from '@/lib/permissions';
import { useWorkshop } from '@/lib/workshop';
import { useEstimates } from '@/features/estimates/api/estimates';
import { usePieces } from '@/features/pieces/api/pieces';
import { AddPieceDialog } from '@/features/pieces/components/add-piece-dialog';
import { useArchiveCustomer, useCustomer } from '@/features/customers/api/customers';
import { CustomerFormDialog } from '@/features/customers/components/customer-form-dialog';
import { CustomerMessages } from '@/features/messages/components/customer-messages';

const PAGE_SIZE = 10;
type PieceSort = 'description' | 'kind' | 'createdAt' | 'updatedAt';
type EstimateSort = 'number' | 'state' | 'labourHours' | 'total' | 'updatedAt';

/** One customer: their details, their pieces and their estimates. */
export function CustomerPage() {
  const id = Number(useParams().customerId);
  const customer = useCustomer(id);
  const workshop = useWorkshop();
  const can = useCan();
  const navigate = useNavigate();
  const archive = useArchiveCustomer();
  const [editing, setEditing] = useState(false);
  const [addingPiece, setAddingPiece] = useState(false);
  const [pieceView, setPieceView] = useState<{ sort: PieceSort; dir: 'asc' | 'desc'; page: number }>({ sort: 'updatedAt', dir: 'desc', page: 1 });
  const [estimateView, setEstimateView] = useState<{ sort: EstimateSort; dir: 'asc' | 'desc'; page: number }>({ sort: 'updatedAt', dir: 'desc', page: 1 });
  const pieces = usePieces({ customerId: id, ...pieceView, pageSize: PAGE_SIZE });
  const estimates = useEstimates({ customerId: id, ...estimateView, pageSize: PAGE_SIZE });

  if (customer.isError) return <Alert tone="error" title="The customer could not be loaded">{customer.error.message}</Alert>;
  if (!customer.data) return <Spinner label="Opening the customer…" />;
  const c = customer.data;
  const unit = workshop.data?.settings.defaultLengthUnit ?? 'mm';
  const link = 'font-medium text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700';

  const pieceColumns: Column<Piece>[] = [
    { key: 'description', header: 'Piece', sortKey: 'description', render: (p) => <Link className={link} to={pathTo.piece(p.id)}>{p.description}</Link> },
    { key: 'kind', header: 'Kind', sortKey: 'kind', render: (p) => PIECE_KIND_LABELS[p.kind] },
    { key: 'maker', header: 'Maker and year', render: (p) => [p.maker, p.yearText ?? p.year].filter(Boolean).join(', ') || '—' },
    { key: 'photos', header: 'Photos', align: 'right', render: (p) => p.photos.length },
    { key: 'updatedAt', header: 'Updated', sortKey: 'updatedAt', render: (p) => <span className="num text-walnut-600">{formatWhen(p.updatedAt)}</span> },
  ];
  if (can.editEstimates) {
    pieceColumns.push({
      key: 'estimate',
      header: 'Estimate',
      render: (p) => (
        <Link to={pathTo.newEstimate(p.id)} className="inline-flex items-center gap-1 rounded-md border border-amber-400 bg-amber-50 px-2 py-1 text-xs font-semibold text-walnut-900 hover:bg-amber-100" aria-label={`New estimate for ${p.description}`}>
          <NotebookPen className="h-3.5 w-3.5" aria-hidden /> New estimate
        </Link>
      ),
    });
  }
  const estimateColumns: Column<EstimateSummary>[] = [
    { key: 'number', header: 'Number', sortKey: 'number', render: (e) => <Link className={`${link} num`} to={pathTo.estimate(e.id)}>{e.number}</Link> },
    { key: 'piece', header: 'Piece', render: (e) => e.piece.description },
    { key: 'state', header: 'State', sortKey: 'state', render: (e) => <StateBadge state={e.state} /> },
    { key: 'labourHours', header: 'Hours', sortKey: 'labourHours', align: 'right', render: (e) => formatHours(e.labourHours) },
    { key: 'total', header: 'Total', sortKey: 'total', align: 'right', render: (e) => formatMoney(e.total, e.currency) },
    {
      key: 'agreed',
      header: 'Agreed',
      align: 'right',
      render: (e) =>
        e.agreed ? (
          <span className="num" data-testid={`agreed-${e.id}`} title={`Deposit ${formatMoney(e.agreed.deposit, e.currency)}, balance ${formatMoney(e.agreed.balance, e.currency)}`}>
            {formatMoney(e.agreed.total, e.currency)}
          </span>
        ) : (
          <span className="text-walnut-300">—</span>
        ),
    },
    { key: 'updatedAt', header: 'Updated', sortKey: 'updatedAt', render: (e) => <span className="num text-walnut-600">{formatWhen(e.updatedAt)}</span> },
  ];
  const toggle = <S extends string>(view: { sort: S; dir: 'asc' | 'desc'; page: number }, key: S) => ({ sort: key, dir: view.sort === key && view.dir === 'asc' ? ('desc' as const) : ('asc' as const), page: 1 });

  return (
    <>
      <div className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-walnut-100 pb-4">
        <div>
          <p className="text-sm font-semibold uppercase tracking-wider text-amber-700">Customer</p>
          <h1 className="flex items-center gap-3 text-3xl font-semibold tracking-tight text-walnut-900">
            {c.name}
            {c.archived && (
              <span className="inline-flex items-center gap-1 rounded-full border border-dashed border-walnut-300 px-2 py-0.5 text-xs font-medium text-walnut-600">
                <Archive className="h-3.5 w-3.5" aria-hidden /> Archived
              </span>
            )}
          </h1>
        </div>
        <div className="flex flex-wrap gap-2">
          {can.editPieces && (
            <Button onClick={() => setAddingPiece(true)}>
              <Plus className="h-4 w-4" aria-hidden /> Add a piece
            </Button>
          )}
          {can.editCustomers && (
            <Button variant="secondary" onClick={() => setEditing(true)}>
              <Pencil className="h-4 w-4" aria-hidden /> Edit details
            </Button>
          )}
          {can.editCustomers && (
            <Button
              variant="ghost"
              busy={archive.isPending}
              onClick={() => {
                if (c.archived || window.confirm(`Archive ${c.name}? They leave the customer list; their pieces and estimates are kept.`)) archive.mutate({ id: c.id, archived: !c.archived });
              }}
            >
              {c.archived ? <ArchiveRestore className="h-4 w-4" aria-hidden /> : <Archive className="h-4 w-4" aria-hidden />}
              {c.archived ? 'Restore' : 'Archive'}
            </Button>
          )}
        </div>
      </div>
      {archive.isError && <div className="mb-4"><Alert tone="error" title="Not changed">{archive.error.message}</Alert></div>}
      <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[20rem_minmax(0,1fr)]">
        <Card title="Details">
          <dl className="space-y-3 text-sm">
            <div className="flex gap-2"><dt><Mail className="mt-0.5 h-4 w-4 text-walnut-400" aria-hidden /><span className="sr-only">E-mail</span></dt><dd>{c.email ? <a className="underline" href={`mailto:${c.email}`}>{c.email}</a> : '—'}</dd></div>
            <div className="flex gap-2"><dt><Phone className="mt-0.5 h-4 w-4 text-walnut-400" aria-hidden /><span className="sr-only">Telephone</span></dt><dd>{c.phone ?? '—'}</dd></div>
            <div className="flex gap-2"><dt><MapPin className="mt-0.5 h-4 w-4 text-walnut-400" aria-hidden /><span className="sr-only">Address</span></dt><dd className="whitespace-pre-line">{c.address ?? '—'}</dd></div>
            {c.notes && (
              <div>
                <dt className="text-xs font-medium uppercase tracking-wide text-walnut-500">Notes</dt>
                <dd className="mt-0.5 whitespace-pre-line text-walnut-700">{c.notes}</dd>
              </div>
            )}
          </dl>
          <p className="mt-3 border-t border-parchment-200 pt-2 text-xs text-walnut-500">Customer since {new Date(c.createdAt).toLocaleDateString('en-GB', { dateStyle: 'long' })}</p>
        </Card>
        <div className="min-w-0 space-y-6">
          <section aria-labelledby="pieces-heading">
            <h2 id="pieces-heading" className="mb-2 text-xl font-semibold text-walnut-800">Pieces</h2>
            {pieces.isError ? (
              <Alert tone="error" title="Pieces could not be loaded">{pieces.error.message}</Alert>
            ) : (
              <DataTable
                caption={`Pieces of ${c.name}`}
                columns={pieceColumns}
                rows={pieces.data?.rows ?? []}
                rowKey={(p) => p.id}
                total={pieces.data?.total ?? 0}
                page={pieceView.page}
                pageSize={PAGE_SIZE}
                sort={pieceView.sort}
                dir={pieceView.dir}
                loading={pieces.isFetching}
                empty={can.editPieces ? 'No pieces yet: add the first one to estimate it.' : 'No pieces yet.'}
                onSort={(k) => setPieceView(toggle(pieceView, k as PieceSort))}
                onPage={(page) => setPieceView({ ...pieceView, page })}
              />
            )}
          </section>
          <section aria-labelledby="estimates-heading">
            <div className="mb-2 flex items-baseline justify-between">
              <h2 id="estimates-heading" className="text-xl font-semibold text-walnut-800">Estimates</h2>
              <Link className="text-sm text-walnut-600 underline hover:text-amber-700" to={pathTo.estimatesOf(c.id)}>Open in the estimates list</Link>
            </div>
            {estimates.isError ? (
              <Alert tone="error" title="Estimates could not be loaded">{estimates.error.message}</Alert>
            ) : (
              <DataTable
                caption={`Estimates for ${c.name}`}
                columns={estimateColumns}
                rows={estimates.data?.rows ?? []}
                rowKey={(e) => e.id}
                total={estimates.data?.total ?? 0}
                page={estimateView.page}
                pageSize={PAGE_SIZE}
                sort={estimateView.sort}
                dir={estimateView.dir}
                loading={estimates.isFetching}
                empty="No estimates yet."
                onSort={(k) => setEstimateView(toggle(estimateView, k as EstimateSort))}
                onPage={(page) => setEstimateView({ ...estimateView, page })}
              />
            )}
          </section>
          {can.readMessages && (
            <section aria-labelledby="messages-heading">
              <h2 id="messages-heading" className="mb-2 text-xl font-semibold text-walnut-800">Messages</h2>
              <CustomerMessages customerId={c.id} />
            </section>
          )}
        </div>
      </div>
      <CustomerFormDialog open={editing} customer={c} onClose={() => setEditing(false)} />
      <AddPieceDialog open={addingPiece} customerId={c.id} unit={unit} onClose={() => setAddingPiece(false)} onSaved={(p) => navigate(pathTo.piece(p.id))} />
    </>
  );
}
