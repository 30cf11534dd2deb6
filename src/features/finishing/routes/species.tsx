import { Archive, ArchiveRestore, Circle, CircleDashed, CircleDot, Pencil, Plus } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { PORES } from '@shared/schemas/catalog';
import { CreateSpeciesSchema, type SpeciesDto, type SpeciesListQuery } from '@shared/schemas/finishing-admin';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { Dialog } from '@/components/dialog';
import { SelectField, TextField } from '@/components/field';
import { SearchBox } from '@/components/search-box';
import { PagedTable } from '@/components/paged-table';
import { useMe } from '@/lib/me';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useTableState } from '@/lib/use-table-state';
import { useCreateSpecies, useSpecies, useUpdateSpecies } from '../api/finishing';

const PAGE_SIZE = 20;
const PORE_LABELS: Record<(typeof PORES)[number], string> = { open: 'Open-pored', closed: 'Closed-pored', ebonised: 'Ebonised' };

/** Add a species or edit one: the same fields, validated by the shared schema first. */
function SpeciesDialog({ editing, open, onClose }: { editing: SpeciesDto | null; open: boolean; onClose: () => void }) {
  const create = useCreateSpecies();
  const update = useUpdateSpecies();
  const initial = () => ({ name: editing?.name ?? '', pores: editing?.pores ?? ('open' as SpeciesDto['pores']), needsGrainFill: editing?.needsGrainFill ?? true, absorbency: String(editing?.absorbency ?? '1.2') });
  const [form, setForm] = useState(initial);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const close = () => {
    setErrors({});
    create.reset();
    update.reset();
    onClose();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const body = { name: form.name.trim(), pores: form.pores, needsGrainFill: form.needsGrainFill, absorbency: form.absorbency === '' ? Number.NaN : Number(form.absorbency.replace(',', '.')) };
    const parsed = CreateSpeciesSchema.safeParse(body);
    if (!parsed.success) {
      const found = zodFieldErrors(parsed.error);
      if (found.absorbency && /NaN|number/.test(found.absorbency)) found.absorbency = 'must be a number between 0.5 and 3';
      return setErrors(found);
    }
    setErrors({});
    const onError = (err: Error) => setErrors(serverFieldErrors(err));
    if (editing) update.mutate({ id: editing.id, ...body }, { onSuccess: close, onError });
    else create.mutate(body, { onSuccess: close, onError });
  };
  const failed = create.error ?? update.error;
  return (
    <Dialog title={editing ? `Edit ${editing.name}` : 'Add a wood species'} open={open} onClose={close}>
      <form onSubmit={submit} noValidate className="space-y-4">
        {failed && <Alert tone="error" title="Not saved">{failed.message}</Alert>}
        <TextField label="Name" value={form.name} onChange={(e) => setForm({ ...form, name: e.target.value })} error={errors.name ?? errors.key} />
        <SelectField label="Pores" options={PORES.map((p) => ({ value: p, label: PORE_LABELS[p] }))} value={form.pores} onChange={(e) => setForm({ ...form, pores: e.target.value as SpeciesDto['pores'] })} error={errors.pores} />
        <label className="flex items-center gap-2 text-sm text-walnut-800">
          <input type="checkbox" checked={form.needsGrainFill} onChange={(e) => setForm({ ...form, needsGrainFill: e.target.checked })} className="h-4 w-4 accent-amber-600" />
          Needs grain filling before a full gloss
        </label>
        <TextField label="Absorbency (× polish on the first coats)" inputMode="decimal" hint="1 = no extra; 1.3 = 30 % more polish on bare wood" value={form.absorbency} onChange={(e) => setForm({ ...form, absorbency: e.target.value })} error={errors.absorbency} />
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={create.isPending || update.isPending}>{editing ? 'Save species' : 'Add species'}</Button>
        </div>
      </form>
    </Dialog>
  );
}

export function SpeciesPage() {
  const me = useMe();
  const isOwner = can(me.data?.role, 'editFinishing');
  const table = useTableState({ sort: 'name', filters: ['archived'] });
  const [dialog, setDialog] = useState<{ editing: SpeciesDto | null } | null>(null);
  const update = useUpdateSpecies();
  const query: Partial<SpeciesListQuery> = {
    q: table.state.q || undefined,
    archived: (table.state.filters.archived as SpeciesListQuery['archived']) || undefined,
    sort: table.state.sort as SpeciesListQuery['sort'],
    dir: table.state.dir,
    page: table.state.page,
    pageSize: PAGE_SIZE,
  };
  const species = useSpecies(query);
  const columns: Column<SpeciesDto>[] = [
    { key: 'name', header: 'Species', sortKey: 'name', render: (s) => <span className="font-medium text-walnut-900">{s.name}{s.archived && <span className="ml-2 text-xs font-normal text-walnut-500">(archived)</span>}</span> },
    {
      key: 'pores',
      header: 'Pores',
      sortKey: 'pores',
      render: (s) => (
        <span className="inline-flex items-center gap-1 text-walnut-700">
          {s.pores === 'open' ? <CircleDashed className="h-3.5 w-3.5 text-amber-600" aria-hidden /> : s.pores === 'closed' ? <Circle className="h-3.5 w-3.5 text-walnut-400" aria-hidden /> : <CircleDot className="h-3.5 w-3.5 text-walnut-900" aria-hidden />}{' '}
          {PORE_LABELS[s.pores]}
        </span>
      ),
    },
    { key: 'grain', header: 'Grain filling', render: (s) => (s.needsGrainFill ? 'needed' : 'not needed') },
    { key: 'absorbency', header: 'Absorbency', sortKey: 'absorbency', align: 'right', render: (s) => `× ${s.absorbency.toFixed(2)}` },
    ...(isOwner
      ? [
          {
            key: 'actions',
            header: 'Actions',
            render: (s: SpeciesDto) => (
              <div className="flex gap-1">
                <Button size="sm" variant="ghost" onClick={() => setDialog({ editing: s })} aria-label={`Edit ${s.name}`}>
                  <Pencil className="h-3.5 w-3.5" aria-hidden /> Edit
                </Button>
                <Button size="sm" variant="ghost" onClick={() => update.mutate({ id: s.id, archived: !s.archived })}>
                  {s.archived ? <ArchiveRestore className="h-3.5 w-3.5" aria-hidden /> : <Archive className="h-3.5 w-3.5" aria-hidden />} {s.archived ? 'Restore' : 'Archive'}
                </Button>
              </div>
            ),
          },
        ]
      : []),
  ];
  return (
    <>
      <PageHeader
        title="Wood species"
        description="How each wood takes polish: open pores need grain filling, and thirsty woods drink more polish in the first coats."
        actions={isOwner && <Button onClick={() => setDialog({ editing: null })}><Plus className="h-4 w-4" aria-hidden /> Add species</Button>}
      />
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <SearchBox value={table.state.q} onSearch={table.setSearch} label="Search species" placeholder="Search species" className="w-64" />
        <select aria-label="Show" value={table.state.filters.archived} onChange={(e) => table.setFilter('archived', e.target.value)} className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
          <option value="">In use</option>
          <option value="archived">Archived</option>
          <option value="all">All</option>
        </select>
      </div>
      {update.isError && <div className="mb-4"><Alert tone="error" title="Not changed">{update.error.message}</Alert></div>}
      <PagedTable
        caption="Wood species"
        columns={columns}
        rowKey={(s) => s.id}
        query={species}
        table={table}
        pageSize={PAGE_SIZE}
        empty="No species matches."
        errorTitle="Species could not be loaded"
      />
      {dialog && <SpeciesDialog editing={dialog.editing} open onClose={() => setDialog(null)} />}
    </>
  );
}

export const Component = SpeciesPage;
