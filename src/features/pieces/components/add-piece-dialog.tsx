import { useState, type FormEvent } from 'react';
import type { Piece } from '@shared/schemas/customers';
import type { LengthUnit } from '@shared/units';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { serverFieldErrors } from '@/lib/form-errors';
import { useCreatePiece } from '../api/pieces';
import { checkPieceForm, emptyPieceForm, PieceFields, type PieceForm } from './piece-fields';

/** Records a new piece for a customer. */
export function AddPieceDialog({ open, customerId, unit, onClose, onSaved }: { open: boolean; customerId: number; unit: LengthUnit; onClose: () => void; onSaved: (p: Piece) => void }) {
  const create = useCreatePiece();
  const [form, setForm] = useState<PieceForm>(emptyPieceForm());
  const [errors, setErrors] = useState<Record<string, string>>({});
  const close = () => {
    setForm(emptyPieceForm());
    setErrors({});
    create.reset();
    onClose();
  };
  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const checked = checkPieceForm(form, customerId, unit);
    if ('errors' in checked) return setErrors(checked.errors);
    setErrors({});
    create.mutate(checked.input, {
      onSuccess: (p) => {
        close();
        onSaved(p);
      },
      onError: (err) => setErrors(serverFieldErrors(err)),
    });
  };
  return (
    <Dialog title="Add a piece" open={open} onClose={close} wide>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        {create.isError && <Alert tone="error" title="Not saved">{create.error.message}</Alert>}
        <PieceFields form={form} onChange={setForm} errors={errors} unit={unit} />
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={create.isPending}>Add piece</Button>
        </div>
      </form>
    </Dialog>
  );
}
