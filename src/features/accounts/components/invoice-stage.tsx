import { INVOICE_STAGES, INVOICE_STAGE_LABELS, type InvoiceStage } from '@shared/schemas/accounts';
import { Alert } from '@/components/alert';
import { SelectField } from '@/components/field';
import { useAccountSettings, useUpdateAccountSettings } from '../api/accounts';

/** When the workshop issues its invoices: the owner chooses; sales read it. */
export function InvoiceStageSetting() {
  const settings = useAccountSettings();
  const update = useUpdateAccountSettings();
  const s = settings.data;
  if (!s) return null;
  return (
    <div className="max-w-md space-y-2">
      <SelectField
        label="Invoices are issued"
        value={s.invoiceStage}
        disabled={!s.canChange || update.isPending}
        hint={s.canChange ? 'Until then, the account says what is still to happen.' : 'The owner chooses this.'}
        onChange={(e) => update.mutate({ invoiceStage: e.target.value as InvoiceStage })}
        options={INVOICE_STAGES.map((v) => ({ value: v, label: INVOICE_STAGE_LABELS[v] }))}
      />
      {update.error && <Alert tone="error" title="Not changed">{update.error.message}</Alert>}
    </div>
  );
}
