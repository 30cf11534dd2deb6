import { Camera, ClipboardList, NotebookPen } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router-dom';
import { PIECE_KIND_LABELS, type Piece } from '@shared/schemas/customers';
import type { LengthUnit } from '@shared/units';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { pathTo } from '@/config/paths';
import { useCan } from '@/lib/permissions';
import { useWorkshop } from '@/lib/workshop';
import { serverFieldErrors } from '@/lib/form-errors';
import { usePiece, useUpdatePiece } from '../api/pieces';
import { PhotoGallery } from '../components/photo-gallery';
import { checkPieceForm, PieceFields, pieceFormFrom, type PieceForm } from '../components/piece-fields';

function DetailsForm({ piece, unit, canEdit }: { piece: Piece; unit: LengthUnit; canEdit: boolean }) {
  const update = useUpdatePiece();
  const [form, setForm] = useState<PieceForm>(() => pieceFormFrom(piece));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);
  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    setSaved(false);
    const checked = checkPieceForm(form, piece.customerId, unit);
    if ('errors' in checked) return setErrors(checked.errors);
    setErrors({});
    const { customerId: _customerId, ...changes } = checked.input;
    update.mutate({ id: piece.id, ...changes }, { onSuccess: () => setSaved(true), onError: (err) => setErrors(serverFieldErrors(err)) });
  };
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {update.isError && <Alert tone="error" title="Not saved">{update.error.message}</Alert>}
      {saved && !update.isPending && <Alert tone="info" title="Saved">The piece's details are up to date.</Alert>}
      <PieceFields form={form} onChange={(f) => { setForm(f); setSaved(false); }} errors={errors} unit={unit} disabled={!canEdit} />
      {canEdit && (
        <div className="flex justify-end">
          <Button type="submit" busy={update.isPending}>Save details</Button>
        </div>
      )}
    </form>
  );
}

/** A customer's piece: what it is, its sizes and condition, and condition photos. */
export function PiecePage() {
  const id = Number(useParams().pieceId);
  const piece = usePiece(id);
  const workshop = useWorkshop();
  const can = useCan();
  if (piece.isError) return <Alert tone="error" title="The piece could not be loaded">{piece.error.message}</Alert>;
  if (!piece.data) return <Spinner label="Opening the piece…" />;
  const p = piece.data;
  const unit = workshop.data?.settings.defaultLengthUnit ?? 'mm';
  return (
    <>
      <div className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-walnut-100 pb-4">
        <div>
          <p className="text-sm font-semibold uppercase tracking-wider text-amber-700">
            {PIECE_KIND_LABELS[p.kind]} · <Link className="underline decoration-amber-400 underline-offset-2 hover:text-amber-800" to={pathTo.customer(p.customerId)}>{p.customerName}</Link>
          </p>
          <h1 className="text-3xl font-semibold tracking-tight text-walnut-900">{p.description}</h1>
        </div>
        <div className="flex gap-2">
          <Link to={pathTo.estimatesOf(p.customerId)} className="inline-flex items-center gap-2 rounded-md border border-walnut-200 bg-white px-4 py-2 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
            Estimates for {p.customerName}
          </Link>
          {can.editEstimates && (
            <Link to={pathTo.newEstimate(p.id)} className="inline-flex items-center gap-2 rounded-md bg-amber-400 px-4 py-2 text-sm font-semibold text-walnut-950 shadow-sm hover:bg-amber-300">
              <NotebookPen className="h-4 w-4" aria-hidden /> New estimate
            </Link>
          )}
        </div>
      </div>
      <div className="grid grid-cols-1 items-start gap-6 2xl:grid-cols-2">
        <Card title={<span className="inline-flex items-center gap-2"><ClipboardList className="h-4 w-4 text-amber-600" aria-hidden /> Details, sizes and condition</span>}>
          {workshop.isPending ? <Spinner /> : <DetailsForm piece={p} unit={unit} canEdit={can.editPieces} />}
        </Card>
        <Card title={<span className="inline-flex items-center gap-2"><Camera className="h-4 w-4 text-amber-600" aria-hidden /> Condition photos ({p.photos.length})</span>}>
          <PhotoGallery pieceId={p.id} photos={p.photos} canEdit={can.editPieces} />
        </Card>
      </div>
    </>
  );
}
