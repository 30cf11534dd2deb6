/** A period of whole days for a report: two dates checked with the server's own schema before they are used. */
import { useState } from 'react';
import { PeriodSchema } from '@shared/schemas/reports';
import { Button } from '@/components/button';
import type { PeriodParams } from '../api/reports';

export function PeriodPicker({ value, onChange, label }: { value: PeriodParams; onChange: (p: PeriodParams) => void; label: string }) {
  const [from, setFrom] = useState(value.from);
  const [to, setTo] = useState(value.to);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const apply = () => {
    const parsed = PeriodSchema.safeParse({ from, to });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0] ?? 'to'), i.message])));
      return;
    }
    setErrors({});
    onChange(parsed.data);
  };
  const field = (name: 'from' | 'to', text: string, v: string, set: (s: string) => void) => (
    <label className="flex flex-col gap-1 text-xs font-semibold text-walnut-700">
      {text}
      <input
        type="date"
        value={v}
        onChange={(e) => set(e.target.value)}
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={errors[name] ? `${label}-${name}-error` : undefined}
        className={`rounded-md border px-2 py-1 text-sm font-normal ${errors[name] ? 'border-brick-600' : 'border-walnut-200'}`}
      />
      {errors[name] && (
        <span id={`${label}-${name}-error`} className="font-normal text-brick-700">
          ▲ {text} {errors[name]}
        </span>
      )}
    </label>
  );
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      aria-label={`Period of the ${label} report`}
      onSubmit={(e) => {
        e.preventDefault();
        apply();
      }}
    >
      {field('from', 'From', from, setFrom)}
      {field('to', 'To', to, setTo)}
      <Button type="submit" size="sm" variant="secondary">
        Show
      </Button>
    </form>
  );
}
