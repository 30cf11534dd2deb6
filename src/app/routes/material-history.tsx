/** Loaded on demand (recharts is large): the price history of one material, pack by pack. */
import { Archive, ArchiveRestore, ArrowLeft, FileSpreadsheet, PenLine } from 'lucide-react';
import { Link, useParams } from 'react-router-dom';
import { UpdatePackSchema, type PackDto, type PriceHistoryEntry } from '@shared/schemas/price-list';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { DataTable, type Column } from '@/components/data-table';
import { Spinner } from '@/components/spinner';
import { paths } from '@/config/paths';
import { useMe } from '@/lib/me';
import { formatDate, formatDateTime, formatMoney } from '@/lib/format';
import { useLocalTable } from '@/lib/use-local-table';
import { RepriceAfterPriceChange } from '@/features/reprice/components/reprice-notice';
import { useMaterialHistory, useUpdatePack } from '@/features/price-list/api/price-list';
import { ChangeBadge } from '@/features/price-list/components/change-badge';
import { InlineText } from '@/features/price-list/components/inline-text';
import { KindBadge } from '@/features/price-list/components/kind-badge';
import { PriceChart } from '@/features/price-list/components/price-chart';
import { PackPrice } from '@/features/price-list/components/price-editor';

function SourceTag({ source }: { source: string }) {
  const fromFile = source.startsWith('file: ');
  return (
    <span className="inline-flex items-center gap-1 text-walnut-600">
      {fromFile ? <FileSpreadsheet className="h-3.5 w-3.5 text-amber-600" aria-hidden /> : <PenLine className="h-3.5 w-3.5 text-walnut-400" aria-hidden />}
      {fromFile ? source.slice(6) : source === 'manual' ? 'entered by hand' : source === 'demo' ? 'demo price list' : source}
    </span>
  );
}

const value = (row: PriceHistoryEntry, key: string) =>
  key === 'price' ? Number(row.price) : key === 'changePct' ? (row.changePct === null ? null : Number(row.changePct)) : key === 'createdAt' ? row.createdAt : row.effectiveFrom;

function HistoryTable({ rows, currency, caption }: { rows: PriceHistoryEntry[]; currency: string; caption: string }) {
  const t = useLocalTable(rows, { sort: 'effectiveFrom', dir: 'desc', pageSize: 10, value });
  const columns: Column<PriceHistoryEntry>[] = [
    { key: 'effectiveFrom', header: 'Effective from', sortKey: 'effectiveFrom', render: (r) => <span className="whitespace-nowrap">{formatDate(r.effectiveFrom)}</span> },
    { key: 'price', header: `Price (${currency})`, sortKey: 'price', align: 'right', render: (r) => <span className="font-semibold">{formatMoney(r.price, currency)}</span> },
    { key: 'changePct', header: 'Change', sortKey: 'changePct', align: 'right', render: (r) => <ChangeBadge pct={r.changePct} /> },
    { key: 'source', header: 'Source', render: (r) => <SourceTag source={r.source} /> },
    { key: 'user', header: 'By', render: (r) => r.userName ?? <span className="text-walnut-400">— (loaded with the data)</span> },
    { key: 'createdAt', header: 'Recorded', sortKey: 'createdAt', render: (r) => <span className="whitespace-nowrap text-walnut-500">{formatDateTime(r.createdAt)}</span> },
  ];
  return <DataTable caption={caption} columns={columns} rowKey={(r) => r.id} {...t} />;
}

function PackCard({ pack, unit, currency, history, isOwner, materialName }: { pack: PackDto; unit: string; currency: string; history: PriceHistoryEntry[]; isOwner: boolean; materialName: string }) {
  const update = useUpdatePack();
  const label = `${pack.size} ${unit} pack`;
  return (
    <Card
      title={
        <span className="inline-flex items-center gap-2">
          {label}
          {pack.label && <span className="text-sm font-normal text-walnut-500">({pack.label})</span>}
          {pack.archived && (
            <span className="inline-flex items-center gap-1 rounded-full bg-walnut-100 px-2 py-0.5 text-xs font-normal text-walnut-600">
              <Archive className="h-3 w-3" aria-hidden /> Archived
            </span>
          )}
        </span>
      }
      actions={
        isOwner &&
        (pack.archived ? (
          <Button size="sm" variant="ghost" onClick={() => update.mutate({ id: pack.id, archived: false })}>
            <ArchiveRestore className="h-3.5 w-3.5" aria-hidden /> Restore pack
          </Button>
        ) : (
          <Button size="sm" variant="ghost" onClick={() => window.confirm(`Archive the ${label}? The estimator stops buying it; its history stays.`) && update.mutate({ id: pack.id, archived: true })}>
            <Archive className="h-3.5 w-3.5" aria-hidden /> Archive pack
          </Button>
        ))
      }
    >
      {update.isError && <div className="mb-3"><Alert tone="error" title="Not saved">{update.error.message}</Alert></div>}
      <dl className="mb-4 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[8rem_minmax(0,1fr)_8rem_minmax(0,1fr)]">
        <dt className="text-walnut-500">Price now</dt>
        <dd><PackPrice pack={pack} unit={unit} currency={currency} canEdit={isOwner} materialName={materialName} /></dd>
        <dt className="text-walnut-500">Supplier</dt>
        <dd><InlineText value={pack.supplier} label={`supplier of the ${label}`} schema={UpdatePackSchema.shape.supplier} canEdit={isOwner} onSave={(supplier) => update.mutateAsync({ id: pack.id, supplier })} /></dd>
        <dt className="text-walnut-500">Supplier code</dt>
        <dd className="font-mono"><InlineText value={pack.supplierCode ?? ''} label={`supplier code of the ${label}`} schema={UpdatePackSchema.shape.supplierCode} canEdit={isOwner} onSave={(supplierCode) => update.mutateAsync({ id: pack.id, supplierCode })} /></dd>
        <dt className="text-walnut-500">Label</dt>
        <dd><InlineText value={pack.label} label={`label of the ${label}`} schema={UpdatePackSchema.shape.label} canEdit={isOwner} onSave={(l) => update.mutateAsync({ id: pack.id, label: l })} /></dd>
      </dl>
      <HistoryTable rows={history} currency={currency} caption={`Price history of the ${label}`} />
    </Card>
  );
}

export function MaterialHistoryPage() {
  const { materialId } = useParams();
  const id = Number(materialId);
  const me = useMe();
  const history = useMaterialHistory(id);
  if (!Number.isInteger(id) || id <= 0) return <Alert tone="error" title="No such material" />;
  if (history.isPending) return <Spinner label="Loading the price history…" />;
  if (history.isError) return <Alert tone="error" title="The price history could not be loaded">{history.error.message}</Alert>;
  const { material, currency, packs } = history.data;
  const isOwner = can(me.data?.role, 'editPrices');
  return (
    <>
      <Link to={paths.priceList} className="mb-3 inline-flex items-center gap-1 text-sm text-walnut-600 hover:text-walnut-900">
        <ArrowLeft className="h-4 w-4" aria-hidden /> Price list
      </Link>
      <PageHeader
        title={material.name}
        description={
          <span className="inline-flex flex-wrap items-center gap-2">
            <KindBadge kind={material.kind} /> counted in {material.unit} · key <span className="font-mono">{material.key}</span> · prices in {currency}, before tax
          </span>
        }
      />
      {material.notes && <p className="-mt-3 mb-5 max-w-3xl text-sm text-walnut-600">{material.notes}</p>}
      {isOwner && <RepriceAfterPriceChange />}
      <Card title="Price over time" className="mb-6">
        <PriceChart history={history.data} />
      </Card>
      <div className="space-y-6">
        {packs.map(({ pack, history: rows }) => (
          <PackCard key={pack.id} pack={pack} unit={material.unit} currency={currency} history={rows} isOwner={isOwner} materialName={material.name} />
        ))}
      </div>
    </>
  );
}

/** The route module's component for React Router's lazy loading. */
export const Component = MaterialHistoryPage;
