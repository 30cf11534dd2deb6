/**
 * The owner's first-run checklist on the overview: what a new workshop sets up before its estimates can be
 * trusted, each with whether it is done (computed by the server from the data) and a link to the page that does
 * it. It shows until everything is done, or until the owner puts it away (it can be brought back).
 */
import { CheckCircle2, Circle, ListChecks, X } from 'lucide-react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { useChecklist, useSetChecklistDismissed } from '../api/checklist';

export function FirstRunChecklist() {
  const checklist = useChecklist(true);
  const setDismissed = useSetChecklistDismissed();
  if (checklist.isError) {
    return (
      <div className="mb-6">
        <Alert tone="error" title="The setting-up checklist could not be loaded">
          {checklist.error.message}
        </Alert>
      </div>
    );
  }
  const data = checklist.data;
  if (!data || data.allDone) return null;
  if (data.dismissed) {
    return (
      <button type="button" onClick={() => setDismissed.mutate(false)} className="mb-4 ml-4 inline-flex items-center gap-1.5 text-sm text-walnut-600 underline decoration-walnut-300 underline-offset-2 hover:text-walnut-900">
        <ListChecks className="h-4 w-4" aria-hidden /> Setting up the workshop
      </button>
    );
  }
  const left = data.items.filter((i) => !i.done).length;
  return (
    <section aria-labelledby="first-run-checklist" className="mb-6 rounded-xl border border-walnut-200 bg-white px-4 py-4 sm:px-5" data-testid="first-run-checklist">
      <div className="flex items-start justify-between gap-3">
        <div>
          <h2 id="first-run-checklist" className="flex items-center gap-2 text-lg font-semibold text-walnut-900">
            <ListChecks className="h-5 w-5 text-amber-700" aria-hidden /> Setting up the workshop
          </h2>
          <p className="mt-0.5 text-sm text-walnut-600">
            {left === 1 ? 'One thing left' : `${left} things left`} before estimates price the work properly.
          </p>
        </div>
        <button type="button" onClick={() => setDismissed.mutate(true)} disabled={setDismissed.isPending} className="rounded p-1 text-walnut-600 hover:bg-parchment-100" aria-label="Put the checklist away">
          <X className="h-4 w-4" aria-hidden />
        </button>
      </div>
      {setDismissed.isError && (
        <div className="mt-2">
          <Alert tone="error" title="Not saved">
            {setDismissed.error.message}
          </Alert>
        </div>
      )}
      <ul className="mt-3 divide-y divide-parchment-200 text-sm">
        {data.items.map((item) => (
          <li key={item.key} className="flex items-start gap-3 py-2.5" data-done={item.done}>
            {item.done ? <CheckCircle2 className="mt-0.5 h-5 w-5 shrink-0 text-moss-700" aria-hidden /> : <Circle className="mt-0.5 h-5 w-5 shrink-0 text-walnut-300" aria-hidden />}
            <div className="min-w-0">
              <p className="font-medium text-walnut-900">
                <span className="sr-only">{item.done ? 'Done: ' : 'To do: '}</span>
                {item.done ? (
                  item.label
                ) : (
                  <Link to={item.link} className="underline decoration-walnut-300 underline-offset-2 hover:text-walnut-700">
                    {item.label}
                  </Link>
                )}
              </p>
              <p className="text-walnut-600">{item.detail}</p>
            </div>
          </li>
        ))}
      </ul>
    </section>
  );
}
