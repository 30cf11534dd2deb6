import { Banknote, CircleCheck, CircleX, Download, Hourglass, Link2Off, Ban } from 'lucide-react';
import { useEffect, type ReactNode } from 'react';
import { useParams, useSearchParams } from 'react-router-dom';
import type { PublicQuote } from '@shared/schemas/quotes';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Logo } from '@/components/logo';
import { Spinner } from '@/components/spinner';
import { PriceBreakdown } from '@/components/price-breakdown';
import { ApiError } from '@/lib/api';
import { formatDate, formatMoney } from '@/lib/format';
import { publicAcceptancePdfUrl, publicPdfUrl, useDepositCancelled, useDepositCheckout, usePublicQuote } from '../api/public-quote';
import { Answer } from '../components/answer';
import { Balance } from '../components/balance';
import { JobProgress } from '../components/job-progress';
import { Contact, Letterhead, Safety, Section } from '../components/parts';

function Shell({ workshop, children }: { workshop: PublicQuote['workshop'] | null; children: ReactNode }) {
  return (
    <div className="min-h-screen bg-parchment-100">
      <Letterhead workshop={workshop} />
      <main className="mx-auto max-w-4xl space-y-5 px-3 py-6 sm:px-6 sm:py-8">{children}</main>
      <footer className="mx-auto flex max-w-4xl items-center gap-2 px-4 pb-8 text-xs text-walnut-500 sm:px-6">
        <Logo className="h-4 w-4" /> Quote sent with Shellwright. This page is private to you: please do not share its address.
      </footer>
    </div>
  );
}

/** A plain notice for a link that cannot be acted on, with how to reach the workshop. */
function Notice({ icon, title, children, workshop }: { icon: ReactNode; title: string; children: ReactNode; workshop?: PublicQuote['workshop'] }) {
  return (
    <section className="rounded-xl border border-parchment-200 bg-white p-6 text-center shadow-card sm:p-10" role="status" data-testid="link-notice">
      <div className="mx-auto flex h-12 w-12 items-center justify-center rounded-full border border-amber-400 bg-amber-50 text-amber-700">{icon}</div>
      <h1 className="mt-4 font-serif text-2xl font-semibold text-walnut-900">{title}</h1>
      <div className="mx-auto mt-2 max-w-md text-walnut-700">{children}</div>
      {workshop && (workshop.phone || workshop.email) && (
        <div className="mx-auto mt-5 max-w-xs rounded-lg bg-parchment-50 px-4 py-3 text-sm text-walnut-800">
          <p className="font-semibold">{workshop.name}</p>
          <Contact workshop={workshop} className="mt-1 [&_p]:justify-center" />
        </div>
      )}
    </section>
  );
}

/** What became of an answered quote, in a sentence, with the deposit button while it is due. */
function Outcome({ token, q, returned }: { token: string; q: PublicQuote; returned: string | null }) {
  const checkout = useDepositCheckout(token);
  const c = q.pricing.currency;
  const total = q.agreed?.total ?? q.pricing.total;
  const deposit = q.agreed?.deposit ?? q.pricing.deposit;
  const balance = q.agreed?.balance ?? q.pricing.balance;
  const chosen = q.agreed?.extras ?? [];
  if (q.state === 'declined') {
    return (
      <Section id="outcome-heading" title="You declined this quote">
        <p className="flex items-start gap-2 text-walnut-700" data-testid="outcome">
          <CircleX className="mt-0.5 h-5 w-5 shrink-0 text-brick-700" aria-hidden />
          <span>Declined{q.declinedAt && <> on <span className="whitespace-nowrap">{formatDate(q.declinedAt)}</span></>}. Thank you for letting us know; if you change your mind, please get in touch and we will prepare a new quote.</span>
        </p>
      </Section>
    );
  }
  const paid = q.state === 'deposit-paid';
  return (
    <section aria-labelledby="outcome-heading" className={`rounded-xl border-2 p-5 shadow-card sm:p-6 ${paid ? 'border-moss-600/50 bg-moss-100' : 'border-amber-400 bg-amber-50'}`} data-testid="outcome">
      <h2 id="outcome-heading" className="flex items-center gap-2 font-serif text-xl font-semibold text-walnut-900">
        {paid ? <Banknote className="h-6 w-6 text-moss-700" aria-hidden /> : <CircleCheck className="h-6 w-6 text-moss-700" aria-hidden />}
        {paid ? 'Accepted, deposit paid' : 'Accepted: thank you'}
      </h2>
      <p className="mt-2 text-walnut-800">
        Accepted by <strong>{q.acceptedName}</strong>
        {q.acceptedAt && <> on <span className="whitespace-nowrap">{formatDate(q.acceptedAt)}</span></>}, for a total of <strong className="num">{formatMoney(total, c)}</strong>
        {chosen.length > 0 && <> including {chosen.map((x) => x.label).join(', ')}</>}. The balance of{' '}
        <strong className="num" data-testid="outcome-balance">{formatMoney(balance, c)}</strong> is due when the piece is ready.
      </p>
      <p className="mt-2 text-sm">
        <a href={publicAcceptancePdfUrl(token)} target="_blank" rel="noopener" className="font-semibold text-amber-800 underline decoration-amber-400 underline-offset-2">
          Download the record of your acceptance (PDF)
        </a>
      </p>
      {paid ? (
        <p className="mt-2 text-walnut-800" data-testid="deposit-paid">
          <strong>Deposit paid</strong>: <span className="num">{formatMoney(deposit, c)}</span>
          {q.depositPaidAt && <> on <span className="whitespace-nowrap">{formatDate(q.depositPaidAt)}</span></>}.{' '}
          {q.schedule.booked && q.schedule.start && q.schedule.ready ? (
            <span data-testid="booked-dates">
              Your work is booked: we start on <strong className="whitespace-nowrap">{formatDate(q.schedule.start)}</strong> and expect it to be ready on{' '}
              <strong className="whitespace-nowrap">{formatDate(q.schedule.ready)}</strong>.
            </span>
          ) : (
            <span data-testid="not-booked">We will now book the work into the drying room and confirm the dates with you.</span>
          )}
        </p>
      ) : (
        <>
          {returned === 'paid' && (
            <div className="mt-3">
              <Alert tone="info" title="Payment made: waiting for the confirmation">This page updates itself in a moment.</Alert>
            </div>
          )}
          {returned === 'cancelled' && (
            <div className="mt-3">
              <Alert tone="warning" title="Payment cancelled">Nothing was charged. You can pay the deposit whenever you are ready.</Alert>
            </div>
          )}
          {q.checkout.available ? (
            <>
              <p className="mt-2 text-walnut-800">
                The deposit of <strong className="num">{formatMoney(deposit, c)}</strong> ({q.pricing.depositPct} %) books the work. You pay it on a secure card payment page and come back here afterwards.
              </p>
              {checkout.error && (
                <div className="mt-3">
                  <Alert tone="error" title="The payment page could not be opened">{checkout.error.message}</Alert>
                </div>
              )}
              <Button
                variant="accent"
                className="mt-4 px-5 py-2.5 text-base"
                busy={checkout.isPending}
                onClick={() => checkout.mutate(undefined, { onSuccess: ({ url }) => window.location.assign(url) })}
              >
                <Banknote className="h-5 w-5" aria-hidden /> Pay the deposit of {formatMoney(deposit, c)}
              </Button>
            </>
          ) : (
            <p className="mt-2 text-walnut-800" data-testid="no-card-payments">
              The deposit of <strong className="num">{formatMoney(deposit, c)}</strong> ({q.pricing.depositPct} %) books the work. Card payments are not set up for this workshop, so it cannot be paid
              here: please pay it the way {q.workshop.name} tells you, or get in touch with them.
            </p>
          )}
        </>
      )}
    </section>
  );
}

/** The pieces of a quote of several, each with its options: the work in plain words and the price of each. */
function Pieces({ q }: { q: PublicQuote }) {
  const groups = [...new Set(q.lines.map((l) => l.group))];
  return (
    <Section id="work-heading" title="The pieces and the work">
      <div className="space-y-6">
        {groups.map((g, gi) => {
          const of = q.lines.filter((l) => l.group === g);
          return (
            <div key={g} data-testid={`piece-${gi + 1}`}>
              <h3 className="font-serif text-xl font-semibold text-walnut-900">Piece {gi + 1}: {of[0]!.piece}</h3>
              {(of.length > 1 || of[0]!.groupOptional) && (
                <p className="text-sm text-walnut-600">
                  {of.length > 1 ? `${of.length} ways of doing it: you choose one below, before accepting` : 'You may include it or leave it out'}
                  {of.length > 1 && of[0]!.groupOptional ? ', or leave the piece out' : ''}.
                </p>
              )}
              <div className="mt-3 space-y-4">
                {of.map((l, i) => (
                  <div key={l.id} className={`rounded-lg border p-4 ${l.chosen ? 'border-moss-600/50' : 'border-parchment-200'}`}>
                    <div className="flex flex-wrap items-baseline justify-between gap-2">
                      <p className="font-semibold text-walnut-900">
                        {of.length > 1 ? `Option ${String.fromCharCode(65 + i)}: ` : ''}
                        {l.label || l.work.systemName}
                        {l.recommended && of.length > 1 && <span className="ml-2 rounded-full border border-amber-400 bg-amber-50 px-2 py-0.5 text-xs text-amber-800">We recommend</span>}
                        {l.chosen !== null && <span className="ml-2 rounded-full border border-walnut-200 px-2 py-0.5 text-xs text-walnut-600">{l.chosen ? 'Your choice' : 'Not chosen'}</span>}
                      </p>
                      <p className="num font-serif text-lg font-semibold text-walnut-900">{formatMoney(l.total, q.pricing.currency)}</p>
                    </div>
                    <WorkBody w={l.work} />
                  </div>
                ))}
              </div>
            </div>
          );
        })}
      </div>
      <p className="mt-4 text-sm text-walnut-700" data-testid="schedule">
        {q.schedule.booked && q.schedule.start && q.schedule.ready
          ? `Booked: we start on ${formatDate(q.schedule.start)}.`
          : 'The time each piece stays with us is an estimate: the dates are fixed when we book the work into the drying room, after the deposit is paid.'}
      </p>
    </Section>
  );
}

function WorkBody({ w }: { w: PublicQuote['work'] }) {
  const facts: [string, string][] = [
    ['Surface', w.areaText],
    ['Coats of shellac', `${w.coats} ${w.coats === 1 ? 'coat' : 'coats'}`],
    ['Hands-on work', `${w.labourHours.toLocaleString('en-GB', { maximumFractionDigits: 1 })} h`],
    ['With the workshop', `${w.calendarDays} ${w.calendarDays === 1 ? 'day' : 'days'}`],
  ];
  return (
    <>
      <p className="mt-1 text-sm text-walnut-700">
        {w.systemName}: we finish {w.areaText} of surface in {w.coats} thin coats over {w.stages.length} stages, with rests between them so each layer hardens.
      </p>
      <dl className="mt-2 grid grid-cols-2 gap-2 sm:grid-cols-4">
        {facts.map(([label, value]) => (
          <div key={label} className="rounded-lg border border-parchment-200 bg-parchment-50 px-3 py-1.5">
            <dt className="text-xs uppercase tracking-wide text-walnut-500">{label}</dt>
            <dd className="num font-semibold text-walnut-900">{value}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-2 text-xs text-walnut-600">Stages: {w.stages.map((s) => `${s.name} (${s.hours.toLocaleString('en-GB')} h)`).join(', ')}.</p>
    </>
  );
}

function Work({ q }: { q: PublicQuote }) {
  const w = q.work;
  const facts: [string, string][] = [
    ['Surface', w.areaText],
    ['Coats of shellac', `${w.coats} ${w.coats === 1 ? 'coat' : 'coats'}`],
    ['Hands-on work', `${w.labourHours.toLocaleString('en-GB', { maximumFractionDigits: 1 })} h`],
    ['With the workshop', `${w.calendarDays} ${w.calendarDays === 1 ? 'day' : 'days'}`],
  ];
  return (
    <Section id="work-heading" title="The work">
      <p className="text-xs font-semibold uppercase tracking-wider text-amber-700">Finishing</p>
      <p className="font-serif text-lg font-semibold text-walnut-900">{w.systemName}</p>
      <p className="mt-1 text-sm text-walnut-700">
        We will finish {w.areaText} of surface, building the polish up in {w.coats} thin coats over {w.stages.length} stages. Between stages the polish rests so
        that each layer hardens before the next goes on: that is why the piece stays with us longer than the hours of work alone.
      </p>
      <dl className="mt-4 grid grid-cols-2 gap-2 sm:grid-cols-4">
        {facts.map(([label, value]) => (
          <div key={label} className="rounded-lg border border-parchment-200 bg-parchment-50 px-3 py-2">
            <dt className="text-xs uppercase tracking-wide text-walnut-500">{label}</dt>
            <dd className="num font-serif text-lg font-semibold text-walnut-900">{value}</dd>
          </div>
        ))}
      </dl>
      <table className="mt-4 w-full text-sm">
        <caption className="sr-only">Stages of the work</caption>
        <thead className="border-b border-parchment-200 text-left text-xs uppercase tracking-wide text-walnut-500">
          <tr>
            <th scope="col" className="py-1.5">Stage</th>
            <th scope="col" className="py-1.5 text-right">Sessions</th>
            <th scope="col" className="py-1.5 text-right">Coats</th>
            <th scope="col" className="py-1.5 text-right">Hands-on</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {w.stages.map((s, i) => (
            <tr key={`${s.name}-${i}`}>
              <td className="py-1.5"><span className="num mr-2 text-walnut-400">{i + 1}.</span>{s.name}</td>
              <td className="num py-1.5 text-right">{s.sessions}</td>
              <td className="num py-1.5 text-right">{s.coats === null ? <span aria-label="no coats at this stage">—</span> : s.coats}</td>
              <td className="num py-1.5 text-right">{s.hours.toLocaleString('en-GB')} h</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-3 text-sm text-walnut-700" data-testid="schedule">
        {q.schedule.booked && q.schedule.start && q.schedule.ready
          ? `Booked: we start on ${formatDate(q.schedule.start)} and expect your piece to be ready on ${formatDate(q.schedule.ready)}.`
          : `About ${w.calendarDays} ${w.calendarDays === 1 ? 'day' : 'days'} with us once the work starts. That is an estimate: the dates are fixed when we book the work into the drying room, after the deposit is paid.`}
      </p>
    </Section>
  );
}

/**
 * The customer's own page, opened from the link in the e-mail without signing in: the quote to read, the PDF, and
 * the answer (accept with extras, or decline), then the deposit by card.
 */
export function PublicQuotePage() {
  const token = useParams().token ?? '';
  const [params] = useSearchParams();
  const returned = params.get('deposit');
  const quote = usePublicQuote(token);
  const q = quote.data;
  const awaitingPayment = returned === 'paid' && q?.state === 'accepted';
  const { refetch } = quote;
  const cancelled = useDepositCancelled(token);
  const cancelOpen = returned === 'cancelled' && q?.state === 'accepted' && q.checkout.open;
  const { mutate: closeCheckout, isIdle: closeIdle } = cancelled;

  // Back from the payment page without paying: the checkout left open there is closed, and shows as cancelled.
  useEffect(() => {
    if (cancelOpen && closeIdle) closeCheckout();
  }, [cancelOpen, closeIdle, closeCheckout]);

  // Back from the payment page: the confirmation may trail the customer by a moment, so look again a few times.
  useEffect(() => {
    if (!awaitingPayment) return;
    const timer = window.setInterval(() => void refetch(), 2000);
    const stop = window.setTimeout(() => window.clearInterval(timer), 60_000);
    return () => {
      window.clearInterval(timer);
      window.clearTimeout(stop);
    };
  }, [awaitingPayment, refetch]);

  useEffect(() => {
    if (q) document.title = `Quote ${q.number} from ${q.workshop.name}`;
  }, [q]);

  if (quote.isError) {
    const invalid = quote.error instanceof ApiError && quote.error.status === 404;
    return (
      <Shell workshop={null}>
        {invalid ? (
          <Notice icon={<Link2Off className="h-6 w-6" aria-hidden />} title="This link is not valid">
            <p>{quote.error.message}</p>
            <p className="mt-2 text-sm">If the workshop has sent the quote again, use the link in the newest e-mail: earlier links stop working.</p>
          </Notice>
        ) : (
          <Alert tone="error" title="The quote could not be opened">{quote.error.message} Please try again in a moment.</Alert>
        )}
      </Shell>
    );
  }
  if (!q) {
    return (
      <Shell workshop={null}>
        <Spinner label="Opening your quote…" />
      </Shell>
    );
  }

  if (q.closed === 'expired' || q.closed === 'withdrawn') {
    const expired = q.closed === 'expired';
    return (
      <Shell workshop={q.workshop}>
        <Notice
          icon={expired ? <Hourglass className="h-6 w-6" aria-hidden /> : <Ban className="h-6 w-6" aria-hidden />}
          title={expired ? 'This quote has expired' : 'This quote has been withdrawn'}
          workshop={q.workshop}
        >
          <p>
            {expired
              ? `Quote ${q.number} was valid until ${formatDate(q.validUntil)} and can no longer be accepted. Ask ${q.workshop.name} for a new one: prices after that date follow the price list of the day.`
              : `${q.workshop.name} has withdrawn quote ${q.number}, usually because a newer one has been sent. Please use the link in the newest e-mail, or get in touch.`}
          </p>
        </Notice>
      </Shell>
    );
  }

  const answerable = q.closed === null;
  const withChosen = q.agreed !== null && q.agreed.extras.length > 0;
  return (
    <Shell workshop={q.workshop}>
      <section className="rounded-xl border border-parchment-200 bg-white p-5 shadow-card sm:p-6">
        <div className="flex flex-col gap-4 sm:flex-row sm:items-start sm:justify-between">
          <div>
            <p className="text-xs font-semibold uppercase tracking-[0.2em] text-amber-700">Quote <span className="num">{q.number}</span></p>
            <h1 className="mt-1 font-serif text-3xl font-semibold text-walnut-900">{q.piece}</h1>
            <p className="mt-1 text-walnut-700">Prepared for {q.customerName}</p>
          </div>
          <div className="flex flex-col items-start gap-2 sm:items-end">
            <p className="rounded-full border border-walnut-200 bg-parchment-50 px-3 py-1 text-sm text-walnut-700">
              Valid until <strong className="num">{formatDate(q.validUntil)}</strong>
            </p>
            <a href={publicPdfUrl(token)} target="_blank" rel="noopener" className="inline-flex items-center gap-2 rounded-md border border-walnut-200 bg-white px-3 py-1.5 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
              <Download className="h-4 w-4" aria-hidden /> Download the PDF
            </a>
          </div>
        </div>
        <div className="mt-5 grid gap-px overflow-hidden rounded-lg border border-walnut-800 bg-walnut-800 text-parchment-50 sm:grid-cols-2">
          <div className="bg-walnut-900 px-4 py-3">
            <p className="text-xs uppercase tracking-wide text-parchment-200">
              {withChosen ? 'Total accepted, with your extras' : `Total, ${q.pricing.taxLabel} included`}
            </p>
            <p className="num font-serif text-3xl font-semibold text-amber-300" data-testid="public-total">{formatMoney(q.agreed?.total ?? q.pricing.total, q.pricing.currency)}</p>
          </div>
          <div className="bg-walnut-900 px-4 py-3">
            <p className="text-xs uppercase tracking-wide text-parchment-200">
              {q.state === 'deposit-paid' ? 'Deposit paid' : 'Deposit to book the work'} ({q.pricing.depositPct} %)
            </p>
            <p className="num font-serif text-3xl font-semibold text-parchment-50" data-testid="public-deposit">{formatMoney(q.agreed?.deposit ?? q.pricing.deposit, q.pricing.currency)}</p>
          </div>
        </div>
        {answerable && (
          <p className="mt-4 text-sm text-walnut-700">
            Read on for the work, the price, the terms and the safety notes, then{' '}
            <a href="#answer-heading" className="font-semibold text-amber-800 underline decoration-amber-400 underline-offset-2">
              accept or decline further down
            </a>
            .
          </p>
        )}
        {q.message && <div className="mt-5 whitespace-pre-line border-l-2 border-amber-400 pl-4 text-walnut-800">{q.message}</div>}
      </section>

      {!answerable && <Outcome token={token} q={q} returned={returned} />}
      {q.state === 'deposit-paid' && <Balance token={token} returned={params.get('balance')} />}
      {q.state === 'deposit-paid' && <JobProgress token={token} />}
      {q.lines.length > 1 ? <Pieces q={q} /> : <Work q={q} />}
      <Section id="price-heading" title="The price">
        {q.lines.length > 1 && (
          <p className="mb-2 text-sm italic text-walnut-600">
            {q.agreed ? 'For the options you chose, added together.' : 'For the options we recommend, added together; your total follows your choice below.'}
          </p>
        )}
        <PriceBreakdown pricing={q.pricing} pricesIncludeTax={q.pricesIncludeTax} agreed={q.agreed} />
        <p className="mt-3 text-sm italic text-walnut-600">This quote is valid until {formatDate(q.validUntil)}.</p>
      </Section>
      <Section id="terms-heading" title="Terms">
        <ol className="list-decimal space-y-1.5 pl-5 text-sm text-walnut-700">
          {q.terms.map((t) => (
            <li key={t}>{t}</li>
          ))}
        </ol>
      </Section>
      <Safety cautions={q.cautions} />
      {answerable ? (
        <Answer token={token} quote={q} />
      ) : (
        q.extras.length > 0 && (
          <Section id="extras-heading" title="Optional extras">
            <ul className="divide-y divide-parchment-200 text-sm">
              {q.extras.map((x) => {
                const taken = q.acceptedExtras?.includes(x.id) ?? false;
                return (
                  <li key={x.id} className="flex items-start justify-between gap-3 py-2">
                    <span>
                      <span className="font-medium text-walnut-900">{x.label}</span>{' '}
                      <span className={`ml-1 rounded-full border px-2 py-0.5 text-xs ${taken ? 'border-moss-600/50 bg-moss-100 text-moss-700' : 'border-walnut-200 text-walnut-500'}`}>{taken ? 'Taken' : 'Not taken'}</span>
                      {x.description && <span className="block text-walnut-600">{x.description}</span>}
                    </span>
                    <span className="num shrink-0">{formatMoney(x.priceWithTax, q.pricing.currency)}</span>
                  </li>
                );
              })}
            </ul>
          </Section>
        )
      )}
      <Section id="contact-heading" title="Questions?">
        <p className="text-sm text-walnut-700">Call or write to {q.workshop.name}; quote the number {q.number}.</p>
        <Contact workshop={q.workshop} className="mt-2 text-sm text-walnut-800 [&_p]:justify-start" />
      </Section>
    </Shell>
  );
}

/** The route module's component for React Router's lazy loading. */
export const Component = PublicQuotePage;
