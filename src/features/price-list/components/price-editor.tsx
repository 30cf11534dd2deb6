import { CalendarClock, Check, Tag, X } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { NewPriceSchema, type PackDto } from '@shared/schemas/price-list';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { formatDate, formatMoney, todayIso } from '@/lib/format';
import { useSetPackPrice } from '../api/price-list';
import { ChangeBadge } from './change-badge';

/**
 * A pack's price in force, and for the owner an in-place form for a new price from a date. The old price stays in
 * the history; a date in the future books the price ahead.
 */
export function PackPrice({ pack, unit, currency, canEdit, materialName }: { pack: PackDto; unit: string; currency: string; canEdit: boolean; materialName: string }) {
  const [editing, setEditing] = useState(false);
  const [form, setForm] = useState({ price: pack.price ?? '', effectiveFrom: todayIso() });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const setPrice = useSetPackPrice();
  const label = `${materialName}, ${pack.size} ${unit}`;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = NewPriceSchema.safeParse(form);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    setPrice.mutate(
      { packId: pack.id, ...parsed.data },
      { onSuccess: () => setEditing(false), onError: (err) => setErrors({ price: err.message, ...serverFieldErrors(err) }) },
    );
  };

  if (editing) {
    return (
      <form onSubmit={submit} className="flex flex-wrap items-start gap-1.5" aria-label={`New price for ${label}`}>
        <label className="flex flex-col text-xs text-walnut-600">
          New price ({currency})
          <input
            aria-label={`New price for ${label}`}
            aria-invalid={errors.price ? true : undefined}
            inputMode="decimal"
            autoFocus
            value={form.price}
            onChange={(e) => setForm({ ...form, price: e.target.value })}
            onKeyDown={(e) => e.key === 'Escape' && setEditing(false)}
            className={`num w-24 rounded border px-2 py-1 text-sm text-walnut-900 ${errors.price ? 'border-brick-600' : 'border-amber-400'}`}
          />
        </label>
        <label className="flex flex-col text-xs text-walnut-600">
          From
          <input
            type="date"
            aria-label={`Price effective from, ${label}`}
            aria-invalid={errors.effectiveFrom ? true : undefined}
            value={form.effectiveFrom}
            onChange={(e) => setForm({ ...form, effectiveFrom: e.target.value })}
            className={`rounded border px-2 py-1 text-sm text-walnut-900 ${errors.effectiveFrom ? 'border-brick-600' : 'border-amber-400'}`}
          />
        </label>
        <div className="mt-4 flex">
          <button type="submit" disabled={setPrice.isPending} className="rounded p-1 text-moss-700 hover:bg-moss-100" aria-label={`Save price for ${label}`}>
            <Check className="h-4 w-4" aria-hidden />
          </button>
          <button type="button" onClick={() => setEditing(false)} className="rounded p-1 text-walnut-500 hover:bg-walnut-50" aria-label="Cancel">
            <X className="h-4 w-4" aria-hidden />
          </button>
        </div>
        {(errors.price || errors.effectiveFrom) && (
          <p className="basis-full text-xs text-brick-700" role="alert">
            <span aria-hidden>▲</span> {errors.price ? `Price ${errors.price}` : `Date ${errors.effectiveFrom}`}
          </p>
        )}
      </form>
    );
  }

  return (
    <span className="inline-flex flex-wrap items-center gap-1.5">
      {pack.price === null ? (
        <span className="text-walnut-400">no price</span>
      ) : (
        <span className="num font-semibold text-walnut-900" data-testid={`price-${pack.supplierCode ?? pack.id}`}>
          {formatMoney(pack.price, currency)}
        </span>
      )}
      <ChangeBadge pct={pack.changePct} title={pack.previousPrice ? `was ${formatMoney(pack.previousPrice, currency)}` : undefined} />
      {pack.nextPrice && pack.nextFrom && (
        <span className="inline-flex items-center gap-1 text-xs text-amber-700" title="Booked ahead">
          <CalendarClock className="h-3.5 w-3.5" aria-hidden /> {formatMoney(pack.nextPrice, currency)} from {formatDate(pack.nextFrom)}
        </span>
      )}
      {canEdit && !pack.archived && (
        <button
          type="button"
          onClick={() => {
            setForm({ price: pack.price ?? '', effectiveFrom: todayIso() });
            setErrors({});
            setEditing(true);
          }}
          className="inline-flex items-center gap-0.5 rounded px-1 py-0.5 text-xs text-amber-700 hover:bg-amber-50"
          aria-label={`New price for ${label}`}
        >
          <Tag className="h-3 w-3" aria-hidden /> New price
        </button>
      )}
    </span>
  );
}
