import { useState } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { PIECE_KIND_LABELS } from '@shared/schemas/customers';
import type { Piece } from '@shared/schemas/customers';
import { Alert } from '@/components/alert';
import { PageHeader } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { pathTo, paths } from '@/config/paths';
import { useCalcCatalog, type CalcCatalog } from '@/lib/catalog';
import { clearBrowserDraft } from '@/lib/browser-draft';
import { usePiece } from '@/features/pieces/api/pieces';
import { useCreateEstimate } from '@/features/estimates/api/estimates';
import { EstimateEditor, type SavePayload } from '@/features/estimates/components/estimate-editor';
import { newDraft } from '@/features/estimates/lib/draft';

function NewEstimateForm({ piece, calc }: { piece: Piece; calc: CalcCatalog }) {
  const navigate = useNavigate();
  const create = useCreateEstimate();
  const [initial] = useState(() => newDraft(piece, calc.catalog, calc.settings));
  const draftKey = `new-estimate:piece:${piece.id}`;
  const save = ({ input, title, note }: SavePayload) =>
    create.mutate(
      { customerId: piece.customerId, pieceId: piece.id, input, ...(title ? { title } : {}), ...(note ? { note } : {}) },
      {
        onSuccess: (detail) => {
          clearBrowserDraft(draftKey);
          navigate(pathTo.estimate(detail.id), { state: { saved: detail.current.number } });
        },
      },
    );
  return (
    <EstimateEditor
      calc={calc}
      pieceKind={piece.kind}
      initial={initial}
      draftKey={draftKey}
      saveLabel="Save estimate"
      saving={create.isPending}
      saveError={create.error ?? undefined}
      onSave={save}
      onCancel={() => navigate(pathTo.piece(piece.id))}
    />
  );
}

/** A new estimate for a customer's piece, from the template that suits it. */
export function NewEstimatePage() {
  const [params] = useSearchParams();
  const pieceId = Number(params.get('pieceId')) || undefined;
  const piece = usePiece(pieceId);
  const calc = useCalcCatalog();
  if (!pieceId) {
    return (
      <div className="max-w-xl">
        <Alert tone="info" title="Start from a piece">
          An estimate prices one customer's piece. Open the customer, pick or add the piece, then choose <strong>New estimate</strong>.{' '}
          <Link className="font-semibold underline" to={paths.customers}>
            Go to customers
          </Link>
        </Alert>
      </div>
    );
  }
  if (piece.isError) return <Alert tone="error" title="The piece could not be loaded">{piece.error.message}</Alert>;
  if (calc.isError) return <Alert tone="error" title="The price list could not be loaded">{calc.error.message}</Alert>;
  if (!piece.data || !calc.data) return <Spinner label="Opening the estimator…" />;
  const p = piece.data;
  return (
    <>
      <PageHeader
        title="New estimate"
        description={
          <>
            For <Link className="font-medium text-walnut-800 underline decoration-amber-400 underline-offset-2" to={pathTo.piece(p.id)}>{p.description}</Link> ({PIECE_KIND_LABELS[p.kind].toLowerCase()}) of{' '}
            <Link className="font-medium text-walnut-800 underline decoration-amber-400 underline-offset-2" to={pathTo.customer(p.customerId)}>{p.customerName}</Link>. The figures on the right follow every change.
          </>
        }
      />
      <NewEstimateForm piece={p} calc={calc.data} />
    </>
  );
}
