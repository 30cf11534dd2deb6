import { Check, Clock } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { LabourRateUpdateSchema, type LabourRateDto } from '@shared/schemas/workshop-admin';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { TextField } from '@/components/field';
import { Spinner } from '@/components/spinner';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { formatDateTime } from '@/lib/format';
import { useLabourRates, useUpdateRate } from '../api/settings';

function RateRow({ rate, currency }: { rate: LabourRateDto; currency: string }) {
  const update = useUpdateRate();
  const [form, setForm] = useState({ name: rate.name, perHour: rate.perHour });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);
  const dirty = form.name !== rate.name || form.perHour !== rate.perHour;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = LabourRateUpdateSchema.safeParse(form);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    update.mutate(
      { id: rate.id, ...form },
      { onSuccess: (r) => (setForm({ name: r.name, perHour: r.perHour }), setSaved(true)), onError: (err) => setErrors({ perHour: err.message, ...serverFieldErrors(err) }) },
    );
  };
  return (
    <form onSubmit={submit} noValidate className="grid items-start gap-3 border-b border-parchment-200 py-3 last:border-0 sm:grid-cols-[1fr_12rem_auto]" aria-label={`Labour rate ${rate.name}`}>
      <TextField label={`Role (${rate.key})`} value={form.name} onChange={(e) => (setForm({ ...form, name: e.target.value }), setSaved(false))} error={errors.name} />
      <TextField label={`Per hour (${currency}, before tax)`} inputMode="decimal" value={form.perHour} onChange={(e) => (setForm({ ...form, perHour: e.target.value }), setSaved(false))} error={errors.perHour} className="num" />
      <div className="flex items-center gap-2 sm:pt-6">
        <Button type="submit" size="sm" disabled={!dirty} busy={update.isPending}>Save rate</Button>
        {saved && !dirty && (
          <span className="inline-flex items-center gap-1 text-xs text-moss-700" role="status">
            <Check className="h-3.5 w-3.5" aria-hidden /> Saved
          </span>
        )}
      </div>
      <p className="-mt-2 text-xs text-walnut-400 sm:col-span-3">Last changed {formatDateTime(rate.updatedAt)}</p>
    </form>
  );
}

export function LabourRatesCard({ currency }: { currency: string }) {
  const rates = useLabourRates();
  return (
    <Card title={<span className="inline-flex items-center gap-2"><Clock className="h-4 w-4 text-amber-600" aria-hidden /> Labour rates</span>}>
      <p className="mb-1 text-sm text-walnut-600">What an hour of each role costs the customer before overhead and margin. Each rate saves on its own.</p>
      {rates.isPending && <Spinner />}
      {rates.isError && <Alert tone="error" title="Rates could not be loaded">{rates.error.message}</Alert>}
      {rates.data?.map((r) => <RateRow key={`${r.id}-${r.updatedAt}`} rate={r} currency={currency} />)}
    </Card>
  );
}
