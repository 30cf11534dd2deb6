import { Plus, Trash2 } from 'lucide-react';
import { useId, useState, type FormEvent } from 'react';
import type { Role } from '@shared/schemas/auth';
import type { RevisionSummary } from '@shared/schemas/estimates';
import { CreateQuoteSchema, type CreateQuoteInput, type QuoteDetail } from '@shared/schemas/quotes';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { SelectField, TextField } from '@/components/field';
import { ApiError } from '@/lib/api';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { formatMoney } from '@/lib/format';
import { useEstimates } from '@/features/estimates/api/estimates';
import { useCreateQuote } from '@/features/quotes/api/quotes';

/** A further line of the quote: another estimate of the customer's (another piece, or another way with this one). */
interface LineRow {
  key: number;
  estimateId: number;
  group: number;
  label: string;
  recommended: boolean;
  optional: boolean;
}

const QUOTABLE_STATES = ['priced', 'quoted', 'viewed', 'expired', 'declined'];

interface ExtraRow {
  key: number;
  label: string;
  description: string;
  hours: string;
  price: string;
}

export interface QuoteFormDefaults {
  /** The estimate's current revision and its discount, which the quote starts from. */
  currentRevision: number;
  revisionDiscountPct: number;
  recipient: string;
  depositPct: number;
  /** The largest discount sales may give (the owner is not held to it). */
  maxDiscountPct: number;
  validUntil: string;
  currency: string;
}

const textarea =
  'block w-full rounded-md border bg-white px-3 py-2 text-sm text-walnut-900 shadow-inner shadow-walnut-900/5 focus:border-amber-500 focus:outline-none focus:ring-2 focus:ring-amber-200';

/** A server message names its field first ("discountPct: at most 15 %"); beside the field the name is redundant. */
function withoutField(errors: Record<string, string>): Record<string, string> {
  return Object.fromEntries(Object.entries(errors).map(([field, message]) => [field, message.replace(new RegExp(`^${field.replace(/\./g, '\\.')}: `), '')]));
}

/**
 * Prepares a quote from a priced estimate: which revision, a covering message, optional extras, the discount within
 * the owner's cap, the deposit, how long it stands and who receives it. Checked with the shared schema first, then
 * the server's own field messages show beside the fields.
 */
export function QuoteForm({
  estimateId,
  customerId,
  estimateTitle,
  revisions,
  defaults,
  role,
  onCreated,
  onCancel,
}: {
  estimateId: number;
  /** The customer whose other priced estimates may join the quote as further pieces or options. */
  customerId?: number;
  estimateTitle?: string;
  revisions: RevisionSummary[];
  defaults: QuoteFormDefaults;
  role: Role;
  onCreated: (quote: QuoteDetail) => void;
  onCancel?: () => void;
}) {
  const create = useCreateQuote(estimateId);
  const messageId = useId();
  const [revision, setRevision] = useState(defaults.currentRevision);
  const [message, setMessage] = useState('');
  const [extras, setExtras] = useState<ExtraRow[]>([]);
  const [nextKey, setNextKey] = useState(1);
  const [discount, setDiscount] = useState(String(defaults.revisionDiscountPct));
  const [deposit, setDeposit] = useState(String(defaults.depositPct));
  const [validUntil, setValidUntil] = useState(defaults.validUntil);
  const [recipient, setRecipient] = useState(defaults.recipient);
  const [errors, setErrors] = useState<Record<string, string>>({});
  // Line 1 is this estimate; further lines are the customer's other estimates, each a piece of its own (group) or an
  // option of another line's piece.
  const [first, setFirst] = useState({ label: '', recommended: true, optional: false });
  const [lines, setLines] = useState<LineRow[]>([]);
  const others = useEstimates({ customerId, pageSize: 100 }, { enabled: customerId !== undefined });
  const candidates = (others.data?.rows ?? []).filter((e) => e.id !== estimateId && !e.archived && QUOTABLE_STATES.includes(e.state));
  const setLine = (key: number, patch: Partial<LineRow>) => setLines((rows) => rows.map((r) => (r.key === key ? { ...r, ...patch } : r)));
  const groupCount = Math.max(1, ...lines.map((l) => l.group));

  const capped = !can(role, 'discountBeyondCap');
  const setExtra = (key: number, patch: Partial<ExtraRow>) => setExtras((rows) => rows.map((r) => (r.key === key ? { ...r, ...patch } : r)));
  const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const input: CreateQuoteInput = {
      revision,
      message: message.trim(),
      extras: extras.map((x) => ({ label: x.label, description: x.description, hours: x.hours.trim() === '' ? 0 : num(x.hours), price: x.price.trim().replace(/^[£$€]/, '') })),
      discountPct: discount.trim() === '' ? 0 : num(discount),
      depositPct: num(deposit),
      validUntil: validUntil || undefined,
      recipient: recipient.trim() || undefined,
      ...(lines.length > 0
        ? {
            lines: [
              { estimateId, revision, group: 1, label: first.label.trim(), recommended: first.recommended, optional: first.optional },
              ...lines.map((l) => ({ estimateId: l.estimateId, group: l.group, label: l.label.trim(), recommended: l.recommended, optional: l.optional })),
            ],
          }
        : {}),
    };
    const parsed = CreateQuoteSchema.safeParse(input);
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    create.mutate(input, { onSuccess: onCreated, onError: (err) => setErrors(withoutField(serverFieldErrors(err))) });
  };

  const otherError = create.error instanceof ApiError && create.error.errors.length === 0 ? create.error : create.error && !(create.error instanceof ApiError) ? create.error : null;
  const sorted = [...revisions].sort((a, b) => b.number - a.number);

  return (
    <form onSubmit={submit} noValidate aria-label="Prepare a quote" className="space-y-5">
      <h3 className="font-serif text-lg font-semibold text-walnut-900">Prepare a quote</h3>
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <SelectField
          label="Revision"
          value={String(revision)}
          onChange={(e) => setRevision(Number(e.target.value))}
          error={errors.revision}
          options={sorted.map((r) => ({
            value: String(r.number),
            label: `Revision ${r.number}${r.number === defaults.currentRevision ? ' (current)' : ''}: ${formatMoney(r.total, defaults.currency)}`,
          }))}
        />
        <TextField
          label="Discount (%)"
          inputMode="decimal"
          value={discount}
          onChange={(e) => setDiscount(e.target.value)}
          error={errors.discountPct}
          hint={capped ? `Up to ${defaults.maxDiscountPct} %: the owner’s limit for sales` : `The limit for sales is ${defaults.maxDiscountPct} %; the owner may go beyond it`}
        />
        <TextField label="Deposit (%)" inputMode="decimal" value={deposit} onChange={(e) => setDeposit(e.target.value)} error={errors.depositPct} hint="Paid by card on acceptance" />
        <TextField label="Valid until" type="date" value={validUntil} onChange={(e) => setValidUntil(e.target.value)} error={errors.validUntil} />
      </div>
      <TextField label="Recipient’s e-mail" type="email" value={recipient} onChange={(e) => setRecipient(e.target.value)} error={errors.recipient} hint="The customer’s address on file unless you change it" />
      <div className="space-y-1">
        <label htmlFor={messageId} className="block text-sm font-medium text-walnut-800">Covering message</label>
        <textarea
          id={messageId}
          rows={4}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
          aria-invalid={errors.message ? true : undefined}
          className={`${textarea} ${errors.message ? 'border-brick-600' : 'border-walnut-200'}`}
          placeholder="Thank you for bringing the piece to us. Having looked at it closely, we recommend…"
        />
        {errors.message ? <p className="text-sm text-brick-700" role="alert">▲ {errors.message}</p> : <p className="text-xs text-walnut-500">Opens the e-mail and the PDF; blank lines start new paragraphs.</p>}
      </div>

      {customerId !== undefined && (
        <fieldset className="rounded-lg border border-parchment-200 bg-parchment-50 px-4 py-3" data-testid="quote-lines">
          <legend className="px-1 text-sm font-semibold text-walnut-800">Pieces and options</legend>
          <p className="text-xs text-walnut-500">
            Add the customer’s other priced estimates: a different piece goes in a piece of its own; another way of doing the same piece goes in that piece’s group, as an option the
            customer chooses between. Mark one option of each piece as recommended; the quote’s total is for the recommended choice.
          </p>
          {errors.lines && <p className="mt-1 text-sm text-brick-700" role="alert">▲ {errors.lines}</p>}
          <ol className="mt-3 space-y-3">
            <li className="grid gap-3 rounded-md border border-parchment-200 bg-white p-3 sm:grid-cols-[3fr_8rem_2fr_auto_auto]" aria-label="Line 1">
              <div className="text-sm">
                <p className="font-medium text-walnut-800">Line 1: this estimate</p>
                <p className="text-walnut-600">{estimateTitle ?? ''} (revision {revision})</p>
              </div>
              <p className="self-end text-sm text-walnut-700">Piece 1</p>
              <TextField label="Line 1: option name" value={first.label} onChange={(e) => setFirst({ ...first, label: e.target.value })} placeholder="Full repolish" />
              <label className="flex items-end gap-2 text-sm"><input type="checkbox" checked={first.recommended} onChange={(e) => setFirst({ ...first, recommended: e.target.checked })} aria-label="Line 1: recommended" /> Recommended</label>
              <label className="flex items-end gap-2 text-sm"><input type="checkbox" checked={first.optional} onChange={(e) => setFirst({ ...first, optional: e.target.checked })} aria-label="Line 1: piece may be left out" /> May be left out</label>
            </li>
            {lines.map((l, i) => (
              <li key={l.key} className="grid gap-3 rounded-md border border-parchment-200 bg-white p-3 sm:grid-cols-[3fr_8rem_2fr_auto_auto_auto]" aria-label={`Line ${i + 2}`}>
                <SelectField
                  label={`Line ${i + 2}: estimate`}
                  value={String(l.estimateId)}
                  onChange={(e) => setLine(l.key, { estimateId: Number(e.target.value) })}
                  error={errors[`lines.${i + 1}.estimateId`]}
                  options={candidates.map((e) => ({ value: String(e.id), label: `${e.number}: ${e.title} (${e.piece.description}), ${formatMoney(e.total, e.currency)}` }))}
                />
                <SelectField
                  label={`Line ${i + 2}: piece`}
                  value={String(l.group)}
                  onChange={(e) => setLine(l.key, { group: Number(e.target.value) })}
                  options={Array.from({ length: groupCount + 1 }, (_, g) => ({ value: String(g + 1), label: g + 1 > groupCount ? `Piece ${g + 1} (new)` : `Piece ${g + 1}` }))}
                />
                <TextField label={`Line ${i + 2}: option name`} value={l.label} onChange={(e) => setLine(l.key, { label: e.target.value })} placeholder="Re-body and refresh" />
                <label className="flex items-end gap-2 text-sm"><input type="checkbox" checked={l.recommended} onChange={(e) => setLine(l.key, { recommended: e.target.checked })} aria-label={`Line ${i + 2}: recommended`} /> Recommended</label>
                <label className="flex items-end gap-2 text-sm"><input type="checkbox" checked={l.optional} onChange={(e) => setLine(l.key, { optional: e.target.checked })} aria-label={`Line ${i + 2}: piece may be left out`} /> May be left out</label>
                <div className="flex items-end">
                  <Button size="sm" variant="ghost" aria-label={`Remove line ${i + 2}`} onClick={() => setLines((rows) => rows.filter((r) => r.key !== l.key))}>
                    <Trash2 className="h-4 w-4" aria-hidden /> Remove
                  </Button>
                </div>
              </li>
            ))}
          </ol>
          <Button
            size="sm"
            variant="secondary"
            className="mt-3"
            disabled={lines.length >= 11 || candidates.length === 0}
            onClick={() => {
              setLines((rows) => [...rows, { key: nextKey, estimateId: candidates[0]!.id, group: groupCount + 1, label: '', recommended: false, optional: false }]);
              setNextKey((k) => k + 1);
            }}
          >
            <Plus className="h-3.5 w-3.5" aria-hidden /> Add another estimate
          </Button>
          {others.data && candidates.length === 0 && <p className="mt-2 text-xs text-walnut-500">The customer has no other priced estimate to add.</p>}
        </fieldset>
      )}

      <fieldset className="rounded-lg border border-parchment-200 bg-parchment-50 px-4 py-3">
        <legend className="px-1 text-sm font-semibold text-walnut-800">Optional extras</legend>
        <p className="text-xs text-walnut-500">Other work the customer may take or leave, each priced on its own before tax; not in the quote’s total.</p>
        {errors.extras && <p className="mt-1 text-sm text-brick-700" role="alert">▲ {errors.extras}</p>}
        <ol className="mt-3 space-y-3">
          {extras.map((x, i) => (
            <li key={x.key} className="grid gap-3 rounded-md border border-parchment-200 bg-white p-3 sm:grid-cols-[2fr_3fr_6rem_10rem_auto]" aria-label={`Extra ${i + 1}`}>
              <TextField label={`Extra ${i + 1}: label`} value={x.label} onChange={(e) => setExtra(x.key, { label: e.target.value })} error={errors[`extras.${i}.label`]} placeholder="Regulate the action" />
              <TextField label="Description" value={x.description} onChange={(e) => setExtra(x.key, { description: e.target.value })} error={errors[`extras.${i}.description`]} />
              <TextField label="Hours (h)" inputMode="decimal" value={x.hours} onChange={(e) => setExtra(x.key, { hours: e.target.value })} error={errors[`extras.${i}.hours`]} />
              <TextField label={`Price (${defaults.currency}, pre-tax)`} inputMode="decimal" value={x.price} onChange={(e) => setExtra(x.key, { price: e.target.value })} error={errors[`extras.${i}.price`]} placeholder="300.00" />
              <div className="flex items-end">
                <Button size="sm" variant="ghost" aria-label={`Remove extra ${i + 1}`} onClick={() => setExtras((rows) => rows.filter((r) => r.key !== x.key))}>
                  <Trash2 className="h-4 w-4" aria-hidden /> Remove
                </Button>
              </div>
            </li>
          ))}
        </ol>
        <Button
          size="sm"
          variant="secondary"
          className="mt-3"
          disabled={extras.length >= 12}
          onClick={() => {
            setExtras((rows) => [...rows, { key: nextKey, label: '', description: '', hours: '', price: '' }]);
            setNextKey((k) => k + 1);
          }}
        >
          <Plus className="h-3.5 w-3.5" aria-hidden /> Add an extra
        </Button>
      </fieldset>

      {otherError && <Alert tone="error" title="The quote was not made">{otherError.message}</Alert>}
      {Object.keys(errors).length > 0 && !otherError && <Alert tone="error" title="Check the marked fields">Nothing was saved.</Alert>}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={create.isPending}>Prepare the quote</Button>
        {onCancel && <Button variant="ghost" onClick={onCancel}>Cancel</Button>}
      </div>
    </form>
  );
}
