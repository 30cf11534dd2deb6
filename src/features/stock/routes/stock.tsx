/**
 * The shelf: stock on hand per material (counted in its packs), low-stock warnings from the forecast (what the
 * booked jobs need before the next delivery), stock counts, purchase orders from the shopping list, and the ledger
 * of every movement.
 */
import { AlertTriangle, CircleCheck, Download, FileText } from 'lucide-react';
import { useCallback, useState } from 'react';
import { can } from '@shared/roles';
import { MOVEMENT_LABELS, PURCHASE_ORDER_STATE_LABELS, type PurchaseOrderDto, type StockLevel, type StockMovementDto } from '@shared/schemas/stock';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { DataTable, type Column } from '@/components/data-table';
import { Spinner } from '@/components/spinner';
import { useMe } from '@/lib/me';
import { formatDate, formatDateTime, formatMoney } from '@/lib/format';
import { useLocalTable } from '@/lib/use-local-table';
import { useCancelOrder, useMovements, useOrders, useOrdersFromForecast, useStockOverview } from '../api/stock';
import { CountDialog } from '../components/count-dialog';
import { ReceiveOrderDialog, SendOrderDialog } from '../components/order-dialogs';

const nf = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 2 });
const nq = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });
/** A quantity with its unit, to a tenth (a gram or millilitre more is below what the bench measures). */
const qty = (n: number, unit: string) => `${nq.format(n).replace(/^-/, '\u2212')} ${unit}`;

function LevelsCard({ weeks, setWeeks }: { weeks: number; setWeeks: (w: number) => void }) {
  const overview = useStockOverview(weeks);
  const [counting, setCounting] = useState<StockLevel | null>(null);
  const value = useCallback((r: StockLevel, key: string) => (key === 'low' ? (r.low ? 0 : 1) : (r[key as keyof StockLevel] as string | number | null)), []);
  const table = useLocalTable(overview.data?.rows ?? [], { sort: 'low', pageSize: 15, value });
  if (overview.isPending) return <Spinner label="Reading the shelf…" />;
  if (overview.isError) return <Alert tone="error" title="Stock could not be loaded">{overview.error.message}</Alert>;
  const o = overview.data;
  const low = o.rows.filter((r) => r.low);
  const columns: Column<StockLevel>[] = [
    { key: 'name', header: 'Material', sortKey: 'name', render: (r) => <span className="font-medium text-walnut-900">{r.name}</span> },
    {
      key: 'quantity',
      header: 'On hand',
      sortKey: 'quantity',
      align: 'right',
      render: (r) => (
        <span className="whitespace-nowrap">
          {qty(r.quantity, r.unit)}
          {r.packs[0] && <span className="block text-xs text-walnut-500">{nf.format(r.packs[0].onHandPacks)} × {r.packs[0].label}</span>}
        </span>
      ),
    },
    { key: 'need', header: 'Needed before delivery', sortKey: 'needBeforeDelivery', align: 'right', render: (r) => qty(r.needBeforeDelivery, r.unit) },
    { key: 'delivery', header: 'Next delivery', sortKey: 'nextDelivery', render: (r) => (r.nextDelivery ? `${formatDate(r.nextDelivery)} (${qty(r.onOrder, r.unit)})` : <span className="text-walnut-500">none ordered</span>) },
    {
      key: 'low',
      header: 'Warning',
      sortKey: 'low',
      render: (r) =>
        r.low ? (
          <span className="inline-flex items-center gap-1 font-semibold text-amber-800">
            <AlertTriangle className="h-3.5 w-3.5" aria-hidden /> {r.quantity < 0 ? 'below zero: count it' : `short ${qty(r.short, r.unit)}`}
          </span>
        ) : (
          <span className="inline-flex items-center gap-1 text-moss-700">
            <CircleCheck className="h-3.5 w-3.5" aria-hidden /> enough
          </span>
        ),
    },
    {
      key: 'count',
      header: '',
      render: (r) => (
        <Button size="sm" variant="secondary" onClick={() => setCounting(r)} aria-label={`Count ${r.name}`}>
          Count
        </Button>
      ),
    },
  ];
  return (
    <Card
      title="On the shelf"
      actions={
        <label className="flex items-center gap-2 text-sm text-walnut-700">
          Warn for the next
          <select className="rounded-md border border-walnut-200 bg-white px-2 py-1 text-sm" value={weeks} onChange={(e) => setWeeks(Number(e.target.value))} aria-label="Weeks the warnings look ahead">
            {[2, 4, 8, 12, 26].map((w) => (
              <option key={w} value={w}>
                {w} weeks
              </option>
            ))}
          </select>
        </label>
      }
    >
      <div className="space-y-3">
        {low.length > 0 ? (
          <Alert tone="warning" title={`${low.length} material${low.length === 1 ? '' : 's'} running low`}>
            The booked jobs need more than the shelf holds before the next delivery (or, with none ordered, before {formatDate(o.until)}): {low.map((r) => r.name).join(', ')}.
          </Alert>
        ) : (
          <p className="text-sm text-moss-700">The shelf covers what the booked jobs need until {formatDate(o.until)}.</p>
        )}
        <DataTable caption="Stock on hand and low-stock warnings" columns={columns} rowKey={(r) => r.materialId} {...table} loading={overview.isFetching} empty="No materials in the price list." />
      </div>
      {counting && <CountDialog row={counting} onClose={() => setCounting(null)} />}
    </Card>
  );
}

function OrdersCard({ weeks }: { weeks: number }) {
  const [state, setState] = useState('open');
  const [page, setPage] = useState(1);
  const orders = useOrders(state, page, 10);
  const make = useOrdersFromForecast();
  const cancel = useCancelOrder();
  const [sending, setSending] = useState<PurchaseOrderDto | null>(null);
  const [receiving, setReceiving] = useState<PurchaseOrderDto | null>(null);
  const columns: Column<PurchaseOrderDto>[] = [
    { key: 'number', header: 'Order', render: (o) => <span className="font-semibold text-walnut-900">{o.number}</span> },
    { key: 'supplier', header: 'Supplier', render: (o) => o.supplier },
    { key: 'lines', header: 'What', render: (o) => <span className="text-xs">{o.lines.map((l) => `${l.packs} × ${l.material} (${l.packLabel})`).join('; ')}</span> },
    { key: 'total', header: 'Total', align: 'right', render: (o) => formatMoney(o.total, o.currency) },
    { key: 'state', header: 'State', render: (o) => `${PURCHASE_ORDER_STATE_LABELS[o.state]}${o.expectedOn && o.state === 'sent' ? `, due ${formatDate(o.expectedOn)}` : ''}` },
    {
      key: 'actions',
      header: '',
      render: (o) => (
        <span className="flex flex-wrap justify-end gap-1.5">
          <a href={`/api/purchase-orders/${o.id}/pdf`} target="_blank" rel="noreferrer" className="inline-flex items-center gap-1 rounded-md border border-walnut-200 px-2 py-1 text-xs text-walnut-800 hover:bg-parchment-100">
            <FileText className="h-3.5 w-3.5" aria-hidden /> PDF<span className="sr-only"> of {o.number}</span>
          </a>
          {(o.state === 'draft' || o.state === 'sent') && (
            <>
              <Button size="sm" variant="secondary" onClick={() => setSending(o)}>
                {o.state === 'draft' ? 'Send' : 'Send again'}
              </Button>
              <Button size="sm" onClick={() => setReceiving(o)}>
                Receive
              </Button>
              <Button size="sm" variant="ghost" busy={cancel.isPending && cancel.variables === o.id} onClick={() => cancel.mutate(o.id)}>
                Cancel
              </Button>
            </>
          )}
        </span>
      ),
    },
  ];
  return (
    <Card
      title="Purchase orders"
      actions={
        <Button size="sm" variant="accent" busy={make.isPending} onClick={() => make.mutate(weeks)}>
          Order what the next {weeks} weeks are short of
        </Button>
      }
    >
      <div className="space-y-3">
        {make.isSuccess && <Alert tone="info" title={make.data.length ? `${make.data.length} order${make.data.length === 1 ? '' : 's'} drafted, one per supplier` : 'Nothing to order'}>{make.data.length ? make.data.map((o) => `${o.number} for ${o.supplier}`).join(', ') : 'The shelf and the orders already open cover the forecast.'}</Alert>}
        {make.isError && <Alert tone="error" title="No orders were made">{make.error.message}</Alert>}
        {cancel.isError && <Alert tone="error" title="The order was not cancelled">{cancel.error.message}</Alert>}
        <label className="flex items-center gap-2 text-sm text-walnut-700">
          Show
          <select className="rounded-md border border-walnut-200 bg-white px-2 py-1 text-sm" value={state} onChange={(e) => { setState(e.target.value); setPage(1); }} aria-label="Which orders">
            <option value="open">open orders</option>
            <option value="received">received</option>
            <option value="cancelled">cancelled</option>
            <option value="all">all</option>
          </select>
        </label>
        {orders.isError ? (
          <Alert tone="error" title="Orders could not be loaded">{orders.error.message}</Alert>
        ) : (
          <DataTable caption="Purchase orders" columns={columns} rowKey={(o) => o.id} rows={orders.data?.items ?? []} total={orders.data?.total ?? 0} page={page} pageSize={10} loading={orders.isFetching} onPage={setPage} empty="No orders here." />
        )}
      </div>
      {sending && <SendOrderDialog order={sending} onClose={() => setSending(null)} />}
      {receiving && <ReceiveOrderDialog order={receiving} onClose={() => setReceiving(null)} />}
    </Card>
  );
}

function LedgerCard({ isOwner }: { isOwner: boolean }) {
  const [page, setPage] = useState(1);
  const movements = useMovements(page, 25);
  const columns: Column<StockMovementDto>[] = [
    { key: 'at', header: 'When', render: (m) => formatDateTime(m.at) },
    { key: 'material', header: 'Material', render: (m) => m.material },
    { key: 'kind', header: 'What', render: (m) => `${MOVEMENT_LABELS[m.kind]}${m.job ? ` · ${m.job.number}` : ''}${m.order ? ` · ${m.order.number}` : ''}` },
    { key: 'quantity', header: 'Change', align: 'right', render: (m) => <span className="whitespace-nowrap">{m.quantity > 0 ? '+' : ''}{qty(m.quantity, m.unit)}{m.packs !== null && m.pack && <span className="block text-xs text-walnut-500">{nf.format(m.packs)} × {m.pack}</span>}</span> },
    { key: 'balance', header: 'Balance', align: 'right', render: (m) => qty(m.balanceAfter, m.unit) },
    { key: 'reason', header: 'Reason', render: (m) => m.reason ?? '' },
    { key: 'by', header: 'By', render: (m) => m.by ?? '' },
  ];
  return (
    <Card
      title="Ledger"
      actions={
        isOwner && (
          <a href="/api/stock/movements.csv" download className="inline-flex items-center gap-1.5 rounded-md border border-walnut-200 bg-white px-2.5 py-1 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
            <Download className="h-3.5 w-3.5" aria-hidden /> CSV<span className="sr-only"> of the stock ledger</span>
          </a>
        )
      }
    >
      {movements.isError ? (
        <Alert tone="error" title="The ledger could not be loaded">{movements.error.message}</Alert>
      ) : (
        <DataTable caption="Every movement of stock, newest first" columns={columns} rowKey={(m) => m.id} rows={movements.data?.items ?? []} total={movements.data?.total ?? 0} page={page} pageSize={25} loading={movements.isFetching} onPage={setPage} empty="Nothing has moved yet." />
      )}
    </Card>
  );
}

export function StockPage() {
  const [weeks, setWeeks] = useState(4);
  const me = useMe();
  return (
    <div className="space-y-6">
      <PageHeader title="Stock" description="What is on the shelf, what the booked jobs will need before the next delivery, the orders to suppliers, and every movement." />
      <LevelsCard weeks={weeks} setWeeks={setWeeks} />
      <OrdersCard weeks={weeks} />
      <LedgerCard isOwner={can(me.data?.role, 'readReports')} />
    </div>
  );
}
