import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CardPayments } from '@shared/schemas/card-payments';
import { api } from '@/lib/api';

export const cardPaymentKeys = {
  all: ['settings', 'card-payments'] as const,
};

export const cardPaymentsQueryOptions = queryOptions({
  queryKey: cardPaymentKeys.all,
  queryFn: ({ signal }) => api<CardPayments>('/api/settings/card-payments', { signal }),
});

export function useCardPayments() {
  return useQuery(cardPaymentsQueryOptions);
}

/** Creates the workshop's account at the provider when needed and answers the address of its set-up form. */
export function useConnectCardPayments() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ url: string }>('/api/settings/card-payments/connect', { method: 'POST', body: {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: cardPaymentKeys.all }),
  });
}

/** Back from the provider's form: asks how far the account has got. */
export function useRefreshCardPayments() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<CardPayments>('/api/settings/card-payments/refresh', { method: 'POST', body: {} }),
    onSuccess: (data) => qc.setQueryData(cardPaymentKeys.all, data),
  });
}

/** Closes the checkouts still open on the account and leaves the workshop without one (to connect another). */
export function useDisconnectCardPayments() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (accountId: string) => api<CardPayments>('/api/settings/card-payments/disconnect', { method: 'POST', body: { accountId } }),
    onSuccess: (data) => qc.setQueryData(cardPaymentKeys.all, data),
    // A 409 (another account connected meanwhile, or a payment being recorded): show what is true now.
    onError: () => qc.invalidateQueries({ queryKey: cardPaymentKeys.all }),
  });
}
