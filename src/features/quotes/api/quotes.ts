import type { z } from 'zod';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type { CreateQuoteInput, FlaggedPayment, PipelineRow, QuoteDetail, QuoteListQuerySchema, QuoteSummary } from '@shared/schemas/quotes';
import { api, toQuery } from '@/lib/api';

/** Customers change quotes from their own link, so whatever shows a quote's state asks the server each time. */
const FRESH = { staleTime: 0, refetchOnWindowFocus: true } as const;

/** The list's search, filter, sort and page (every field optional; the server fills defaults). */
export type QuoteListQueryInput = Partial<z.output<typeof QuoteListQuerySchema>>;

export const quoteKeys = {
  all: ['quotes'] as const,
  lists: () => ['quotes', 'list'] as const,
  list: (query: QuoteListQueryInput) => ['quotes', 'list', query] as const,
  pipeline: () => ['quotes', 'pipeline'] as const,
  detail: (id: number) => ['quotes', 'detail', id] as const,
  ofEstimate: (estimateId: number, number: string) => ['quotes', 'estimate', estimateId, number] as const,
  latest: () => ['quotes', 'latest'] as const,
};

export const quotesQueryOptions = (query: QuoteListQueryInput) =>
  queryOptions({
    queryKey: quoteKeys.list(query),
    queryFn: ({ signal }) => api<Page<QuoteSummary>>(`/api/quotes${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
    ...FRESH,
  });

export const pipelineQueryOptions = queryOptions({
  queryKey: quoteKeys.pipeline(),
  queryFn: ({ signal }) => api<PipelineRow[]>('/api/quotes/pipeline', { signal }),
  ...FRESH,
});

export const quoteQueryOptions = (id: number) =>
  queryOptions({
    queryKey: quoteKeys.detail(id),
    queryFn: ({ signal }) => api<QuoteDetail>(`/api/quotes/${id}`, { signal }),
    ...FRESH,
  });

/**
 * One estimate's quotes. The list has no estimate filter, so it searches by the estimate's number and keeps the rows
 * that belong to this estimate (a number can be the start of another).
 */
export const estimateQuotesQueryOptions = (estimateId: number, estimateNumber: string) =>
  queryOptions({
    queryKey: quoteKeys.ofEstimate(estimateId, estimateNumber),
    queryFn: async ({ signal }) => {
      const page = await api<Page<QuoteSummary>>(`/api/quotes${toQuery({ q: estimateNumber, sort: 'updatedAt', dir: 'desc', pageSize: 100 })}`, { signal });
      return page.rows.filter((q) => q.estimate.id === estimateId);
    },
    ...FRESH,
  });

/** The newest quotes, to put quote dates beside estimates in their list. */
export const latestQuotesQueryOptions = queryOptions({
  queryKey: quoteKeys.latest(),
  queryFn: ({ signal }) => api<Page<QuoteSummary>>(`/api/quotes${toQuery({ sort: 'updatedAt', dir: 'desc', pageSize: 100 })}`, { signal }),
  staleTime: 60_000,
});

export function useQuotes(query: QuoteListQueryInput) {
  return useQuery(quotesQueryOptions(query));
}

export function usePipeline({ enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...pipelineQueryOptions, enabled });
}

export function useQuote(id: number) {
  return useQuery({ ...quoteQueryOptions(id), enabled: id > 0 });
}

export function useEstimateQuotes(estimateId: number, estimateNumber: string) {
  return useQuery({ ...estimateQuotesQueryOptions(estimateId, estimateNumber), enabled: estimateId > 0 && estimateNumber !== '' });
}

export function useLatestQuotes({ enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...latestQuotesQueryOptions, enabled });
}

/** A quote changed: keep the server's answer and refresh every list it shows in, and the estimates it moves. */
function useSettle() {
  const qc = useQueryClient();
  return async (quote: QuoteDetail) => {
    const { link: _link, ...stored } = quote;
    qc.setQueryData(quoteKeys.detail(quote.id), stored);
    await Promise.all([
      qc.invalidateQueries({ queryKey: quoteKeys.all, predicate: (q) => q.queryKey[1] !== 'detail' }),
      qc.invalidateQueries({ queryKey: ['estimates'] }),
      qc.invalidateQueries({ queryKey: ['outbox'] }),
    ]);
  };
}

export function useCreateQuote(estimateId: number) {
  const settle = useSettle();
  return useMutation({
    mutationFn: (input: CreateQuoteInput) => api<QuoteDetail>(`/api/estimates/${estimateId}/quotes`, { method: 'POST', body: input }),
    onSuccess: settle,
  });
}

/** Sends (or sends again): the answer carries the customer's link once. */
export function useSendQuote() {
  const settle = useSettle();
  return useMutation({
    mutationFn: ({ id, recipient }: { id: number; recipient?: string }) =>
      api<QuoteDetail>(`/api/quotes/${id}/send`, { method: 'POST', body: recipient ? { recipient } : {} }),
    onSuccess: settle,
  });
}

export function useWithdrawQuote() {
  const settle = useSettle();
  return useMutation({
    mutationFn: (id: number) => api<QuoteDetail>(`/api/quotes/${id}/withdraw`, { method: 'POST', body: {} }),
    onSuccess: settle,
  });
}

export const quotePdfUrl = (id: number) => `/api/quotes/${id}/pdf`;
export const estimatePdfUrl = (estimateId: number) => `/api/estimates/${estimateId}/quote.pdf`;

export const acceptancePdfUrl = (id: number) => `/api/quotes/${id}/acceptance.pdf`;

/** Payments the owner should look at: paid twice (refunded) or another amount than the deposit. */
export function useFlaggedPayments(enabled: boolean) {
  return useQuery({
    queryKey: ['payments', 'flagged'] as const,
    queryFn: ({ signal }) => api<FlaggedPayment[]>('/api/payments/flagged', { signal }),
    enabled,
    ...FRESH,
  });
}
