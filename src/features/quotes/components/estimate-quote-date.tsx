import type { EstimateState } from '@shared/schemas/estimates';
import type { QuoteSummary } from '@shared/schemas/quotes';
import { formatDate } from '@/lib/format';
import { useLatestQuotes } from '../api/quotes';

/** Which of the quote's dates explains each estimate state. */
const DATE_OF: Partial<Record<EstimateState, (q: QuoteSummary) => [string, string | null]>> = {
  quoted: (q) => ['sent', q.sentAt],
  viewed: (q) => ['opened', q.viewedAt],
  accepted: (q) => ['accepted', q.acceptedAt],
  declined: (q) => ['declined', q.declinedAt],
  expired: (q) => ['valid until', q.validUntil],
  'deposit-paid': (q) => ['deposit paid', q.depositPaidAt],
};

/**
 * The date behind an estimate's quote state ("sent 3 Mar 2027"), taken from its newest quote. Estimates carry no quote
 * dates of their own, so this reads the newest quotes once for the whole list.
 */
export function EstimateQuoteDate({ estimateId, state }: { estimateId: number; state: EstimateState }) {
  const pick = DATE_OF[state];
  const latest = useLatestQuotes({ enabled: pick !== undefined });
  if (!pick || !latest.data) return null;
  const quote = latest.data.rows.find((q) => q.estimate.id === estimateId && q.state !== 'withdrawn' && q.state !== 'draft');
  if (!quote) return null;
  const [label, at] = pick(quote);
  if (!at) return null;
  return (
    <span className="num mt-0.5 block whitespace-nowrap text-xs text-walnut-500" data-testid={`estimate-quote-date-${estimateId}`}>
      {label} {formatDate(at)}
    </span>
  );
}
