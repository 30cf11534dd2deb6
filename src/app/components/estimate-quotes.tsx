import { daysFromToday } from '@shared/time';
import { FileSignature, Plus } from 'lucide-react';
import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { EstimateDetail, EstimateState } from '@shared/schemas/estimates';
import type { QuoteDetail } from '@shared/schemas/quotes';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { pathTo } from '@/config/paths';
import { useMe } from '@/lib/me';
import { useCan } from '@/lib/permissions';
import { useCalcCatalog } from '@/lib/catalog';
import { formatDate, formatMoney } from '@/lib/format';
import { useCustomer } from '@/features/customers/api/customers';
import { useEstimateQuotes } from '@/features/quotes/api/quotes';
import { QuoteDates } from '@/features/quotes/components/quote-timeline';
import { QuoteStateBadge } from '@/features/quotes/components/quote-state-badge';
import { QuoteForm } from './quote-form';

/** Estimate states from which a new quote may be made (the server holds the same list). */
const QUOTABLE: readonly EstimateState[] = ['priced', 'quoted', 'viewed', 'expired', 'declined'];

/**
 * The quotes made from one estimate, with their states and dates; sales and the owner prepare a new one here once the
 * estimate is priced, check its price, preview its PDF and send it.
 */
export function EstimateQuotes({ estimate }: { estimate: EstimateDetail }) {
  const role = useMe().data?.role;
  const seller = useCan().sendQuotes;
  const quotes = useEstimateQuotes(estimate.id, estimate.number);
  const calc = useCalcCatalog();
  const customer = useCustomer(seller ? estimate.customer.id : undefined);
  const [formOpen, setFormOpen] = useState(false);
  const quotable = QUOTABLE.includes(estimate.state) && !estimate.archived;
  const settings = calc.data?.settings;

  const navigate = useNavigate();
  // "Prepare the quote" opens the quote it made: its price, PDF and sending are on the quote's own page.
  const onCreated = (q: QuoteDetail) => {
    setFormOpen(false);
    void navigate(pathTo.quote(q.id));
  };

  return (
    <section aria-labelledby="quotes-heading" className="rounded-xl border border-parchment-200 bg-white shadow-card" data-testid="estimate-quotes">
      <header className="flex flex-wrap items-center justify-between gap-2 border-b border-parchment-200 px-4 py-2.5">
        <h2 id="quotes-heading" className="flex items-center gap-2 text-base font-semibold text-walnut-800">
          <FileSignature className="h-4 w-4 text-amber-600" aria-hidden /> Quotes
        </h2>
        {seller && quotable && !formOpen && (
          <Button size="sm" variant="accent" onClick={() => setFormOpen(true)} disabled={!settings}>
            <Plus className="h-3.5 w-3.5" aria-hidden /> Prepare a quote
          </Button>
        )}
      </header>
      <div className="space-y-4 px-4 py-3">
        {estimate.agreed && (
          <div className="rounded-lg border border-moss-600/40 bg-moss-100 px-3 py-2 text-sm text-walnut-800" data-testid="estimate-agreed">
            <p className="font-semibold text-walnut-900">
              Agreed in quote{' '}
              <Link to={pathTo.quote(estimate.agreed.quoteId)} className="num underline decoration-amber-400 underline-offset-2">
                {estimate.agreed.quoteNumber}
              </Link>
              {estimate.agreed.depositPaid ? ', deposit paid' : ''}
            </p>
            <p>
              Total <span className="num font-semibold" data-testid="estimate-agreed-total">{formatMoney(estimate.agreed.total, estimate.currency)}</span>, deposit{' '}
              <span className="num">{formatMoney(estimate.agreed.deposit, estimate.currency)}</span>, balance{' '}
              <span className="num">{formatMoney(estimate.agreed.balance, estimate.currency)}</span>
              {estimate.agreed.extras.length > 0 && <> (with {estimate.agreed.extras.join(', ')})</>}.
            </p>
          </div>
        )}
        {seller && !quotable && estimate.state === 'draft' && (
          <p className="text-sm text-walnut-600">A quote can be prepared once the estimator marks this estimate as priced.</p>
        )}
        {formOpen && role && settings && (
          <QuoteForm
            estimateId={estimate.id}
            customerId={estimate.customer.id}
            estimateTitle={estimate.title}
            revisions={estimate.revisions}
            role={role}
            onCreated={onCreated}
            onCancel={() => setFormOpen(false)}
            defaults={{
              currentRevision: estimate.current.number,
              revisionDiscountPct: estimate.current.input.discountPct ?? 0,
              recipient: customer.data?.email ?? '',
              depositPct: settings.pricing.depositPct,
              maxDiscountPct: settings.pricing.maxDiscountPct,
              validUntil: daysFromToday(settings.quoteValidityDays, settings.timeZone),
              currency: estimate.currency,
            }}
          />
        )}
        {quotes.isError ? (
          <Alert tone="error" title="The quotes could not be loaded">{quotes.error.message}</Alert>
        ) : quotes.data && quotes.data.length === 0 ? (
          <p className="text-sm text-walnut-500">No quote yet.</p>
        ) : (
          <ol className="divide-y divide-parchment-200" aria-label="Quotes of this estimate">
            {(quotes.data ?? []).map((q) => (
              <li key={q.id} className="flex flex-wrap items-start justify-between gap-3 py-2.5 text-sm" data-testid={`estimate-quote-${q.number}`}>
                <div className="min-w-0">
                  <p className="flex flex-wrap items-center gap-2">
                    <Link to={pathTo.quote(q.id)} className="num font-semibold text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700">
                      {q.number}
                    </Link>
                    <QuoteStateBadge state={q.state} />
                    <span className="text-xs text-walnut-500">revision {q.estimate.revision} · valid until {formatDate(q.validUntil)}</span>
                  </p>
                  <QuoteDates quote={q} className="mt-1" />
                </div>
                <div className="num shrink-0 text-right">
                  <p className="font-semibold text-walnut-900">{formatMoney(q.total, q.currency)}</p>
                  <p className="text-xs text-walnut-500">deposit {formatMoney(q.deposit, q.currency)}</p>
                </div>
              </li>
            ))}
          </ol>
        )}
      </div>
    </section>
  );
}
