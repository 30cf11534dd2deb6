import { Archive, ArchiveRestore, Copy, Layers, PencilRuler } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { CopySystemSchema, type FinishingSystemDto } from '@shared/schemas/finishing-admin';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import { DataTable, type Column } from '@/components/data-table';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/field';
import { ownerPathTo } from '@/config/paths';
import { useMe } from '@/lib/me';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { formatDate } from '@/lib/format';
import { useLocalTable } from '@/lib/use-local-table';
import { useArchiveSystem, useCopySystem, useSystems } from '../api/finishing';

function CopyDialog({ from, onClose }: { from: FinishingSystemDto | null; onClose: () => void }) {
  const copy = useCopySystem();
  const navigate = useNavigate();
  const [name, setName] = useState('');
  const [error, setError] = useState<string>();
  const close = () => {
    setName('');
    setError(undefined);
    copy.reset();
    onClose();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!from) return;
    const parsed = CopySystemSchema.safeParse({ fromId: from.id, name });
    if (!parsed.success) return setError(zodFieldErrors(parsed.error).name);
    copy.mutate(parsed.data, { onSuccess: (s) => (close(), navigate(ownerPathTo.finishingSystem(s.id))), onError: (err) => setError(serverFieldErrors(err).name ?? err.message) });
  };
  return (
    <Dialog title={`Copy ${from?.name ?? ''}`} open={from !== null} onClose={close}>
      <form onSubmit={submit} noValidate className="space-y-4">
        <p className="text-sm text-walnut-600">The copy starts with the same {from?.stages.length} stages; change it without touching the original.</p>
        <TextField label="Name of the new system" value={name} onChange={(e) => setName(e.target.value)} error={error} />
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={copy.isPending}>Copy system</Button>
        </div>
      </form>
    </Dialog>
  );
}

const value = (s: FinishingSystemDto, key: string) =>
  key === 'stages' ? s.stages.filter((st) => st.enabled).length : key === 'coats' ? s.stages.filter((st) => st.enabled).reduce((n, st) => n + st.sessions * st.coatsPerSession, 0) : key === 'updatedAt' ? s.updatedAt : s.name;

export function SystemsPage() {
  const me = useMe();
  const isOwner = can(me.data?.role, 'editFinishing');
  const [show, setShow] = useState<'active' | 'archived' | 'all'>('active');
  const systems = useSystems(show);
  const archive = useArchiveSystem();
  const [copying, setCopying] = useState<FinishingSystemDto | null>(null);
  const t = useLocalTable(systems.data ?? [], { sort: 'name', pageSize: 15, value });
  const columns: Column<FinishingSystemDto>[] = [
    {
      key: 'name',
      header: 'System',
      sortKey: 'name',
      render: (s) => (
        <div className="max-w-md">
          <Link to={ownerPathTo.finishingSystem(s.id)} className="font-medium text-walnut-900 underline decoration-amber-300 underline-offset-2 hover:decoration-amber-600">{s.name}</Link>
          <p className="text-xs text-walnut-500">{s.description}</p>
        </div>
      ),
    },
    { key: 'stages', header: 'Stages in use', sortKey: 'stages', align: 'right', render: (s) => `${s.stages.filter((st) => st.enabled).length} of ${s.stages.length}` },
    { key: 'coats', header: 'Coats', sortKey: 'coats', align: 'right', render: (s) => `${value(s, 'coats')} coats` },
    {
      key: 'origin',
      header: 'Origin',
      render: (s) => (
        <span className="inline-flex items-center gap-1 rounded-full bg-parchment-100 px-2 py-0.5 text-xs text-walnut-700">
          <Layers className="h-3 w-3 text-amber-600" aria-hidden /> {s.preset ? 'Preset' : 'Workshop’s own'}
          {s.archived && ' · archived'}
        </span>
      ),
    },
    { key: 'updatedAt', header: 'Changed', sortKey: 'updatedAt', render: (s) => <span className="whitespace-nowrap text-walnut-500">{formatDate(s.updatedAt)}</span> },
    {
      key: 'actions',
      header: 'Actions',
      render: (s) => (
        <div className="flex flex-wrap gap-1">
          <Link to={ownerPathTo.finishingSystem(s.id)} className="inline-flex items-center gap-1 rounded px-2.5 py-1 text-sm text-walnut-700 hover:bg-walnut-50">
            <PencilRuler className="h-3.5 w-3.5" aria-hidden /> {isOwner ? 'Edit stages' : 'View stages'}
          </Link>
          {isOwner && (
            <Button size="sm" variant="ghost" onClick={() => setCopying(s)} aria-label={`Copy ${s.name}`}>
              <Copy className="h-3.5 w-3.5" aria-hidden /> Copy
            </Button>
          )}
          {isOwner &&
            (s.archived ? (
              <Button size="sm" variant="ghost" onClick={() => archive.mutate({ id: s.id, archived: false })}>
                <ArchiveRestore className="h-3.5 w-3.5" aria-hidden /> Restore
              </Button>
            ) : (
              <Button size="sm" variant="ghost" onClick={() => window.confirm(`Archive ${s.name}? New estimates can no longer choose it.`) && archive.mutate({ id: s.id, archived: true })}>
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
        title="Finishing systems"
        description={isOwner ? 'The stages the estimator lays out for each kind of job. Copy a preset to make your own; an estimate keeps the stages it was priced with.' : 'The stages the estimator lays out for each kind of job. Only the owner changes them.'}
      />
      <div className="mb-4">
        <select aria-label="Show" value={show} onChange={(e) => setShow(e.target.value as typeof show)} className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
          <option value="active">In use</option>
          <option value="archived">Archived</option>
          <option value="all">All</option>
        </select>
      </div>
      {archive.isError && <div className="mb-4"><Alert tone="error" title="Not changed">{archive.error.message}</Alert></div>}
      {systems.isError ? (
        <Alert tone="error" title="Systems could not be loaded">{systems.error.message}</Alert>
      ) : (
        <DataTable caption="Finishing systems" columns={columns} rowKey={(s) => s.id} loading={systems.isFetching} empty="No system here." {...t} />
      )}
      <CopyDialog from={copying} onClose={() => setCopying(null)} />
    </>
  );
}

export const Component = SystemsPage;
