/** The polishers: hands-on hours a day and days away; planners add and change them. */
import { Pencil, Plus, UserRound } from 'lucide-react';
import { useState } from 'react';
import { PolisherInputSchema, type PolisherDto } from '@shared/schemas/planning';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { usePolishers, useSavePolisher } from '../api/polishers';
import { dayLabel, hoursText } from '../lib/time';

function PolisherDialog({ polisher, onClose }: { polisher: PolisherDto | 'new'; onClose: () => void }) {
  const existing = polisher === 'new' ? null : polisher;
  const [name, setName] = useState(existing?.name ?? '');
  const [hours, setHours] = useState(String(existing?.hoursPerDay ?? 8));
  const [daysOff, setDaysOff] = useState(existing?.daysOff.join(', ') ?? '');
  const [active, setActive] = useState(existing?.active ?? true);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useSavePolisher();

  const submit = async () => {
    const parsed = PolisherInputSchema.safeParse({
      name,
      hoursPerDay: hours === '' ? undefined : Number(hours),
      daysOff: daysOff.split(/[\s,;]+/).filter(Boolean),
      active,
    });
    if (!parsed.success) {
      const found = zodFieldErrors(parsed.error);
      const dayError = Object.entries(found).find(([k]) => k.startsWith('daysOff'));
      setErrors({ ...found, ...(dayError ? { daysOff: `${dayError[1]} (one date per entry, separated by commas)` } : {}) });
      return;
    }
    try {
      await save.mutateAsync({ ...parsed.data, ...(existing ? { id: existing.id } : {}) });
      onClose();
    } catch (err) {
      setErrors(serverFieldErrors(err));
    }
  };

  return (
    <Dialog title={existing ? `Change ${existing.name}` : 'Add a polisher'} open onClose={onClose}>
      <form
        noValidate
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          void submit();
        }}
      >
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
        <TextField label="Hands-on hours a day (h)" type="number" step="0.5" min="0.5" max="12" value={hours} onChange={(e) => setHours(e.target.value)} error={errors.hoursPerDay} hint="Never more than the day's opening hours are used. A session must fit one person's day." />
        <TextField label="Days off" value={daysOff} onChange={(e) => setDaysOff(e.target.value)} error={errors.daysOff} hint="Dates like 2027-02-01, separated by commas." placeholder="2027-02-01, 2027-02-02" />
        <label className="flex items-center gap-2 text-sm text-walnut-800">
          <input type="checkbox" checked={active} onChange={(e) => setActive(e.target.checked)} className="accent-amber-600" />
          Works in the workshop now (inactive polishers take no new sessions)
        </label>
        {save.error && !Object.keys(errors).length && <Alert tone="error" title="Not saved">{save.error.message}</Alert>}
        <div className="flex justify-end gap-2">
          <Button variant="ghost" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={save.isPending}>
            {existing ? 'Save' : 'Add polisher'}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

export function PolishersCard({ canEdit, today }: { canEdit: boolean; today: string }) {
  const polishers = usePolishers();
  const [editing, setEditing] = useState<PolisherDto | 'new' | null>(null);
  return (
    <Card
      title="Polishers"
      actions={
        canEdit && (
          <Button size="sm" variant="secondary" onClick={() => setEditing('new')}>
            <Plus className="h-3.5 w-3.5" aria-hidden /> Add a polisher
          </Button>
        )
      }
    >
      {polishers.isError && <Alert tone="error">{polishers.error.message}</Alert>}
      <ul className="divide-y divide-parchment-200">
        {(polishers.data ?? []).map((p) => {
          const coming = p.daysOff.filter((d) => d >= today);
          return (
            <li key={p.id} className="flex items-center gap-3 py-2.5">
              <UserRound className={`h-5 w-5 shrink-0 ${p.active ? 'text-walnut-600' : 'text-walnut-300'}`} aria-hidden />
              <div className="min-w-0 flex-1">
                <p className="font-medium text-walnut-900">
                  {p.name} {!p.active && <span className="ml-1 rounded-full border border-dotted border-walnut-300 px-2 text-xs font-normal text-walnut-500">inactive</span>}
                </p>
                <p className="text-sm text-walnut-600">
                  {hoursText(p.hoursPerDay)} hands-on a day · {coming.length === 0 ? 'no days off ahead' : `off ${coming.slice(0, 3).map(dayLabel).join(', ')}${coming.length > 3 ? ` and ${coming.length - 3} more` : ''}`}
                </p>
              </div>
              {canEdit && (
                <Button size="sm" variant="ghost" onClick={() => setEditing(p)} aria-label={`Change ${p.name}`}>
                  <Pencil className="h-3.5 w-3.5" aria-hidden /> Change
                </Button>
              )}
            </li>
          );
        })}
      </ul>
      {editing && <PolisherDialog polisher={editing} onClose={() => setEditing(null)} />}
    </Card>
  );
}
