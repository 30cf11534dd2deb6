import { useQuery } from '@tanstack/react-query';
import type { OptionReport as Report } from '@shared/schemas/quotes';
import { api } from '@/lib/api';

/** How often customers take the lighter option when offered a choice for a piece: helps decide what to recommend. */
export function OptionReport({ enabled }: { enabled: boolean }) {
  const report = useQuery({ queryKey: ['quotes', 'options-report'] as const, queryFn: ({ signal }) => api<Report>('/api/quotes/options-report', { signal }), enabled });
  const r = report.data;
  if (!r || r.groups === 0) return null;
  const pct = (n: number) => `${Math.round((n / r.groups) * 100)} %`;
  return (
    <section aria-labelledby="options-report-heading" className="mb-4 rounded-xl border border-parchment-200 bg-white px-5 py-3 shadow-card" data-testid="option-report">
      <h2 id="options-report-heading" className="text-base font-semibold text-walnut-800">Which option customers choose</h2>
      <p className="text-sm text-walnut-700">
        Of <span className="num">{r.groups}</span> pieces offered with options in accepted quotes, the lighter option won <span className="num font-semibold">{r.lighterChosen}</span> times (
        {pct(r.lighterChosen)}), a fuller one <span className="num">{r.heavierChosen}</span>, none <span className="num">{r.noneChosen}</span>; the recommended option was taken{' '}
        <span className="num">{r.recommendedChosen}</span> times.
      </p>
      {r.months.length > 1 && (
        <p className="mt-1 text-xs text-walnut-500">By month: {r.months.map((m) => `${m.month}: ${m.lighterChosen} of ${m.groups} lighter`).join(' · ')}</p>
      )}
    </section>
  );
}
