import { Archive, ArchiveRestore, FileUp, History, PackagePlus, Plus, RefreshCw } from 'lucide-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { MATERIAL_KINDS } from '@shared/schemas/catalog';
import { MATERIAL_KIND_LABELS, UpdateMaterialSchema, type MaterialDto, type MaterialKind, type MaterialListQuery } from '@shared/schemas/price-list';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { SearchBox } from '@/components/search-box';
import { PagedTable } from '@/components/paged-table';
import { ownerPathTo, paths } from '@/config/paths';
import { useMe } from '@/lib/me';
import { useWorkshop } from '@/lib/workshop';
import { formatDate } from '@/lib/format';
import { useTableState } from '@/lib/use-table-state';
import { useMaterials } from '@/lib/materials';
import { RepriceAfterPriceChange } from '@/features/reprice/components/reprice-notice';
import { useUpdateMaterial } from '@/features/price-list/api/price-list';
import { InlineText } from '@/features/price-list/components/inline-text';
import { KindBadge } from '@/features/price-list/components/kind-badge';
import { AddMaterialDialog, AddPackDialog } from '@/features/price-list/components/material-dialogs';
import { PackPrice } from '@/features/price-list/components/price-editor';

const PAGE_SIZE = 15;
const nameSchema = UpdateMaterialSchema.shape.name;
const notesSchema = UpdateMaterialSchema.shape.notes;

export function PriceListPage() {
  const me = useMe();
  const isOwner = can(me.data?.role, 'editPrices');
  const currency = useWorkshop().data?.settings.pricing.currency ?? 'GBP';
  const table = useTableState({ sort: 'name', filters: ['kind', 'archived'] });
  const [adding, setAdding] = useState(false);
  const [addingPackTo, setAddingPackTo] = useState<MaterialDto | null>(null);
  const update = useUpdateMaterial();
  const query: Partial<MaterialListQuery> = {
    q: table.state.q || undefined,
    kind: (table.state.filters.kind as MaterialKind) || undefined,
    archived: (table.state.filters.archived as MaterialListQuery['archived']) || undefined,
    sort: table.state.sort as MaterialListQuery['sort'],
    dir: table.state.dir,
    page: table.state.page,
    pageSize: PAGE_SIZE,
  };
  const materials = useMaterials(query);

  const columns: Column<MaterialDto>[] = [
    {
      key: 'name',
      header: 'Material',
      sortKey: 'name',
      render: (m) => (
        <div className="min-w-44 max-w-64">
          <InlineText
            value={m.name}
            label={`name of ${m.name}`}
            schema={nameSchema}
            canEdit={isOwner}
            className="font-medium text-walnut-900"
            onSave={(name) => update.mutateAsync({ id: m.id, name })}
          />
          <p className="mt-0.5 font-mono text-xs text-walnut-400">{m.key}</p>
          {m.archived && (
            <span className="mt-1 inline-flex items-center gap-1 rounded-full bg-walnut-100 px-2 py-0.5 text-xs text-walnut-600">
              <Archive className="h-3 w-3" aria-hidden /> Archived
            </span>
          )}
        </div>
      ),
    },
    { key: 'kind', header: 'Kind', sortKey: 'kind', render: (m) => <KindBadge kind={m.kind} /> },
    {
      key: 'packs',
      header: `Packs and prices (${currency}, before tax)`,
      render: (m) => (
        <ul className="min-w-[26rem] space-y-1.5">
          {m.packs.length === 0 && <li className="text-walnut-400">No pack yet</li>}
          {m.packs.map((p) => (
            <li key={p.id} className={`grid grid-cols-[5.5rem_1fr] items-start gap-x-3 ${p.archived ? 'opacity-50' : ''}`}>
              <span className="num whitespace-nowrap pt-0.5 text-walnut-700">
                {p.size} {m.unit}
                {p.archived && <span className="sr-only"> (archived)</span>}
              </span>
              <div>
                <PackPrice pack={p} unit={m.unit} currency={currency} canEdit={isOwner} materialName={m.name} />
                <p className="text-xs text-walnut-500">
                  {p.supplier || 'No supplier'}
                  {p.supplierCode && <span className="ml-1.5 font-mono text-walnut-400">{p.supplierCode}</span>}
                  {p.priceFrom && <span className="ml-1.5">· since {formatDate(p.priceFrom)}</span>}
                </p>
              </div>
            </li>
          ))}
        </ul>
      ),
    },
    {
      key: 'notes',
      header: 'Notes',
      render: (m) => (
        <div className="w-64 text-walnut-600">
          <InlineText value={m.notes} label={`notes on ${m.name}`} schema={notesSchema} canEdit={isOwner} multiline placeholder={isOwner ? 'Add a note' : '—'} onSave={(notes) => update.mutateAsync({ id: m.id, notes })} />
        </div>
      ),
    },
    { key: 'updatedAt', header: 'Details changed', sortKey: 'updatedAt', render: (m) => <span className="whitespace-nowrap text-walnut-500">{formatDate(m.updatedAt)}</span> },
    {
      key: 'actions',
      header: 'Actions',
      render: (m) => (
        <div className="flex flex-col items-start gap-1 whitespace-nowrap">
          <Link to={ownerPathTo.materialHistory(m.id)} className="inline-flex items-center gap-1 rounded px-2 py-1 text-sm text-walnut-700 hover:bg-walnut-50" aria-label={`Price history of ${m.name}`}>
            <History className="h-3.5 w-3.5" aria-hidden /> History
          </Link>
          {isOwner && !m.archived && (
            <Button size="sm" variant="ghost" onClick={() => setAddingPackTo(m)} aria-label={`Add a pack of ${m.name}`}>
              <PackagePlus className="h-3.5 w-3.5" aria-hidden /> Add pack
            </Button>
          )}
          {isOwner &&
            (m.archived ? (
              <Button size="sm" variant="ghost" onClick={() => update.mutate({ id: m.id, archived: false })}>
                <ArchiveRestore className="h-3.5 w-3.5" aria-hidden /> Restore
              </Button>
            ) : (
              <Button
                size="sm"
                variant="ghost"
                onClick={() => {
                  if (window.confirm(`Archive ${m.name}? Its packs leave the estimator's price list; the history is kept.`)) update.mutate({ id: m.id, archived: true });
                }}
              >
                <Archive className="h-3.5 w-3.5" aria-hidden /> Archive
              </Button>
            ))}
        </div>
      ),
    },
  ];

  return (
    <>
      <PageHeader
        title="Price list"
        description={
          isOwner
            ? 'What the workshop pays for each pack, and since when. A new price takes a date and keeps the old one, so past estimates stay explainable.'
            : 'What the workshop pays for each pack. Only the owner changes prices.'
        }
        actions={
          isOwner && (
            <>
              <Link to={paths.priceFile} className="inline-flex items-center gap-2 rounded-md border border-walnut-200 bg-white px-4 py-2 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
                <FileUp className="h-4 w-4" aria-hidden /> Upload supplier file
              </Link>
              <Link to={paths.reprice} className="inline-flex items-center gap-2 rounded-md border border-walnut-200 bg-white px-4 py-2 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
                <RefreshCw className="h-4 w-4" aria-hidden /> Reprice estimates
              </Link>
              <Button onClick={() => setAdding(true)}>
                <Plus className="h-4 w-4" aria-hidden /> Add material
              </Button>
            </>
          )
        }
      />
      {isOwner && <RepriceAfterPriceChange />}
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <SearchBox value={table.state.q} onSearch={table.setSearch} label="Search materials, suppliers and codes" placeholder="Search material, supplier or code" className="w-80" />
        <select aria-label="Filter by kind" value={table.state.filters.kind} onChange={(e) => table.setFilter('kind', e.target.value)} className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
          <option value="">All kinds</option>
          {MATERIAL_KINDS.map((k) => (
            <option key={k} value={k}>{MATERIAL_KIND_LABELS[k]}</option>
          ))}
        </select>
        <select aria-label="Show" value={table.state.filters.archived} onChange={(e) => table.setFilter('archived', e.target.value)} className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
          <option value="">In use</option>
          <option value="archived">Archived</option>
          <option value="all">All</option>
        </select>
      </div>
      {update.isError && (
        <div className="mb-4">
          <Alert tone="error" title="Change not saved">{update.error.message}</Alert>
        </div>
      )}
      <PagedTable
        caption="Materials"
        columns={columns}
        rowKey={(m) => m.id}
        query={materials}
        table={table}
        pageSize={PAGE_SIZE}
        empty="No material matches."
        errorTitle="The price list could not be loaded"
      />
      <AddMaterialDialog open={adding} onClose={() => setAdding(false)} currency={currency} />
      <AddPackDialog material={addingPackTo} onClose={() => setAddingPackTo(null)} currency={currency} />
    </>
  );
}
