import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { EstimateState } from '@shared/schemas/estimates';
import { api } from '@/lib/api';

/** An open estimate whose current revision was priced with an older price list, and its total with today's. */
export interface RepriceRow {
  id: number;
  number: string;
  title: string;
  customer: string;
  state: EstimateState;
  /** The price list its current revision was priced with (internal version, to compare with). */
  catalogVersion: string;
  /** The same, as people name it: "prices of 2 Dec 2026". */
  priceList: string;
  oldTotal: string;
  newTotal: string;
  currency: string;
}

export interface RepriceCandidates {
  /** Today's price list (internal version). */
  catalogVersion: string;
  /** Today's price list as people name it. */
  priceList: string;
  rows: RepriceRow[];
}

export interface RepricedEstimate {
  id: number;
  number: string;
  total: string;
  /** The new revision's number. */
  revision: number;
}

export interface RepriceResult {
  repriced: RepricedEstimate[];
  /** Estimates today's prices leave as they were: no new revision was made. */
  unchanged?: RepricedEstimate[];
}

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
