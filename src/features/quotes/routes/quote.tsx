import { Ban, FileText } from 'lucide-react';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect, type ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import { PAYMENT_FLAG_LABELS, type QuoteDetail } from '@shared/schemas/quotes';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Spinner } from '@/components/spinner';
import { pathTo } from '@/config/paths';
import { useCan } from '@/lib/permissions';
import { formatDate, formatDateTime, formatMoney, todayIso } from '@/lib/format';
import { acceptancePdfUrl, quotePdfUrl, useQuote, useWithdrawQuote } from '../api/quotes';
import { PriceBreakdown } from '@/components/price-breakdown';
import { QuoteLines } from '../components/quote-lines';
import { QuoteStateBadge } from '../components/quote-state-badge';
import { MILESTONE_ICONS } from '../components/quote-timeline';
import { SendQuote } from '../components/send-quote';

const OPEN = ['draft', 'quoted', 'viewed'] as const;

function Step({ icon, title, at, children, testId }: { icon: keyof typeof MILESTONE_ICONS; title: string; at: string; children?: ReactNode; testId: string }) {
  const Icon = MILESTONE_ICONS[icon];
  return (
    <li className="relative pb-5 pl-8 last:pb-0" data-testid={testId}>
      <span className="absolute left-0 top-0 flex h-6 w-6 items-center justify-center rounded-full border border-amber-400 bg-amber-50 text-amber-700">
        <Icon className="h-3.5 w-3.5" aria-hidden />
      </span>
      <p className="font-semibold text-walnut-900">
        {title} <span className="num ml-1 text-xs font-normal text-walnut-500">{formatDateTime(at)}</span>
      </p>
      {children && <div className="mt-0.5 text-sm text-walnut-700">{children}</div>}
    </li>
  );
}

/** What happened to the quote, in order: made, sent, opened, answered, deposit paid. */
function Timeline({ q }: { q: QuoteDetail }) {
  const c = q.currency;
  const chosen = q.agreed?.extras ?? [];
  return (
    <ol className="relative before:absolute before:bottom-2 before:left-3 before:top-2 before:w-px before:bg-parchment-300" aria-label="Timeline">
      <Step icon="created" title="Prepared" at={q.createdAt} testId="step-created">
        Revision {q.estimate.revision} of estimate {q.estimate.number}
        {q.discountPct > 0 && <>, with <span className="num">{q.discountPct} %</span> discount</>}
      </Step>
      {q.sentAt && (
        <Step icon="sent" title="Sent" at={q.sentAt} testId="step-sent">
          To {q.recipient ?? 'the customer'}, with the PDF and the customer’s link
        </Step>
      )}
      {q.viewedAt && <Step icon="viewed" title="Opened by the customer" at={q.viewedAt} testId="step-viewed" />}
      {q.acceptedAt && (
        <Step icon="accepted" title={`Accepted by ${q.acceptedName ?? 'the customer'}`} at={q.acceptedAt} testId="step-accepted">
          <p>
            Typed name “{q.acceptedName}”{q.acceptedIp && <>, from address <span className="num">{q.acceptedIp}</span></>}.
          </p>
          <p>
            {chosen.length > 0 ? <>Extras taken: {chosen.map((x) => x.label).join(', ')}. </> : 'No extras taken. '}
            {q.agreed && (
              <>
                Total <span className="num font-semibold" data-testid="timeline-agreed-total">{formatMoney(q.agreed.total, c)}</span>, deposit{' '}
                <span className="num font-semibold">{formatMoney(q.agreed.deposit, c)}</span>, balance{' '}
                <span className="num font-semibold">{formatMoney(q.agreed.balance, c)}</span>.
              </>
            )}
          </p>
          <p>
            <a href={acceptancePdfUrl(q.id)} target="_blank" rel="noopener" className="font-medium underline decoration-amber-400 underline-offset-2">
              Acceptance record (PDF)
            </a>
          </p>
        </Step>
      )}
      {q.declinedAt && (
        <Step icon="declined" title="Declined" at={q.declinedAt} testId="step-declined">
          {q.declineReason ? <>“{q.declineReason}”</> : 'No reason given.'}
        </Step>
      )}
      {q.depositPaidAt && (
        <Step icon="deposit" title="Deposit paid" at={q.depositPaidAt} testId="step-deposit">
          By card payment.
        </Step>
      )}
    </ol>
  );
}

function Payments({ q }: { q: QuoteDetail }) {
  if (q.payments.length === 0) return null;
  return (
    <table className="mt-4 w-full text-sm">
      <caption className="mb-1 text-left text-sm font-semibold text-walnut-800">Card payments</caption>
      <thead className="text-left text-xs uppercase tracking-wide text-walnut-500">
        <tr>
          <th scope="col" className="py-1">Started</th>
          <th scope="col" className="py-1">Status</th>
          <th scope="col" className="py-1">Paid</th>
          <th scope="col" className="py-1 text-right">Amount</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-parchment-200">
        {q.payments.map((p) => (
          <tr key={p.id} data-payment-status={p.status} data-flag={p.flag ?? undefined}>
            <td className="num py-1">{formatDateTime(p.createdAt)}</td>
            <td className="py-1">
              <span className="capitalize">{p.status === 'pending' ? 'open' : p.status}</span>
              {p.flag && (
                <span className="mt-0.5 block text-xs font-semibold text-brick-700">
                  {PAYMENT_FLAG_LABELS[p.flag]}
                  {p.note && <span className="block font-normal">{p.note}</span>}
                </span>
              )}
            </td>
            <td className="num py-1">{p.paidAt ? formatDateTime(p.paidAt) : '—'}</td>
            <td className="num py-1 text-right">
              {formatMoney(p.amountReceived ?? p.amount, p.currency)}
              {p.amountReceived && <span className="block text-xs text-walnut-500">asked {formatMoney(p.amount, p.currency)}</span>}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** One quote: its price, its story, and (for sales and the owner) sending again and withdrawing. */
export function QuotePage() {
  const id = Number(useParams().quoteId);
  const quote = useQuote(id);
  const seller = useCan().sendQuotes;
  const withdraw = useWithdrawQuote();
  const qc = useQueryClient();
  const estimateId = quote.data?.estimate.id;
  const state = quote.data?.state;
  // The estimate's state follows its quote's: when the customer has moved the quote on, the estimate moved too.
  useEffect(() => {
    if (estimateId !== undefined && state !== undefined) void qc.invalidateQueries({ queryKey: ['estimates', 'detail', estimateId] });
  }, [qc, estimateId, state]);

  if (quote.isError) return <Alert tone="error" title="The quote could not be loaded">{quote.error.message}</Alert>;
  if (!quote.data) return <Spinner label="Opening the quote…" />;
  const q = quote.data;
  const open = (OPEN as readonly string[]).includes(q.state);
  const lapsed = q.validUntil < todayIso();
  const meta = 'text-xs uppercase tracking-wide text-walnut-500';
  const link = 'font-medium text-walnut-800 underline decoration-amber-400 underline-offset-2 hover:text-amber-700';

  return (
    <>
      <div className="mb-6 border-b border-walnut-100 pb-4">
        <div className="flex flex-wrap items-start justify-between gap-4">
          <div>
            <p className="text-sm font-semibold uppercase tracking-wider text-amber-700">Quote</p>
            <h1 className="mt-0.5 flex flex-wrap items-center gap-3 text-3xl font-semibold tracking-tight text-walnut-900">
              <span className="num">{q.number}</span>
              <QuoteStateBadge state={q.state} />
            </h1>
          </div>
          <div className="flex flex-wrap gap-2">
            <a href={quotePdfUrl(q.id)} target="_blank" rel="noopener" className="inline-flex items-center gap-2 rounded-md border border-walnut-200 bg-white px-4 py-2 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
              <FileText className="h-4 w-4" aria-hidden /> PDF
            </a>
            {seller && (q.state === 'accepted' || q.state === 'deposit-paid') && (
              <Link to={pathTo.account(q.id)} className="inline-flex items-center gap-2 rounded-md bg-walnut-800 px-4 py-2 text-sm font-medium text-parchment-50 hover:bg-walnut-700">
                Account: invoice and payments
              </Link>
            )}
            {seller && open && (
              <Button
                variant="ghost"
                busy={withdraw.isPending}
                onClick={() => {
                  if (window.confirm(`Withdraw quote ${q.number}? The customer’s link will say it was withdrawn.`)) withdraw.mutate(q.id);
                }}
              >
                <Ban className="h-4 w-4" aria-hidden /> Withdraw
              </Button>
            )}
          </div>
        </div>
        <dl className="mt-4 grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-3 lg:grid-cols-5">
          <div><dt className={meta}>Customer</dt><dd><Link className={link} to={pathTo.customer(q.customer.id)}>{q.customer.name}</Link></dd></div>
          <div><dt className={meta}>Estimate</dt><dd><Link className={link} to={pathTo.estimate(q.estimate.id)}>{q.estimate.number}</Link> <span className="text-walnut-500">rev. {q.estimate.revision}</span></dd></div>
          <div><dt className={meta}>Piece</dt><dd>{q.piece ? <Link className={link} to={pathTo.piece(q.piece.id)}>{q.piece.description}</Link> : q.estimate.title}</dd></div>
          <div><dt className={meta}>Valid until</dt><dd className="num">{formatDate(q.validUntil)}</dd></div>
          <div><dt className={meta}>Recipient</dt><dd className="truncate" title={q.recipient ?? undefined}>{q.recipient ?? '—'}</dd></div>
        </dl>
      </div>
      {withdraw.error && <div className="mb-4"><Alert tone="error" title="Not withdrawn">{withdraw.error.message}</Alert></div>}
      {q.flagged > 0 && (
        <div className="mb-4">
          <Alert tone="warning" title={`${q.flagged} payment${q.flagged === 1 ? '' : 's'} to look at`}>
            A payment was taken that does not count as the deposit (paid twice, or another amount). See the card payments below.
          </Alert>
        </div>
      )}
      <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <QuoteLines quote={q} />
          <section aria-labelledby="price-heading" className="rounded-xl border border-parchment-200 bg-white px-5 py-4 shadow-card">
            <h2 id="price-heading" className="mb-3 text-lg font-semibold text-walnut-800">The price</h2>
            <PriceBreakdown pricing={q.pricing} extras={q.extras} agreed={q.agreed} />
          </section>
          {q.message && (
            <section aria-labelledby="message-heading" className="rounded-xl border border-parchment-200 bg-white px-5 py-4 shadow-card">
              <h2 id="message-heading" className="mb-2 text-lg font-semibold text-walnut-800">Covering message</h2>
              <div className="space-y-2 whitespace-pre-line text-sm text-walnut-800">{q.message}</div>
            </section>
          )}
        </div>
        <div className="space-y-6">
          <section aria-labelledby="timeline-heading" className="rounded-xl border border-parchment-200 bg-white px-5 py-4 shadow-card">
            <h2 id="timeline-heading" className="mb-3 text-lg font-semibold text-walnut-800">Timeline</h2>
            <Timeline q={q} />
            <Payments q={q} />
          </section>
          {seller && open && (
            <section aria-labelledby="send-heading" className="rounded-xl border border-parchment-200 bg-white px-5 py-4 shadow-card">
              <h2 id="send-heading" className="mb-3 text-lg font-semibold text-walnut-800">{q.state === 'draft' ? 'Send' : 'Send again'}</h2>
              {lapsed ? (
                <Alert tone="warning" title="Past its date">This quote was valid until {formatDate(q.validUntil)}: prepare a new one from the estimate.</Alert>
              ) : (
                <SendQuote key={q.id} quote={q} />
              )}
            </section>
          )}
        </div>
      </div>
    </>
  );
}

/** The route module's component for React Router's lazy loading. */
export const Component = QuotePage;
