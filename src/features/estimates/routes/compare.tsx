import { ArrowLeft } from 'lucide-react';
import { useMemo } from 'react';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { compareRevisions } from '@shared/compare';
import { Alert } from '@/components/alert';
import { PageHeader } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { pathTo } from '@/config/paths';
import { useCalcCatalog } from '@/lib/catalog';
import { useEstimate, useRevision } from '../api/estimates';
import { CautionsPanel } from '../components/cautions';
import { Comparison } from '../components/comparison';
import { StateBadge } from '@/components/estimate-state-badge';
import { UnitsToggle } from '../components/units-toggle';
import { useDisplayUnits } from '../lib/display-units';
import { formatWhen } from '@/lib/format-figures';

/** Two revisions of an estimate side by side. */
export function CompareRevisionsPage() {
  const id = Number(useParams().estimateId);
  const [params, setParams] = useSearchParams();
  const detail = useEstimate(id);
  const calc = useCalcCatalog();
  const [units, setUnits] = useDisplayUnits(calc.data?.settings.units ?? 'metric');
  const latest = detail.data?.current.number ?? 1;
  const a = Number(params.get('a')) || Math.max(1, latest - 1);
  const b = Number(params.get('b')) || latest;
  const revA = useRevision(id, a);
  const revB = useRevision(id, b);
  const diff = useMemo(() => (revA.data && revB.data ? compareRevisions(revA.data, revB.data) : null), [revA.data, revB.data]);

  if (detail.isError) return <Alert tone="error" title="The estimate could not be loaded">{detail.error.message}</Alert>;
  const failed = revA.error ?? revB.error;
  const d = detail.data;
  const numbers = (d?.revisions ?? []).map((r) => r.number).sort((x, y) => x - y);
  const pick = (name: 'a' | 'b', value: string) => {
    const next = new URLSearchParams(params);
    next.set(name, value);
    setParams(next, { replace: true });
  };
  const who = (n: number) => d?.revisions.find((r) => r.number === n);

  return (
    <>
      <PageHeader
        title={d ? `Compare revisions of ${d.number}` : 'Compare revisions'}
        description={
          d && (
            <span className="inline-flex flex-wrap items-center gap-2">
              <StateBadge state={d.state} /> {d.customer.name} · {d.piece.description}
            </span>
          )
        }
        actions={
          <Link to={pathTo.estimate(id)} className="inline-flex items-center gap-1.5 rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
            <ArrowLeft className="h-4 w-4" aria-hidden /> Back to the estimate
          </Link>
        }
      />
      <div className="mb-5 flex flex-wrap items-end gap-4">
        {(['a', 'b'] as const).map((name) => {
          const n = name === 'a' ? a : b;
          const r = who(n);
          return (
            <div key={name}>
              <label className="block text-xs font-medium uppercase tracking-wide text-walnut-600" htmlFor={`rev-${name}`}>
                {name === 'a' ? 'Before' : 'After'}
              </label>
              <select id={`rev-${name}`} value={n} onChange={(e) => pick(name, e.target.value)} className="mt-0.5 rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
                {numbers.map((x) => (
                  <option key={x} value={x}>
                    Revision {x}
                  </option>
                ))}
              </select>
              {r && <p className="mt-0.5 text-xs text-walnut-500">{formatWhen(r.createdAt)} by {r.createdBy.name}</p>}
            </div>
          );
        })}
        <div className="ml-auto">
          <UnitsToggle value={units} onChange={setUnits} />
        </div>
      </div>
      {failed && <Alert tone="error" title="A revision could not be loaded">{failed.message}</Alert>}
      {!diff && !failed && <Spinner label="Loading both revisions…" />}
      {diff && revB.data && (
        <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,1fr)_24rem]">
          <Comparison diff={diff} units={units} />
          <CautionsPanel result={revB.data.result} units={units} compact />
        </div>
      )}
    </>
  );
}
