import { Camera, Eye, EyeOff, Send } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import {
  CUSTODY_LABELS,
  CUSTODY_EVENTS,
  KEEP_SCOPE_LABELS,
  PHOTO_PHASES,
  PHOTO_PHASE_LABELS,
  VARIATION_STATE_LABELS,
  type CustodyEvent,
  type JobEndDto,
  type KeepScope,
  type PhotoPhase,
} from '@shared/schemas/job-end';
import { CUSTODY_MOVES } from '@shared/schemas/state-moves';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { SelectField, TextField } from '@/components/field';
import { ApiError } from '@/lib/api';
import { formatDate, formatDateTime, formatMoney } from '@/lib/format';
import { useCan } from '@/lib/permissions';
import {
  useAddNote,
  useAddProgressPhotos,
  useCreateVariation,
  useJobEnd,
  useKeepPolisher,
  useMoveCustody,
  useSendVariation,
  useSetLogistics,
  useSharePhoto,
  useWithdrawVariation,
} from '../api/job-end';
import { usePolishers } from '../api/polishers';

const EVENT_BUTTON: Record<CustodyEvent, string> = { arrive: 'The piece has arrived', ready: 'Mark ready', return: 'The piece has gone home', reopen: 'Back into the work' };
const fieldError = (e: unknown, f: string) => (e instanceof ApiError ? e.fieldMessage(f) : undefined);

/** Collection and return, where the piece is, and the move buttons the state table allows. */
function Logistics({ end, canPlan }: { end: JobEndDto; canPlan: boolean }) {
  const save = useSetLogistics(end.jobId);
  const move = useMoveCustody(end.jobId);
  const [form, setForm] = useState({ collectionDate: end.collectionDate ?? '', collectionArrangement: end.collectionArrangement, returnDate: end.returnDate ?? '', returnArrangement: end.returnArrangement });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate({ collectionDate: form.collectionDate || null, collectionArrangement: form.collectionArrangement, returnDate: form.returnDate || null, returnArrangement: form.returnArrangement });
  };
  const moves = CUSTODY_EVENTS.filter((ev) => CUSTODY_MOVES[ev].from.includes(end.custody));
  return (
    <Card title="Collection and return">
      <p className="mb-3 text-sm text-walnut-800" data-testid="job-custody">
        The piece is <strong>{CUSTODY_LABELS[end.custody].toLowerCase()}</strong>
        {end.collectedOn ? ` · arrived ${formatDate(end.collectedOn)}` : ''}
        {end.completedOn ? ` · finished ${formatDate(end.completedOn)}` : ''}
        {end.returnedOn ? ` · returned ${formatDate(end.returnedOn)}` : ''}
      </p>
      {canPlan && moves.length > 0 && (
        <div className="mb-4 flex flex-wrap gap-2">
          {moves.map((ev) => (
            <Button key={ev} size="sm" variant={ev === 'reopen' ? 'ghost' : 'secondary'} busy={move.isPending && move.variables === ev} onClick={() => move.mutate(ev)}>
              {EVENT_BUTTON[ev]}
            </Button>
          ))}
        </div>
      )}
      {move.isError && <Alert tone="error" title="Not moved">{move.error.message}</Alert>}
      <form className="grid grid-cols-1 gap-3 sm:grid-cols-2" onSubmit={submit}>
        <TextField label="Collection date" type="date" value={form.collectionDate} disabled={!canPlan} onChange={(e) => setForm({ ...form, collectionDate: e.target.value })} error={fieldError(save.error, 'collectionDate')} />
        <TextField label="Who collects, and how" value={form.collectionArrangement} maxLength={300} disabled={!canPlan} placeholder="The workshop collects; the customer brings it; a removal firm…" onChange={(e) => setForm({ ...form, collectionArrangement: e.target.value })} error={fieldError(save.error, 'collectionArrangement')} />
        <TextField label="Return date" type="date" value={form.returnDate} disabled={!canPlan} onChange={(e) => setForm({ ...form, returnDate: e.target.value })} error={fieldError(save.error, 'returnDate')} />
        <TextField label="How it goes home" value={form.returnArrangement} maxLength={300} disabled={!canPlan} onChange={(e) => setForm({ ...form, returnArrangement: e.target.value })} error={fieldError(save.error, 'returnArrangement')} />
        {canPlan && (
          <div className="sm:col-span-2">
            <Button type="submit" size="sm" busy={save.isPending}>
              Save dates
            </Button>
          </div>
        )}
      </form>
      {save.isError && !fieldError(save.error, 'returnDate') && !fieldError(save.error, 'collectionDate') && <Alert tone="error" title="Not saved">{save.error.message}</Alert>}
    </Card>
  );
}

/** The hand kept on the job or its bodying. */
function Keep({ end, canPlan }: { end: JobEndDto; canPlan: boolean }) {
  const polishers = usePolishers();
  const keep = useKeepPolisher(end.jobId);
  const [polisher, setPolisher] = useState(end.keep ? String(end.keep.polisher.id) : '');
  const [scope, setScope] = useState<KeepScope>(end.keep?.scope ?? 'bodying');
  return (
    <Card title="The hand on the job">
      <p className="mb-3 text-sm text-walnut-700" data-testid="job-keep">
        {end.keep ? `${end.keep.polisher.name} is kept on ${KEEP_SCOPE_LABELS[end.keep.scope]}: booking gives those sessions to no one else unless the planner overrides it.` : 'No polisher is kept: booking gives each session to whoever is free.'}
      </p>
      {canPlan && (
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-3 sm:items-end">
          <SelectField
            label="Polisher"
            value={polisher}
            onChange={(e) => setPolisher(e.target.value)}
            options={[{ value: '', label: 'No one kept' }, ...(polishers.data ?? []).filter((p) => p.active).map((p) => ({ value: String(p.id), label: p.name }))]}
            error={fieldError(keep.error, 'polisherId')}
          />
          <SelectField label="Kept on" value={scope} onChange={(e) => setScope(e.target.value as KeepScope)} options={(['bodying', 'job'] as const).map((s) => ({ value: s, label: KEEP_SCOPE_LABELS[s] }))} />
          <Button size="sm" variant="secondary" busy={keep.isPending} onClick={() => keep.mutate({ polisherId: polisher ? Number(polisher) : null, scope })}>
            Keep
          </Button>
        </div>
      )}
    </Card>
  );
}

function Notes({ end }: { end: JobEndDto }) {
  const add = useAddNote(end.jobId);
  const [body, setBody] = useState('');
  return (
    <Card title="Staff notes">
      <form
        className="mb-3 flex flex-col gap-2 sm:flex-row sm:items-end"
        onSubmit={(e) => {
          e.preventDefault();
          add.mutate(body, { onSuccess: () => setBody('') });
        }}
      >
        <TextField className="flex-1" label="Add a note (staff only)" value={body} maxLength={4000} onChange={(e) => setBody(e.target.value)} error={fieldError(add.error, 'body')} />
        <Button type="submit" size="sm" busy={add.isPending}>
          Add note
        </Button>
      </form>
      {end.notes.length === 0 ? (
        <p className="text-sm text-walnut-600">No notes yet.</p>
      ) : (
        <ul className="divide-y divide-parchment-200 text-sm" data-testid="job-notes">
          {end.notes.map((n) => (
            <li key={n.id} className="py-2">
              <p className="whitespace-pre-line text-walnut-900">{n.body}</p>
              <p className="text-xs text-walnut-500">
                {n.author?.name ?? 'former user'} · {formatDateTime(n.createdAt)}
              </p>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

function Photos({ end, canRecord }: { end: JobEndDto; canRecord: boolean }) {
  const add = useAddProgressPhotos(end.jobId);
  const share = useSharePhoto(end.jobId);
  const [phase, setPhase] = useState<PhotoPhase>('during');
  const [caption, setCaption] = useState('');
  const [files, setFiles] = useState<File[]>([]);
  return (
    <Card title="Progress photos">
      {canRecord && (
        <form
          className="mb-4 grid grid-cols-1 gap-3 sm:grid-cols-4 sm:items-end"
          onSubmit={(e) => {
            e.preventDefault();
            add.mutate({ phase, files, caption }, { onSuccess: () => { setFiles([]); setCaption(''); } });
          }}
        >
          <SelectField label="When" value={phase} onChange={(e) => setPhase(e.target.value as PhotoPhase)} options={PHOTO_PHASES.map((p) => ({ value: p, label: PHOTO_PHASE_LABELS[p] }))} />
          <TextField label="Caption" value={caption} maxLength={300} onChange={(e) => setCaption(e.target.value)} />
          <TextField label="Photos" type="file" accept="image/jpeg,image/png,image/webp" multiple onChange={(e) => setFiles([...(e.target.files ?? [])])} error={fieldError(add.error, 'photos')} />
          <Button type="submit" size="sm" busy={add.isPending} disabled={files.length === 0}>
            <Camera className="h-4 w-4" aria-hidden /> Add
          </Button>
        </form>
      )}
      {add.isError && !fieldError(add.error, 'photos') && <Alert tone="error" title="Not added">{add.error.message}</Alert>}
      {end.photos.length === 0 ? (
        <p className="text-sm text-walnut-600">No progress photos yet.</p>
      ) : (
        <ul className="grid grid-cols-2 gap-3 sm:grid-cols-4" data-testid="job-photos">
          {end.photos.map((p) => (
            <li key={p.id} className="text-xs text-walnut-700">
              <img src={p.thumbUrl} alt={p.caption || `${PHOTO_PHASE_LABELS[p.phase]} photo`} className="aspect-[4/3] w-full rounded-md object-cover" loading="lazy" />
              <p className="mt-1">{PHOTO_PHASE_LABELS[p.phase]}{p.caption ? `: ${p.caption}` : ''}</p>
              {canRecord && (
                <Button size="sm" variant="ghost" busy={share.isPending && share.variables?.photoId === p.id} onClick={() => share.mutate({ photoId: p.id, shared: !p.shared })}>
                  {p.shared ? <Eye className="h-4 w-4" aria-hidden /> : <EyeOff className="h-4 w-4" aria-hidden />} {p.shared ? 'Shown to the customer' : 'Not shown to the customer'}
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

function Variations({ end, canPropose }: { end: JobEndDto; canPropose: boolean }) {
  const create = useCreateVariation(end.jobId);
  const send = useSendVariation(end.jobId);
  const withdraw = useWithdrawVariation(end.jobId);
  const [form, setForm] = useState({ title: '', description: '', price: '', hours: '' });
  const [link, setLink] = useState<string | null>(null);
  return (
    <Card title="Variations: work found during the job">
      {canPropose && (
        <form
          className="mb-4 grid grid-cols-1 gap-3 sm:grid-cols-2"
          onSubmit={(e) => {
            e.preventDefault();
            create.mutate(
              { title: form.title, description: form.description, hand: { price: form.price, hours: Number(form.hours || 0) } },
              { onSuccess: () => setForm({ title: '', description: '', price: '', hours: '' }) },
            );
          }}
        >
          <TextField label="What the work is" value={form.title} maxLength={200} onChange={(e) => setForm({ ...form, title: e.target.value })} error={fieldError(create.error, 'title')} />
          <TextField label="Why, in the customer's words" value={form.description} maxLength={2000} onChange={(e) => setForm({ ...form, description: e.target.value })} error={fieldError(create.error, 'description')} />
          <TextField label="Price, tax included" inputMode="decimal" value={form.price} onChange={(e) => setForm({ ...form, price: e.target.value })} error={fieldError(create.error, 'hand.price') ?? fieldError(create.error, 'hand')} />
          <TextField label="Hands-on hours it adds (h)" inputMode="decimal" value={form.hours} onChange={(e) => setForm({ ...form, hours: e.target.value })} error={fieldError(create.error, 'hand.hours')} />
          <div className="sm:col-span-2">
            <Button type="submit" size="sm" busy={create.isPending}>
              Add variation
            </Button>
          </div>
        </form>
      )}
      {link && (
        <Alert tone="info" title="Sent: the customer's link">
          <span className="break-all" data-testid="variation-link">{link}</span>
        </Alert>
      )}
      {(send.isError || withdraw.isError) && <Alert tone="error" title="Not done">{(send.error ?? withdraw.error)?.message}</Alert>}
      {end.variations.length === 0 ? (
        <p className="text-sm text-walnut-600">No variations.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-sm" data-testid="job-variations">
            <thead>
              <tr className="text-left text-xs uppercase text-walnut-500">
                <th className="py-1 pr-3">Work</th>
                <th className="py-1 pr-3">Priced</th>
                <th className="py-1 pr-3 text-right">Price</th>
                <th className="py-1 pr-3 text-right">Hours</th>
                <th className="py-1 pr-3">State</th>
                <th className="py-1" />
              </tr>
            </thead>
            <tbody>
              {end.variations.map((v) => (
                <tr key={v.id} className="border-t border-parchment-200">
                  <td className="py-1.5 pr-3">{v.title}</td>
                  <td className="py-1.5 pr-3">{v.pricedBy === 'engine' ? `by the engine${v.working ? ` (labour ${formatMoney(v.working.labourCost, v.currency)}, materials ${formatMoney(v.working.materialsCost, v.currency)})` : ''}` : 'by hand'}</td>
                  <td className="num py-1.5 pr-3 text-right">{formatMoney(v.price, v.currency)}</td>
                  <td className="num py-1.5 pr-3 text-right">{v.hours} h</td>
                  <td className="py-1.5 pr-3">{VARIATION_STATE_LABELS[v.state]}</td>
                  <td className="py-1.5 whitespace-nowrap">
                    {canPropose && (v.state === 'draft' || v.state === 'sent') && (
                      <>
                        <Button size="sm" variant="secondary" busy={send.isPending && send.variables === v.id} onClick={() => send.mutate(v.id, { onSuccess: (r) => setLink(r.link ?? null) })}>
                          <Send className="h-4 w-4" aria-hidden /> {v.state === 'sent' ? 'Send again' : 'Send'}
                        </Button>{' '}
                        <Button size="sm" variant="ghost" busy={withdraw.isPending && withdraw.variables === v.id} onClick={() => withdraw.mutate(v.id)}>
                          Withdraw
                        </Button>
                      </>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Card>
  );
}

/** The rest of the job after the deposit, on the staff job page. */
export function JobEndCards({ jobId }: { jobId: number }) {
  const end = useJobEnd(jobId);
  const can = useCan();
  if (end.isPending) return null;
  if (end.isError) return <Alert tone="error" title="Collection, notes and variations could not be shown">{end.error.message}</Alert>;
  const e = end.data;
  return (
    <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
      <Logistics key={`l-${e.collectionDate}-${e.returnDate}-${e.custody}`} end={e} canPlan={can.planRoom} />
      <Keep key={`k-${e.keep?.polisher.id ?? 0}`} end={e} canPlan={can.planRoom} />
      <Variations end={e} canPropose={can.proposeVariations} />
      <Notes end={e} />
      <div className="xl:col-span-2">
        <Photos end={e} canRecord={can.recordProgress} />
      </div>
    </div>
  );
}
