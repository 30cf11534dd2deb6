import { GitCompare, History } from 'lucide-react';
import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import type { RevisionSummary } from '@shared/schemas/estimates';
import { Button } from '@/components/button';
import { pathTo } from '@/config/paths';
import { formatHours, formatMoney, formatWhen } from '@/lib/format-figures';

/** Every saved revision, newest first, with two picked for a side-by-side comparison. */
export function RevisionsList({ estimateId, revisions, current, currency }: { estimateId: number; revisions: RevisionSummary[]; current: number; currency: string }) {
  const navigate = useNavigate();
  const sorted = [...revisions].sort((a, b) => b.number - a.number);
  const [picked, setPicked] = useState<number[]>(() => sorted.slice(0, 2).map((r) => r.number));
  const toggle = (n: number) => setPicked((p) => (p.includes(n) ? p.filter((x) => x !== n) : [...p, n].slice(-2)));
  const [a, b] = [...picked].sort((x, y) => x - y);
  return (
    <section aria-labelledby="revisions-heading" className="rounded-xl border border-parchment-200 bg-white shadow-card">
      <header className="flex items-center justify-between gap-2 border-b border-parchment-200 px-4 py-2.5">
        <h2 id="revisions-heading" className="flex items-center gap-2 text-base font-semibold text-walnut-800">
          <History className="h-4 w-4 text-amber-600" aria-hidden /> Revisions
        </h2>
        <Button size="sm" variant="secondary" disabled={a === undefined || b === undefined} onClick={() => a !== undefined && b !== undefined && navigate(pathTo.compareRevisions(estimateId, a, b))}>
          <GitCompare className="h-3.5 w-3.5" aria-hidden /> {a !== undefined && b !== undefined ? `Compare ${a} and ${b}` : 'Pick two to compare'}
        </Button>
      </header>
      <ol className="divide-y divide-parchment-200" aria-label="Saved revisions">
        {sorted.map((r) => (
          <li key={r.number} className="flex items-start gap-3 px-4 py-2.5 text-sm" data-testid={`revision-${r.number}`}>
            <input
              type="checkbox"
              className="mt-1 h-4 w-4 accent-amber-600"
              checked={picked.includes(r.number)}
              onChange={() => toggle(r.number)}
              aria-label={`Pick revision ${r.number} to compare`}
            />
            <div className="min-w-0 flex-1">
              <p className="flex flex-wrap items-baseline gap-x-2">
                <span className="font-semibold text-walnut-900">Revision {r.number}</span>
                {r.number === current && <span className="rounded border border-amber-400 bg-amber-50 px-1.5 text-xs font-medium text-amber-800">current</span>}
                <span className="text-xs text-walnut-500">
                  {formatWhen(r.createdAt)} by {r.createdBy.name}
                </span>
              </p>
              {r.note && <p className="mt-0.5 text-walnut-600">“{r.note}”</p>}
            </div>
            <div className="num shrink-0 text-right">
              <p className="font-semibold text-walnut-900">{formatMoney(r.total, currency)}</p>
              <p className="text-xs text-walnut-500">{formatHours(r.labourHours)}</p>
            </div>
          </li>
        ))}
      </ol>
    </section>
  );
}
