/** A stock count: what the shelf holds, in packs of one of the material's packs, and why it differs. */
import { useState } from 'react';
import { StockCountSchema, type StockLevel } from '@shared/schemas/stock';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { SelectField, TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useRecordCount } from '../api/stock';

export function CountDialog({ row, onClose }: { row: StockLevel; onClose: () => void }) {
  const [packId, setPackId] = useState(String(row.packs[0]?.packId ?? ''));
  const pack = row.packs.find((p) => String(p.packId) === packId);
  const [counted, setCounted] = useState(pack ? String(pack.onHandPacks) : '');
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const count = useRecordCount();
  const submit = () => {
    const parsed = StockCountSchema.safeParse({ materialId: row.materialId, packId: Number(packId), counted: counted === '' ? undefined : Number(counted), reason });
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    count.mutate(parsed.data, { onSuccess: onClose, onError: (e) => setErrors(serverFieldErrors(e)) });
  };
  return (
    <Dialog title={`Count ${row.name}`} open onClose={onClose}>
      <form
        className="space-y-3"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          submit();
        }}
      >
        <p className="text-sm text-walnut-700">
          The ledger says {row.quantity.toLocaleString('en-GB')} {row.unit}. Enter what is on the shelf; the difference is recorded as an adjustment with your reason.
        </p>
        {row.packs.length === 0 ? (
          <Alert tone="warning" title="No pack">Give the material a pack in the price list before counting it.</Alert>
        ) : (
          <>
            <SelectField label="Counted in" value={packId} onChange={(e) => setPackId(e.target.value)} options={row.packs.map((p) => ({ value: String(p.packId), label: `${p.label} (${p.size} ${row.unit})` }))} error={errors.packId} />
            <TextField label="Packs on the shelf" type="number" min="0" step="any" inputMode="decimal" value={counted} onChange={(e) => setCounted(e.target.value)} error={errors.counted} hint={pack ? `A part-used pack counts as its share, e.g. 0.5; ${pack.size} ${row.unit} a pack.` : undefined} />
            <TextField label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} error={errors.reason} placeholder="spilt, dried out, miscounted delivery" maxLength={500} />
          </>
        )}
        {count.isError && Object.keys(serverFieldErrors(count.error)).length === 0 && <Alert tone="error" title="The count was not saved">{count.error.message}</Alert>}
        <div className="flex justify-end gap-2">
          <Button type="button" variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={count.isPending} disabled={row.packs.length === 0}>
            Record the count
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
