import { Check, Pencil, X } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import type { z } from 'zod';

/**
 * A value shown as text that the owner can click to edit in place. Validates with a shared schema before saving
 * and shows the server's message when it refuses.
 */
export function InlineText({
  value,
  label,
  schema,
  multiline,
  placeholder,
  canEdit,
  onSave,
  className = '',
}: {
  value: string;
  label: string;
  schema: z.ZodType<string | undefined>;
  multiline?: boolean;
  placeholder?: string;
  canEdit: boolean;
  onSave: (next: string) => Promise<unknown>;
  className?: string;
}) {
  const [editing, setEditing] = useState(false);
  const [draft, setDraft] = useState(value);
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);
  if (!canEdit) return <span className={className}>{value || <span className="text-walnut-400">{placeholder ?? '—'}</span>}</span>;
  if (!editing) {
    return (
      <button
        type="button"
        onClick={() => {
          setDraft(value);
          setError(undefined);
          setEditing(true);
        }}
        className={`group inline-flex max-w-full items-start gap-1.5 rounded px-1 -mx-1 text-left hover:bg-amber-50 ${className}`}
        aria-label={`Edit ${label}`}
      >
        <span className="min-w-0 break-words">{value || <span className="text-walnut-400">{placeholder ?? 'Add'}</span>}</span>
        <Pencil className="mt-0.5 h-3.5 w-3.5 shrink-0 text-walnut-300 group-hover:text-amber-600" aria-hidden />
      </button>
    );
  }
  const submit = async (e?: FormEvent) => {
    e?.preventDefault();
    const parsed = schema.safeParse(draft);
    if (!parsed.success) return setError(parsed.error.issues[0]?.message ?? 'is invalid');
    setBusy(true);
    try {
      await onSave(parsed.data ?? '');
      setEditing(false);
    } catch (err) {
      setError(err instanceof Error ? err.message : 'Not saved');
    } finally {
      setBusy(false);
    }
  };
  const common = {
    'aria-label': label,
    'aria-invalid': error ? true : undefined,
    value: draft,
    autoFocus: true,
    className: `w-full rounded border px-2 py-1 text-sm ${error ? 'border-brick-600' : 'border-amber-400'} focus:outline-none focus:ring-2 focus:ring-amber-200`,
    onKeyDown: (e: React.KeyboardEvent) => e.key === 'Escape' && setEditing(false),
  };
  return (
    <form onSubmit={submit} className="flex min-w-48 flex-col gap-1">
      <div className="flex items-start gap-1">
        {multiline ? <textarea rows={2} {...common} onChange={(e) => setDraft(e.target.value)} /> : <input {...common} onChange={(e) => setDraft(e.target.value)} />}
        <button type="submit" disabled={busy} className="rounded p-1 text-moss-700 hover:bg-moss-100" aria-label={`Save ${label}`}>
          <Check className="h-4 w-4" aria-hidden />
        </button>
        <button type="button" onClick={() => setEditing(false)} className="rounded p-1 text-walnut-500 hover:bg-walnut-50" aria-label="Cancel">
          <X className="h-4 w-4" aria-hidden />
        </button>
      </div>
      {error && (
        <p className="text-xs text-brick-700" role="alert">
          <span aria-hidden>▲</span> {error}
        </p>
      )}
    </form>
  );
}
