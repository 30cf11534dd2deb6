import { CalendarDays, Truck } from 'lucide-react';
import { CUSTODY_LABELS, JOB_CUSTODY, PHOTO_PHASE_LABELS, VARIATION_STATE_LABELS } from '@shared/schemas/job-end';
import { Alert } from '@/components/alert';
import { formatDate, formatMoney } from '@/lib/format';
import { usePublicJobs } from '../api/job-progress';
import { Section } from './parts';

/** Where the customer's piece is now, its collection and return, extra work, and the photos the workshop shared. */
export function JobProgress({ token }: { token: string }) {
  const jobs = usePublicJobs(token, true);
  if (jobs.isError) return <Alert tone="error" title="The progress of your job could not be shown">{jobs.error.message} Please try again in a moment.</Alert>;
  if (!jobs.data || jobs.data.length === 0) return null;
  return (
    <Section id="progress-heading" title="Your job">
      <div className="space-y-6" data-testid="public-job-progress">
        {jobs.data.map((j) => {
          const step = JOB_CUSTODY.indexOf(j.custody);
          return (
            <article key={j.number} aria-label={`${j.title} (${j.number})`} className="space-y-3">
              <h3 className="font-serif text-lg text-walnut-900">
                {j.title} <span className="text-sm text-walnut-500">{j.number}</span>
              </h3>
              <ol className="grid grid-cols-2 gap-2 text-sm sm:grid-cols-4" aria-label="Where your piece is">
                {JOB_CUSTODY.map((c, i) => (
                  <li
                    key={c}
                    aria-current={i === step ? 'step' : undefined}
                    className={`rounded-md border px-2 py-1.5 ${i === step ? 'border-amber-500 bg-amber-50 font-semibold text-walnut-900' : i < step ? 'border-moss-600/40 bg-moss-100 text-walnut-800' : 'border-parchment-200 text-walnut-500'}`}
                  >
                    {CUSTODY_LABELS[c]}
                  </li>
                ))}
              </ol>
              <p className="text-walnut-800" data-testid="public-job-where">{j.where}</p>
              <dl className="grid grid-cols-1 gap-2 text-sm sm:grid-cols-2">
                <div className="flex gap-2">
                  <Truck className="mt-0.5 h-4 w-4 shrink-0 text-walnut-500" aria-hidden />
                  <div>
                    <dt className="text-xs uppercase tracking-wide text-walnut-500">Collection</dt>
                    <dd className="text-walnut-900">{j.collectionDate ? formatDate(j.collectionDate) : 'Date to be arranged'}{j.collectionArrangement ? ` — ${j.collectionArrangement}` : ''}</dd>
                  </div>
                </div>
                <div className="flex gap-2">
                  <CalendarDays className="mt-0.5 h-4 w-4 shrink-0 text-walnut-500" aria-hidden />
                  <div>
                    <dt className="text-xs uppercase tracking-wide text-walnut-500">Return</dt>
                    <dd className="text-walnut-900">{j.returnDate ? formatDate(j.returnDate) : 'Date to be arranged'}{j.returnArrangement ? ` — ${j.returnArrangement}` : ''}</dd>
                  </div>
                </div>
                {j.completedOn && (
                  <div>
                    <dt className="text-xs uppercase tracking-wide text-walnut-500">Work finished</dt>
                    <dd className="text-walnut-900">{formatDate(j.completedOn)}</dd>
                  </div>
                )}
              </dl>
              {j.variations.length > 0 && (
                <div>
                  <h4 className="text-sm font-semibold text-walnut-900">Extra work found during the job</h4>
                  <ul className="mt-1 space-y-1 text-sm">
                    {j.variations.map((v, i) => (
                      <li key={i} className="flex flex-wrap justify-between gap-2 border-b border-parchment-200 py-1">
                        <span>{v.title} <span className="text-walnut-500">({VARIATION_STATE_LABELS[v.state].toLowerCase()})</span></span>
                        <span className="num">{formatMoney(v.price, v.currency)}</span>
                      </li>
                    ))}
                  </ul>
                </div>
              )}
              {j.photos.length > 0 && (
                <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3" aria-label="Photos of the work">
                  {j.photos.map((p) => (
                    <li key={p.id}>
                      <a href={p.url} target="_blank" rel="noreferrer">
                        <img src={p.thumbUrl} alt={p.caption || `${PHOTO_PHASE_LABELS[p.phase]} photo`} className="aspect-[4/3] w-full rounded-md object-cover" loading="lazy" />
                      </a>
                      <p className="mt-1 text-xs text-walnut-600">{PHOTO_PHASE_LABELS[p.phase]}{p.caption ? `: ${p.caption}` : ''}</p>
                    </li>
                  ))}
                </ul>
              )}
            </article>
          );
        })}
      </div>
    </Section>
  );
}
