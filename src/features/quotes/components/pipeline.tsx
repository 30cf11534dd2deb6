import { lazy, Suspense } from 'react';
import { QUOTE_STATES, QUOTE_STATE_LABELS, type QuoteState } from '@shared/schemas/quotes';
import { Alert } from '@/components/alert';
import { Spinner } from '@/components/spinner';
import { formatMoney } from '@/lib/format';
import { usePipeline } from '../api/quotes';
import { QUOTE_STATE_ICONS } from './quote-state-badge';

/** recharts comes with the chart, not with the list page. */
const PipelineChart = lazy(() => import('./pipeline-chart').then((m) => ({ default: m.PipelineChart })));

/** How many quotes stand in each state and what they are worth (accepted totals once accepted), with a chart. */
export function Pipeline({ currency, active, onPick }: { currency: string; active: string; onPick: (state: QuoteState | '') => void }) {
  const pipeline = usePipeline();
  if (pipeline.isError) return <Alert tone="error" title="The pipeline could not be loaded">{pipeline.error.message}</Alert>;
  if (!pipeline.data) return <Spinner label="Adding up the pipeline…" />;
  const rows = QUOTE_STATES.flatMap((s) => pipeline.data.filter((r) => r.state === s));
  return (
    <section aria-labelledby="pipeline-heading" className="mb-6 rounded-xl border border-parchment-200 bg-white shadow-card" data-testid="pipeline">
      <header className="border-b border-parchment-200 px-5 py-3">
        <h2 id="pipeline-heading" className="text-lg font-semibold text-walnut-800">Pipeline</h2>
        <p className="text-sm text-walnut-500">Quotes by state, withdrawn ones left out. Pick a state to list its quotes.</p>
      </header>
      {rows.length === 0 ? (
        <p className="px-5 py-6 text-sm text-walnut-500">No quote yet.</p>
      ) : (
        <div className="grid gap-4 px-5 py-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
          <ul className="grid grid-cols-2 gap-2 self-start sm:grid-cols-3 lg:grid-cols-2">
            {rows.map((r) => {
              const Icon = QUOTE_STATE_ICONS[r.state];
              const on = active === r.state;
              return (
                <li key={r.state}>
                  <button
                    type="button"
                    aria-pressed={on}
                    onClick={() => onPick(on ? '' : r.state)}
                    className={`w-full rounded-lg border px-3 py-2 text-left transition-colors ${on ? 'border-amber-500 bg-amber-50 ring-2 ring-amber-200' : 'border-parchment-200 bg-parchment-50 hover:bg-parchment-100'}`}
                    data-testid={`pipeline-${r.state}`}
                  >
                    <span className="flex items-center gap-1.5 text-xs font-medium uppercase tracking-wide text-walnut-600">
                      <Icon className="h-3.5 w-3.5 text-amber-600" aria-hidden /> {QUOTE_STATE_LABELS[r.state]}
                    </span>
                    <span className="num mt-0.5 block font-serif text-lg font-semibold text-walnut-900">{formatMoney(r.value, currency)}</span>
                    <span className="num block text-xs text-walnut-500">{r.count} {r.count === 1 ? 'quote' : 'quotes'}</span>
                  </button>
                </li>
              );
            })}
          </ul>
          <Suspense fallback={<Spinner label="Drawing the chart…" />}>
            <PipelineChart rows={rows} currency={currency} />
          </Suspense>
        </div>
      )}
    </section>
  );
}
