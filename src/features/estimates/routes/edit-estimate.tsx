import { useQueryClient } from '@tanstack/react-query';
import { RefreshCw } from 'lucide-react';
import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import type { EstimateDetail } from '@shared/schemas/estimates';
import { OPEN_STATES } from '@shared/schemas/estimates';
import type { PieceKind } from '@shared/schemas/customers';
import { PIECE_KINDS } from '@shared/schemas/customers';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { ApiError } from '@/lib/api';
import { pathTo } from '@/config/paths';
import { useCalcCatalog, type CalcCatalog } from '@/lib/catalog';
import { estimateQueryOptions, useCreateRevision, useEstimate } from '../api/estimates';
import { EstimateEditor, type SavePayload } from '../components/estimate-editor';
import { StateBadge } from '@/components/estimate-state-badge';
import { draftFromInput } from '../lib/draft';
import { clearBrowserDraft } from '@/lib/browser-draft';
import { formatWhen } from '@/lib/format-figures';

function kindOf(kind: string): PieceKind {
  return (PIECE_KINDS as readonly string[]).includes(kind) ? (kind as PieceKind) : 'furniture';
}

function ReviseForm({ detail, calc }: { detail: EstimateDetail; calc: CalcCatalog }) {
  const navigate = useNavigate();
  const qc = useQueryClient();
  const revise = useCreateRevision(detail.id);
  const [initial] = useState(() => draftFromInput(detail.current.input, calc.catalog, calc.settings, detail.title));
  const [base, setBase] = useState(detail.current.number);
  const [reloading, setReloading] = useState(false);
  const [rebased, setRebased] = useState<EstimateDetail | null>(null);
  const conflict = revise.error instanceof ApiError && revise.error.code === 'stale_revision';

  // Kept per revision it started from: a draft typed over an older revision is not offered over a newer one.
  const draftKey = `estimate:${detail.id}:from-revision:${detail.current.number}`;
  const save = ({ input, title, note }: SavePayload) =>
    revise.mutate(
      { baseRevision: base, input, ...(title ? { title } : {}), ...(note ? { note } : {}) },
      {
        onSuccess: (d) => {
          clearBrowserDraft(draftKey);
          navigate(pathTo.estimate(d.id), { state: { saved: d.current.number } });
        },
      },
    );

  const reload = async () => {
    setReloading(true);
    try {
      const latest = await qc.fetchQuery({ ...estimateQueryOptions(detail.id), staleTime: 0 });
      setBase(latest.current.number);
      setRebased(latest);
      revise.reset();
    } finally {
      setReloading(false);
    }
  };

  const notice = conflict ? (
    <Alert tone="warning" title="Someone saved this estimate while you were editing">
      <p>{revise.error?.message} Your changes are still here and nothing of theirs is lost.</p>
      <div className="mt-2 flex flex-wrap gap-2">
        <Button size="sm" variant="primary" busy={reloading} onClick={reload}>
          <RefreshCw className="h-3.5 w-3.5" aria-hidden /> Load the latest revision and keep my changes
        </Button>
      </div>
    </Alert>
  ) : rebased ? (
    <Alert tone="info" title={`Now based on revision ${rebased.current.number}`}>
      Revision {rebased.current.number} was saved by {rebased.current.createdBy.name} on {formatWhen(rebased.current.createdAt)}.{' '}
      <Link className="font-semibold underline" target="_blank" to={pathTo.compareRevisions(detail.id, detail.current.number, rebased.current.number)}>
        See what they changed
      </Link>
      , then save again: your edits become revision {rebased.current.number + 1}.
    </Alert>
  ) : null;

  return (
    <EstimateEditor
      calc={calc}
      pieceKind={kindOf(detail.piece.kind)}
      initial={initial}
      draftKey={draftKey}
      saveLabel={`Save as revision ${base + 1}`}
      saving={revise.isPending}
      saveError={revise.error ?? undefined}
      notice={notice}
      onSave={save}
      onCancel={() => navigate(pathTo.estimate(detail.id))}
    />
  );
}

/** Editing an estimate: the current revision's inputs, saved as a new revision. */
export function EditEstimatePage() {
  const id = Number(useParams().estimateId);
  const detail = useEstimate(id);
  const calc = useCalcCatalog();
  if (detail.isError) return <Alert tone="error" title="The estimate could not be loaded">{detail.error.message}</Alert>;
  if (calc.isError) return <Alert tone="error" title="The price list could not be loaded">{calc.error.message}</Alert>;
  if (!detail.data || !calc.data) return <Spinner label="Opening the estimate…" />;
  const d = detail.data;
  if (!OPEN_STATES.includes(d.state) || d.archived) {
    return (
      <div className="max-w-xl">
        <Alert tone="warning" title="This estimate can no longer be revised">
          It is {d.archived ? 'archived' : `in the state “${d.state}”`}. Duplicate it to price the piece again.{' '}
          <Link className="font-semibold underline" to={pathTo.estimate(d.id)}>Back to the estimate</Link>
        </Alert>
      </div>
    );
  }
  return (
    <>
      <PageHeader
        title={`Revise estimate ${d.number}`}
        description={
          <span className="inline-flex flex-wrap items-center gap-2">
            <StateBadge state={d.state} /> {d.customer.name} · {d.piece.description} · starting from revision {d.current.number}
          </span>
        }
      />
      <ReviseForm detail={d} calc={calc.data} />
    </>
  );
}
