import { Archive, ArchiveRestore, BadgeCheck, CopyPlus, FilePenLine, FileText, PencilLine } from 'lucide-react';
import { Link, useLocation, useNavigate, useParams } from 'react-router-dom';
import { OPEN_STATES, type EstimateDetail } from '@shared/schemas/estimates';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Spinner } from '@/components/spinner';
import { StateBadge } from '@/components/estimate-state-badge';
import { pathTo } from '@/config/paths';
import { useCalcCatalog } from '@/lib/catalog';
import { formatDate, formatWhen } from '@/lib/format-figures';
import { useCan } from '@/lib/permissions';
import { estimatePdfUrl } from '@/features/quotes/api/quotes';
import { useArchiveEstimate, useDuplicateEstimate, useEstimate, useSetEstimateState } from '@/features/estimates/api/estimates';
import { CautionsPanel } from '@/features/estimates/components/cautions';
import { ResultsDetail } from '@/features/estimates/components/results-detail';
import { ResultsSummary } from '@/features/estimates/components/results-summary';
import { RevisionsList } from '@/features/estimates/components/revisions-list';
import { UnitsToggle } from '@/features/estimates/components/units-toggle';
import { useDisplayUnits } from '@/features/estimates/lib/display-units';
import { EstimateQuotes } from '@/app/components/estimate-quotes';

function Meta({ d }: { d: EstimateDetail }) {
  const link = 'font-medium text-walnut-800 underline decoration-amber-400 underline-offset-2 hover:text-amber-700';
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-3 lg:grid-cols-6">
      <div>
        <dt className="text-xs uppercase tracking-wide text-walnut-500">Customer</dt>
        <dd><Link className={link} to={pathTo.customer(d.customer.id)}>{d.customer.name}</Link></dd>
      </div>
      <div>
        <dt className="text-xs uppercase tracking-wide text-walnut-500">Piece</dt>
        <dd><Link className={link} to={pathTo.piece(d.piece.id)}>{d.piece.description}</Link></dd>
      </div>
      <div>
        <dt className="text-xs uppercase tracking-wide text-walnut-500">Estimator</dt>
        <dd>{d.owner.name}</dd>
      </div>
      <div>
        <dt className="text-xs uppercase tracking-wide text-walnut-500">Valid until</dt>
        <dd className="num">{formatDate(d.validUntil.slice(0, 10))}</dd>
      </div>
      <div>
        <dt className="text-xs uppercase tracking-wide text-walnut-500">Revision</dt>
        <dd className="num">{d.current.number} of {d.revisionCount}</dd>
      </div>
      <div>
        <dt className="text-xs uppercase tracking-wide text-walnut-500">Updated</dt>
        <dd className="num">{formatWhen(d.updatedAt)}</dd>
      </div>
    </dl>
  );
}

/** One estimate: the server's figures for the current revision, its state, cautions and revisions. */
export function EstimatePage() {
  const id = Number(useParams().estimateId);
  const detail = useEstimate(id);
  const calc = useCalcCatalog();
  const can = useCan();
  const navigate = useNavigate();
  const location = useLocation();
  const saved = (location.state as { saved?: number } | null)?.saved;
  const setState = useSetEstimateState(id);
  const archive = useArchiveEstimate();
  const duplicate = useDuplicateEstimate();
  const [units, setUnits] = useDisplayUnits(calc.data?.settings.units ?? 'metric');

  if (detail.isError) return <Alert tone="error" title="The estimate could not be loaded">{detail.error.message}</Alert>;
  if (!detail.data) return <Spinner label="Opening the estimate…" />;
  const d = detail.data;
  const open = OPEN_STATES.includes(d.state) && !d.archived;
  const result = d.current.result;
  const actionError = setState.error ?? archive.error ?? duplicate.error;

  return (
    <>
      <div className="mb-6 border-b border-walnut-100 pb-4">
        <div className="flex flex-wrap items-start justify-between gap-4">
          <div>
            <p className="num text-sm font-semibold uppercase tracking-wider text-amber-700">Estimate {d.number}</p>
            <h1 className="mt-0.5 flex flex-wrap items-center gap-3 text-3xl font-semibold tracking-tight text-walnut-900">
              {d.title || d.piece.description}
              <StateBadge state={d.state} />
              {d.archived && (
                <span className="inline-flex items-center gap-1 rounded-full border border-dashed border-walnut-300 px-2 py-0.5 text-xs font-medium text-walnut-600">
                  <Archive className="h-3.5 w-3.5" aria-hidden /> Archived
                </span>
              )}
            </h1>
          </div>
          <div className="flex flex-wrap gap-2">
            <a
              href={estimatePdfUrl(d.id)}
              target="_blank"
              rel="noopener"
              className="inline-flex items-center gap-2 rounded-md border border-walnut-200 bg-white px-4 py-2 text-sm font-medium text-walnut-800 hover:bg-parchment-100"
            >
              <FileText className="h-4 w-4" aria-hidden /> Customer’s view (PDF)
            </a>
            {can.editEstimates && open && (
              <Button onClick={() => navigate(pathTo.editEstimate(d.id))}>
                <FilePenLine className="h-4 w-4" aria-hidden /> Revise
              </Button>
            )}
            {can.editEstimates && !d.archived && d.state === 'draft' && (
              <Button variant="accent" busy={setState.isPending} onClick={() => setState.mutate('priced')}>
                <BadgeCheck className="h-4 w-4" aria-hidden /> Mark as priced
              </Button>
            )}
            {can.editEstimates && !d.archived && d.state === 'priced' && (
              <Button variant="secondary" busy={setState.isPending} onClick={() => setState.mutate('draft')}>
                <PencilLine className="h-4 w-4" aria-hidden /> Back to draft
              </Button>
            )}
            {can.editEstimates && (
              <Button variant="secondary" busy={duplicate.isPending} onClick={() => duplicate.mutate({ id: d.id }, { onSuccess: (copy) => navigate(pathTo.estimate(copy.id)) })}>
                <CopyPlus className="h-4 w-4" aria-hidden /> Duplicate
              </Button>
            )}
            {can.editEstimates && (
              <Button
                variant="ghost"
                busy={archive.isPending}
                onClick={() => {
                  if (d.archived || window.confirm(`Archive estimate ${d.number}? It leaves the lists but is kept with its revisions.`)) {
                    archive.mutate({ id: d.id, archived: !d.archived });
                  }
                }}
              >
                {d.archived ? <ArchiveRestore className="h-4 w-4" aria-hidden /> : <Archive className="h-4 w-4" aria-hidden />}
                {d.archived ? 'Restore' : 'Archive'}
              </Button>
            )}
          </div>
        </div>
        <div className="mt-4">
          <Meta d={d} />
        </div>
      </div>
      <div className="space-y-4">
        {saved !== undefined && saved === d.current.number && (
          <Alert tone="info" title={`Revision ${saved} saved`}>
            The figures below are the server's own, worked out again from your inputs with the price list in force ({d.current.priceList || "today's prices"}).
          </Alert>
        )}
        {actionError && <Alert tone="error" title="That did not work">{actionError.message}</Alert>}
      </div>
      <div className="mb-3 mt-4 flex justify-end">
        <UnitsToggle value={units} onChange={setUnits} />
      </div>
      <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-2">
        <div className="space-y-6">
          <ResultsSummary result={result} units={units} heading={`Revision ${d.current.number}: the server's figures`} />
          <RevisionsList estimateId={d.id} revisions={d.revisions} current={d.current.number} currency={d.currency} />
        </div>
        <CautionsPanel result={result} units={units} compact />
      </div>
      <div className="mt-6">
        <EstimateQuotes estimate={d} />
      </div>
      <div className="mt-6">
        <ResultsDetail result={result} units={units} catalog={calc.data?.catalog} />
      </div>
    </>
  );
}
