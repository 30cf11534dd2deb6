import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { RepriceCandidates, RepriceResult } from '@shared/schemas/estimates';
import { api } from '@/lib/api';

export type { RepriceCandidates, RepricedEstimate, RepriceResult, RepriceRow } from '@shared/schemas/estimates';

export const repriceKeys = {
  // Under the estimates' key, so that every estimate mutation refreshes it too.
  candidates: () => ['estimates', 'reprice'] as const,
};

export const repriceCandidatesQueryOptions = () =>
  queryOptions({
    queryKey: repriceKeys.candidates(),
    queryFn: ({ signal }) => api<RepriceCandidates>('/api/estimates/reprice', { signal }),
  });

/** Open estimates on an older price list (owner only). */
export function useRepriceCandidates({ enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...repriceCandidatesQueryOptions(), enabled, refetchOnMount: 'always' });
}

/**
 * Reprices the chosen estimates: each gets a new revision priced with today's list. The server works through them
 * one by one, so after a failure some may already be repriced: the lists are refreshed either way.
 */
export function useRepriceEstimates() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (ids: number[]) => api<RepriceResult>('/api/estimates/reprice', { method: 'POST', body: { ids } }),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: ['estimates'] }), qc.invalidateQueries({ queryKey: ['customers'] })]),
  });
}
