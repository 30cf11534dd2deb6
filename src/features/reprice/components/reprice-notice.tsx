import { useMutationState } from '@tanstack/react-query';
import { ArrowRight } from 'lucide-react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { paths } from '@/config/paths';
import { setPackPriceMutationKey } from '@/lib/query-keys';
import { useRepriceCandidates } from '../api/reprice';

/**
 * After a price change: how many open estimates still carry figures from an older price list, with a link to
 * reprice them. Shows nothing when there are none (or while the count is loading). For the owner only.
 */
export function RepriceNotice() {
  const candidates = useRepriceCandidates();
  const n = candidates.data?.rows.length ?? 0;
  if (!candidates.isFetchedAfterMount || n === 0) return null;
  return (
    <Alert
      tone="warning"
      title={
        <>
          {n} open estimate{n === 1 ? ' uses' : 's use'} older prices —{' '}
          <Link to={paths.reprice} className="inline-flex items-center gap-1 underline decoration-amber-500 underline-offset-2 hover:text-walnut-900">
            review repricing <ArrowRight className="h-3.5 w-3.5" aria-hidden />
          </Link>
        </>
      }
    >
      Their saved figures come from an earlier price list. Nothing changes until you choose: repricing saves a new revision and keeps the old ones.
    </Alert>
  );
}

/** The notice, once a new pack price has been saved on this page (counted afresh after each one). */
export function RepriceAfterPriceChange() {
  const saved = useMutationState({ filters: { mutationKey: setPackPriceMutationKey, status: 'success' }, select: (m) => m.state.submittedAt });
  if (saved.length === 0) return null;
  return (
    <div className="mb-4">
      <RepriceNotice key={Math.max(...saved)} />
    </div>
  );
}
