import { CircleCheck, ShieldAlert, XCircle } from 'lucide-react';
import { useState } from 'react';
import { useParams } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Logo } from '@/components/logo';
import { Spinner } from '@/components/spinner';
import { formatMoney } from '@/lib/format';
import { useAnswerVariation, usePublicVariation } from '../api/job-progress';

/**
 * Extra work found during the job, as the customer reads it from the link the workshop sent: what it is, why, and
 * its price, with the safety notes; approve or decline. Nothing of the hours, rates or margins behind the price.
 */
export function PublicVariationPage() {
  const token = useParams().token ?? '';
  const variation = usePublicVariation(token);
  const answer = useAnswerVariation(token);
  const [note, setNote] = useState('');
  const v = variation.data;
  return (
    <div className="min-h-screen bg-parchment-100">
      <header className="bg-walnut-900 text-parchment-100">
        <div className="mx-auto max-w-3xl px-4 py-5 sm:px-6">
          <p className="text-xs font-semibold uppercase tracking-[0.2em] text-amber-300">Extra work on your piece</p>
          <p className="mt-1 font-serif text-2xl font-semibold text-parchment-50">{v?.workshopName ?? 'Your job'}</p>
        </div>
      </header>
      <main className="mx-auto max-w-3xl space-y-5 px-3 py-6 sm:px-6">
        {variation.isPending && <Spinner label="Opening…" />}
        {variation.isError && <Alert tone="error" title="This link cannot be opened">{variation.error.message}</Alert>}
        {v && (
          <section aria-labelledby="variation-heading" className="rounded-xl border border-parchment-200 bg-white p-5 shadow-card sm:p-6" data-testid="public-variation">
            <p className="text-sm text-walnut-600">
              {v.pieceTitle} · {v.jobNumber}
            </p>
            <h1 id="variation-heading" className="mt-1 font-serif text-2xl font-semibold text-walnut-900">
              {v.title}
            </h1>
            {v.description && <p className="mt-3 whitespace-pre-line text-walnut-800">{v.description}</p>}
            <p className="mt-4 text-lg text-walnut-900">
              Price: <span className="num font-semibold" data-testid="variation-price">{formatMoney(v.price, v.currency)}</span>
              <span className="text-sm text-walnut-600"> (added to your balance if you approve)</span>
            </p>
            {v.state === 'sent' ? (
              <div className="mt-5 space-y-3">
                <label className="block text-sm text-walnut-800">
                  A note to the workshop (optional)
                  <textarea className="mt-1 block w-full rounded-md border border-parchment-300 p-2" rows={2} maxLength={500} value={note} onChange={(e) => setNote(e.target.value)} />
                </label>
                {answer.isError && <Alert tone="error" title="Your answer was not recorded">{answer.error.message}</Alert>}
                <div className="flex flex-col gap-2 sm:flex-row">
                  <Button busy={answer.isPending && answer.variables?.answer === 'approve'} disabled={answer.isPending} onClick={() => answer.mutate({ answer: 'approve', note })}>
                    Approve the extra work
                  </Button>
                  <Button variant="secondary" busy={answer.isPending && answer.variables?.answer === 'decline'} disabled={answer.isPending} onClick={() => answer.mutate({ answer: 'decline', note })}>
                    Decline
                  </Button>
                </div>
              </div>
            ) : (
              <p className="mt-5 flex items-center gap-2 text-walnut-800" role="status" data-testid="variation-answered">
                {v.state === 'approved' ? <CircleCheck className="h-5 w-5 text-moss-700" aria-hidden /> : <XCircle className="h-5 w-5 text-walnut-500" aria-hidden />}
                {v.state === 'approved' ? 'Approved: thank you. The workshop will add it to the job.' : v.state === 'declined' ? 'Declined: the workshop will carry on with the work agreed.' : 'This proposal was withdrawn by the workshop.'}
              </p>
            )}
            <div className="mt-6 rounded-lg border border-amber-400/60 bg-amber-50 p-4 text-sm text-walnut-800">
              <p className="flex items-center gap-2 font-semibold">
                <ShieldAlert className="h-4 w-4" aria-hidden /> Safety
              </p>
              <ul className="mt-1 list-disc space-y-1 pl-5">
                {v.cautions.map((c) => (
                  <li key={c}>{c}</li>
                ))}
              </ul>
            </div>
          </section>
        )}
      </main>
      <footer className="mx-auto flex max-w-3xl items-center gap-2 px-4 pb-8 text-xs text-walnut-500 sm:px-6">
        <Logo className="h-4 w-4" /> Sent with Shellwright. This page is private to you: please do not share its address.
      </footer>
    </div>
  );
}

export const Component = PublicVariationPage;
