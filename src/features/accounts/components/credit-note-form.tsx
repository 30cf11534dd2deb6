import { useState, type FormEvent } from 'react';
import { CreditNoteSchema, MANUAL_METHODS, PAYMENT_METHOD_LABELS } from '@shared/schemas/accounts';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { SelectField, TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { money } from '@shared/money';
import { formatMoney } from '@/lib/format';
import { useIssueCreditNote } from '../api/accounts';

/**
 * A credit note against the invoice, for a refund or a correction. When the credit is more than is still owed, the
 * difference has been paid: the form asks how it is given back.
 */
export function CreditNoteForm({ quoteId, invoice, currency, balance }: { quoteId: number; invoice: { id: number; number: string }; currency: string; balance: string }) {
  const issue = useIssueCreditNote(quoteId);
  const [form, setForm] = useState({ amount: '', reason: '', refundMethod: '', refundReference: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const set = (k: keyof typeof form) => (e: { target: { value: string } }) => setForm((f) => ({ ...f, [k]: e.target.value }));
  const excess = excessOf(form.amount, balance);

  function submit(e: FormEvent) {
    e.preventDefault();
    const body = {
      amount: form.amount,
      reason: form.reason,
      ...(form.refundMethod ? { refund: { method: form.refundMethod, reference: form.refundReference } } : {}),
    };
    const parsed = CreditNoteSchema.safeParse(body);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    issue.mutate({ ...parsed.data, invoiceId: invoice.id }, {
      onSuccess: () => setForm({ amount: '', reason: '', refundMethod: '', refundReference: '' }),
      onError: (err) => setErrors(serverFieldErrors(err)),
    });
  }

  return (
    <form aria-label="Issue a credit note" onSubmit={submit} noValidate className="space-y-3">
      <p className="text-sm text-walnut-700">
        Invoice <span className="num">{invoice.number}</span> is never changed: a credit note reduces it, for a refund or a correction.
      </p>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <TextField label={`Amount credited (${currency}, tax included)`} inputMode="decimal" value={form.amount} onChange={set('amount')} error={errors.amount} />
        <TextField label="Reason" value={form.reason} onChange={set('reason')} error={errors.reason} hint="Printed on the credit note" />
        <SelectField
          label="Refund"
          value={form.refundMethod}
          onChange={set('refundMethod')}
          error={errors.refund ?? errors['refund.method']}
          hint={excess ? `${formatMoney(excess, currency)} has been paid beyond the new total: say how it is given back` : 'Only when the credit is more than is still owed'}
          options={[{ value: '', label: 'No refund' }, ...MANUAL_METHODS.map((m) => ({ value: m, label: PAYMENT_METHOD_LABELS[m] }))]}
        />
        {form.refundMethod && <TextField label="Refund reference" value={form.refundReference} onChange={set('refundReference')} error={errors['refund.reference']} />}
      </div>
      {issue.error && Object.keys(serverFieldErrors(issue.error)).length === 0 && <Alert tone="error" title="The credit note was not issued">{issue.error.message}</Alert>}
      <Button type="submit" variant="secondary" busy={issue.isPending}>
        Issue the credit note
      </Button>
    </form>
  );
}

/** What a credit of `amount` takes beyond the balance still owed (null when none, or while the amount is unreadable). */
function excessOf(amount: string, balance: string): string | null {
  try {
    const d = money(amount).minus(money(balance));
    return d.gt(0) ? d.toFixed(2) : null;
  } catch {
    return null;
  }
}
