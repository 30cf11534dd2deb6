import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AcceptQuoteInput, PublicQuote } from '@shared/schemas/quotes';
import { api } from '@/lib/api';

/** The customer's side: every call is keyed by the signed link's token; no session, no CSRF token needed. */
export const publicQuoteKeys = {
  detail: (token: string) => ['public-quote', token] as const,
};

const base = (token: string) => `/api/public/quotes/${encodeURIComponent(token)}`;

export const publicQuoteQueryOptions = (token: string) =>
  queryOptions({
    queryKey: publicQuoteKeys.detail(token),
    queryFn: ({ signal }) => api<PublicQuote>(base(token), { signal }),
    staleTime: 0,
  });

export function usePublicQuote(token: string) {
  return useQuery(publicQuoteQueryOptions(token));
}

function useKeep(token: string) {
  const qc = useQueryClient();
  return (quote: PublicQuote) => qc.setQueryData(publicQuoteKeys.detail(token), quote);
}

export function useAcceptQuote(token: string) {
  const keep = useKeep(token);
  return useMutation({
    mutationFn: (input: AcceptQuoteInput) => api<PublicQuote>(`${base(token)}/accept`, { method: 'POST', body: input }),
    onSuccess: keep,
  });
}

export function useDeclineQuote(token: string) {
  const keep = useKeep(token);
  return useMutation({
    mutationFn: (reason: string) => api<PublicQuote>(`${base(token)}/decline`, { method: 'POST', body: { reason } }),
    onSuccess: keep,
  });
}

/** Opens the card payment page for the deposit: the answer is its address. */
export function useDepositCheckout(token: string) {
  return useMutation({
    mutationFn: () => api<{ url: string }>(`${base(token)}/deposit`, { method: 'POST', body: {} }),
  });
}

/** Back from the payment page without paying: closes the open checkout so it shows as cancelled. */
export function useDepositCancelled(token: string) {
  const keep = useKeep(token);
  return useMutation({
    mutationFn: () => api<PublicQuote>(`${base(token)}/deposit/cancel`, { method: 'POST', body: {} }),
    onSuccess: keep,
  });
}

export const publicPdfUrl = (token: string) => `${base(token)}/pdf`;
export const publicAcceptancePdfUrl = (token: string) => `${base(token)}/acceptance.pdf`;
