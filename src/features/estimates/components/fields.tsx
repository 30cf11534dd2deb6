import { useId, type InputHTMLAttributes, type ReactNode } from 'react';
import { parseLength, formatLength, type LengthUnit } from '@shared/units';

const control =
  'block w-full rounded-md border bg-white px-2 py-1.5 text-sm text-walnut-900 placeholder:text-walnut-300 focus:border-amber-500 focus:outline-none focus:ring-2 focus:ring-amber-200';

/** What a length was read as, in both systems, or nothing while it cannot be read. */
export function readLength(value: string, unit: LengthUnit): string | undefined {
  if (value.trim() === '') return undefined;
  try {
    const mm = parseLength(value, unit);
    return `read as ${formatLength(mm, 'metric')} (${formatLength(mm, 'imperial')})`;
  } catch {
    return undefined;
  }
}

/** The message beside a field: an icon and words, never colour alone. */
export function FieldMessage({ id, error, hint }: { id: string; error?: string; hint?: ReactNode }) {
  if (error) {
    return (
      <p id={`${id}-error`} role="alert" className="mt-0.5 flex items-start gap-1 text-xs leading-snug text-brick-700">
        <span aria-hidden>▲</span>
        <span>{error}</span>
      </p>
    );
  }
  if (hint) {
    return (
      <p id={`${id}-hint`} className="mt-0.5 text-xs text-walnut-500">
        {hint}
      </p>
    );
  }
  return null;
}

export interface CellInputProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'onChange' | 'value'> {
  label: string;
  /** Show the label above the input (otherwise it is for screen readers only). */
  showLabel?: boolean;
  value: string;
  onValue: (value: string) => void;
  error?: string;
  hint?: ReactNode;
  suffix?: string;
}

/** A compact input for tables and dense forms, with its message underneath. */
export function CellInput({ label, showLabel = false, value, onValue, error, hint, suffix, className = '', ...rest }: CellInputProps) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className={showLabel ? 'mb-0.5 block text-xs font-medium text-walnut-700' : 'sr-only'}>
        {label}
      </label>
      <div className="flex items-center gap-1">
        <input
          id={id}
          // An explicit type: without one React removes the attribute on every update of the input, and the browser
          // then restyles the whole form (a keystroke in a 200-part table updated hundreds of inputs).
          type="text"
          value={value}
          onChange={(e) => onValue(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
          className={`${control} ${error ? 'border-brick-600 bg-brick-100/30' : 'border-walnut-200'}`}
          {...rest}
        />
        {suffix && <span className="shrink-0 text-xs text-walnut-500">{suffix}</span>}
      </div>
      <FieldMessage id={id} error={error} hint={hint} />
    </div>
  );
}

/** A length typed with its unit ("190 cm", "6 ft 3 in"); says how it was read. */
export function LengthInput({ unit, ...props }: CellInputProps & { unit: LengthUnit }) {
  return <CellInput autoComplete="off" spellCheck={false} hint={props.hint ?? readLength(props.value, unit)} {...props} />;
}

export function CheckField({ label, checked, onChange, hint }: { label: string; checked: boolean; onChange: (v: boolean) => void; hint?: string }) {
  const id = useId();
  return (
    <div className="flex items-start gap-2">
      <input id={id} type="checkbox" checked={checked} onChange={(e) => onChange(e.target.checked)} className="mt-0.5 h-4 w-4 accent-amber-600" />
      <label htmlFor={id} className="text-sm text-walnut-800">
        {label}
        {hint && <span className="block text-xs text-walnut-500">{hint}</span>}
      </label>
    </div>
  );
}

export function MiniSelect<T extends string>({ label, value, options, onChange, showLabel = false, error, hint }: { label: string; value: T; options: { value: T; label: string }[]; onChange: (v: T) => void; showLabel?: boolean; error?: string; hint?: ReactNode }) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className={showLabel ? 'mb-0.5 block text-xs font-medium text-walnut-700' : 'sr-only'}>
        {label}
      </label>
      <select
        id={id}
        value={value}
        onChange={(e) => onChange(e.target.value as T)}
        aria-invalid={error ? true : undefined}
        className={`${control} ${error ? 'border-brick-600' : 'border-walnut-200'}`}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <FieldMessage id={id} error={error} hint={hint} />
    </div>
  );
}
