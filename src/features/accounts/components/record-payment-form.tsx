import { useState, type FormEvent } from 'react';
import { MANUAL_METHODS, PAYMENT_METHOD_LABELS, RecordPaymentSchema } from '@shared/schemas/accounts';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { SelectField, TextField } from '@/components/field';
import { ApiError } from '@/lib/api';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { formatMoney, todayIso } from '@/lib/format';
import { useRecordPayment } from '../api/accounts';

/** A bank transfer, cash or a cheque received, recorded by hand; part payments welcome, never more than is owed. */
export function RecordPaymentForm({ quoteId, currency, balance }: { quoteId: number; currency: string; balance: string }) {
  const record = useRecordPayment(quoteId);
  const [form, setForm] = useState({ method: 'bank-transfer', amount: '', receivedOn: todayIso(), reference: '', note: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [done, setDone] = useState<string | null>(null);
  const set = (k: keyof typeof form) => (e: { target: { value: string } }) => setForm((f) => ({ ...f, [k]: e.target.value }));

  function submit(e: FormEvent) {
    e.preventDefault();
    setDone(null);
    const parsed = RecordPaymentSchema.safeParse(form);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    record.mutate(parsed.data, {
      onSuccess: () => {
        setDone(`${formatMoney(parsed.data.amount, currency)} recorded; the receipt is on its way to the customer.`);
        setForm((f) => ({ ...f, amount: '', reference: '', note: '' }));
      },
      onError: (err) => setErrors(serverFieldErrors(err)),
    });
  }

  const nothingOwed = Number(balance) <= 0;
  return (
    <form aria-label="Record a payment" onSubmit={submit} noValidate className="space-y-3">
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <SelectField label="How it was paid" value={form.method} onChange={set('method')} error={errors.method} options={MANUAL_METHODS.map((m) => ({ value: m, label: PAYMENT_METHOD_LABELS[m] }))} />
        <TextField label={`Amount (${currency})`} inputMode="decimal" value={form.amount} onChange={set('amount')} error={errors.amount} hint={`At most ${formatMoney(balance, currency)}, what is still owed`} />
        <TextField label="Received on" type="date" value={form.receivedOn} onChange={set('receivedOn')} error={errors.receivedOn} />
        <TextField label="Reference" value={form.reference} onChange={set('reference')} error={errors.reference} hint="Bank reference or cheque number" />
      </div>
      <TextField label="Note" value={form.note} onChange={set('note')} error={errors.note} />
      {record.error && !(record.error instanceof ApiError && record.error.field) && <Alert tone="error" title="The payment was not recorded">{record.error.message}</Alert>}
      {record.error instanceof ApiError && record.error.field && !errors[record.error.field] && <Alert tone="error" title="The payment was not recorded">{record.error.message}</Alert>}
      {done && <Alert tone="info" title="Payment recorded">{done}</Alert>}
      <Button type="submit" busy={record.isPending} disabled={nothingOwed}>
        Record the payment
      </Button>
    </form>
  );
}
