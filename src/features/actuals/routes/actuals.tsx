/**
 * The owner's check on the estimates: hands-on hours estimated against those logged, per stage kind across the
 * finished jobs, and the correction they suggest to each finishing system's labour minutes per m² per coat. Nothing
 * changes until the owner confirms.
 */
import { ArrowDownRight, ArrowUpRight, CheckCheck, Info, Minus } from 'lucide-react';
import { Fragment, lazy, Suspense, useState } from 'react';
import { Link } from 'react-router-dom';
import { STAGE_KIND_LABELS, type ActualsSuggestion, type ApplyActualsResult } from '@shared/schemas/planning';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { Dialog } from '@/components/dialog';
import { Spinner } from '@/components/spinner';
import { paths } from '@/config/paths';
import { formatDate } from '@/lib/format';
import { useActuals, useApplyActuals } from '../api/actuals';

const ActualsChart = lazy(() => import('../components/actuals-chart'));

const key = (s: Pick<ActualsSuggestion, 'systemId' | 'stageKey'>) => `${s.systemId}:${s.stageKey}`;
const hours = (h: number) => `${Math.round(h * 10) / 10} h`;

function Ratio({ ratio }: { ratio: number | null }) {
  if (ratio === null) return <span className="text-walnut-400">—</span>;
  const pct = Math.round((ratio - 1) * 100);
  if (Math.abs(pct) < 3) {
    return (
      <span className="inline-flex items-center gap-1 text-walnut-600">
        <Minus className="h-3.5 w-3.5" aria-hidden /> {Math.round(ratio * 100)} % (on estimate)
      </span>
    );
  }
  const Icon = pct > 0 ? ArrowUpRight : ArrowDownRight;
  return (
    <span className={`inline-flex items-center gap-1 font-medium ${pct > 0 ? 'text-brick-700' : 'text-moss-700'}`}>
      <Icon className="h-3.5 w-3.5" aria-hidden /> {Math.round(ratio * 100)} % ({Math.abs(pct)} % {pct > 0 ? 'longer' : 'shorter'})
    </span>
  );
}

export function ActualsPage() {
  const report = useActuals();
  const apply = useApplyActuals();
  const [chosen, setChosen] = useState<Set<string> | null>(null);
  const [confirming, setConfirming] = useState(false);
  const [done, setDone] = useState<ApplyActualsResult | null>(null);

  if (report.isPending) return <Spinner label="Adding up the hours…" />;
  if (report.isError) return <Alert tone="error" title="The actuals could not be loaded">{report.error.message}</Alert>;
  const r = report.data;
  const selected = chosen ?? new Set(r.suggestions.map(key));
  const picked = r.suggestions.filter((s) => selected.has(key(s)));
  const jobPath = (id: number) => paths.planningJob.replace(':jobId', String(id));

  const toggle = (k: string) => {
    const next = new Set(selected);
    if (next.has(k)) next.delete(k);
    else next.add(k);
    setChosen(next);
  };

  const confirm = async () => {
    const result = await apply.mutateAsync({ items: picked.map((s) => ({ systemId: s.systemId, stageKey: s.stageKey })) });
    setDone(result);
    setConfirming(false);
    setChosen(null);
  };

  return (
    <div className="space-y-6">
      <PageHeader
        title="Actual hours against estimates"
        description={`Across ${r.finishedJobs.length} finished job${r.finishedJobs.length === 1 ? '' : 's'}: how long each kind of stage really took against the estimate, and the labour minutes it suggests for the finishing systems.`}
      />

      {done && (
        <Alert tone="info" title={`${done.applied.length} correction${done.applied.length === 1 ? '' : 's'} applied`}>
          New estimates and revisions use the new labour minutes; estimates already made keep theirs. The change is in the audit log.
        </Alert>
      )}

      {r.kinds.length === 0 ? (
        <Alert tone="info" title="No finished job yet">
          When every session of a job is marked done with its actual hours, it counts here.
        </Alert>
      ) : (
        <>
          <Card title="Hands-on hours by stage kind">
            <Suspense fallback={<Spinner label="Drawing the chart…" />}>
              <ActualsChart kinds={r.kinds} />
            </Suspense>
            <div className="mt-4 overflow-x-auto">
              <table className="min-w-full text-sm">
                <caption className="sr-only">Estimated against actual hours by stage kind</caption>
                <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
                  <tr>
                    <th scope="col" className="px-3 py-2">Stage kind</th>
                    <th scope="col" className="px-3 py-2 text-right">Jobs</th>
                    <th scope="col" className="px-3 py-2 text-right">Sessions</th>
                    <th scope="col" className="px-3 py-2 text-right">Estimated</th>
                    <th scope="col" className="px-3 py-2 text-right">Actual</th>
                    <th scope="col" className="px-3 py-2">Actual ÷ estimated</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-parchment-200">
                  {r.kinds.map((k) => (
                    <tr key={k.kind}>
                      <td className="px-3 py-2 font-medium text-walnut-900">{STAGE_KIND_LABELS[k.kind]}</td>
                      <td className="num px-3 py-2 text-right">{k.jobs}</td>
                      <td className="num px-3 py-2 text-right">{k.sessions}</td>
                      <td className="num px-3 py-2 text-right">{hours(k.estimatedHours)}</td>
                      <td className="num px-3 py-2 text-right">{hours(k.actualHours)}</td>
                      <td className="px-3 py-2">
                        <Ratio ratio={k.ratio} />
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </Card>

          <Card
            title="Suggested corrections"
            actions={
              r.suggestions.length > 0 && (
                <Button variant="accent" disabled={picked.length === 0} onClick={() => setConfirming(true)}>
                  <CheckCheck className="h-4 w-4" aria-hidden /> Apply {picked.length} correction{picked.length === 1 ? '' : 's'}…
                </Button>
              )
            }
          >
            <p className="mb-3 flex gap-2 text-sm text-walnut-600">
              <Info className="mt-0.5 h-4 w-4 shrink-0" aria-hidden />
              Each stage&rsquo;s labour minutes per m² per coat, multiplied by actual ÷ estimated hours of its kind across the finished jobs not yet used to correct it, so a correction never counts the same jobs twice. Set-up minutes per session stay as they are; changes under 2 % are left out. A figure resting on one or two jobs is a hint, not a rule.
            </p>
            {r.suggestions.length === 0 ? (
              <p className="text-sm text-walnut-600">The finishing systems already match the hours logged.</p>
            ) : (
              <div className="overflow-x-auto">
                <table className="min-w-full text-sm">
                  <caption className="sr-only">Suggested corrections to labour minutes</caption>
                  <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
                    <tr>
                      <th scope="col" className="px-3 py-2">
                        <span className="sr-only">Apply</span>
                      </th>
                      <th scope="col" className="px-3 py-2">Stage</th>
                      <th scope="col" className="px-3 py-2">Actual ÷ estimated</th>
                      <th scope="col" className="px-3 py-2 text-right">Now (min/m²/coat)</th>
                      <th scope="col" className="px-3 py-2 text-right">Suggested (min/m²/coat)</th>
                      <th scope="col" className="px-3 py-2">Rests on</th>
                    </tr>
                  </thead>
                  <tbody className="divide-y divide-parchment-200">
                    {[...new Set(r.suggestions.map((s) => s.systemName))].map((systemName) => (
                      <Fragment key={systemName}>
                        <tr className="bg-parchment-50">
                          <th scope="rowgroup" colSpan={6} className="px-3 py-1.5 text-left text-sm font-semibold text-walnut-800">
                            {systemName}
                          </th>
                        </tr>
                        {r.suggestions
                          .filter((s) => s.systemName === systemName)
                          .map((s) => (
                            <tr key={key(s)} className={selected.has(key(s)) ? '' : 'text-walnut-400'}>
                              <td className="px-3 py-2">
                                <input type="checkbox" className="accent-amber-600" checked={selected.has(key(s))} onChange={() => toggle(key(s))} aria-label={`Apply to ${s.systemName}, ${s.stageName}`} />
                              </td>
                              <td className="px-3 py-2">
                                {s.stageName}
                                <span className="block text-xs text-walnut-500">{STAGE_KIND_LABELS[s.kind]}</span>
                              </td>
                              <td className="px-3 py-2">
                                <Ratio ratio={s.ratio} />
                              </td>
                              <td className="num px-3 py-2 text-right">{s.current}</td>
                              <td className="num px-3 py-2 text-right font-semibold">
                                {s.suggested}
                                <span className="ml-1.5 inline-flex items-center text-xs font-normal">
                                  {s.suggested > s.current ? <ArrowUpRight className="h-3 w-3" aria-hidden /> : <ArrowDownRight className="h-3 w-3" aria-hidden />}
                                  {Math.abs(Math.round((s.suggested / s.current - 1) * 100))} % {s.suggested > s.current ? 'more' : 'less'}
                                </span>
                              </td>
                              <td className="px-3 py-2">
                                {s.jobs} finished job{s.jobs === 1 ? '' : 's'}
                                {s.jobs < 3 && <span className="block text-xs text-amber-800">few jobs: treat with care</span>}
                              </td>
                            </tr>
                          ))}
                      </Fragment>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </Card>
        </>
      )}

      <Card title="Finished jobs">
        {r.finishedJobs.length === 0 ? (
          <p className="text-sm text-walnut-500">None yet.</p>
        ) : (
          <ul className="divide-y divide-parchment-200">
            {r.finishedJobs.map((j) => (
              <li key={j.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2 text-sm">
                <span>
                  <Link to={jobPath(j.id)} className="font-semibold text-walnut-800 hover:underline">
                    {j.number}
                  </Link>{' '}
                  · {j.title}
                  {j.finishedOn && <span className="text-walnut-500"> · last session ended {formatDate(j.finishedOn.slice(0, 10))}</span>}
                </span>
                <span className="num text-walnut-700">
                  {hours(j.estimatedHours)} estimated · {hours(j.actualHours)} actual
                </span>
              </li>
            ))}
          </ul>
        )}
      </Card>

      <Dialog title="Apply the corrections?" open={confirming} onClose={() => setConfirming(false)}>
        <p className="mb-3 text-sm text-walnut-700">These labour minutes per m² per coat will change in the finishing systems. New estimates and revisions use them; the change is recorded in the audit log.</p>
        <ul className="mb-4 space-y-1 text-sm">
          {picked.map((s) => (
            <li key={key(s)} className="num">
              {s.systemName}, {s.stageName}: {s.current} → <strong>{s.suggested}</strong> min/m²/coat
            </li>
          ))}
        </ul>
        {apply.isError && <Alert tone="error" title="Not applied">{apply.error.message}</Alert>}
        <div className="flex justify-end gap-2">
          <Button variant="ghost" onClick={() => setConfirming(false)}>
            Cancel
          </Button>
          <Button variant="accent" busy={apply.isPending} onClick={() => void confirm().catch(() => undefined)}>
            Apply {picked.length}
          </Button>
        </div>
      </Dialog>
    </div>
  );
}
