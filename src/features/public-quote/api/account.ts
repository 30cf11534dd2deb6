import { queryOptions, useMutation, useQuery } from '@tanstack/react-query';
import type { PublicAccount } from '@shared/schemas/accounts';
import { api } from '@/lib/api';

/** The customer's account through their link: what has been paid, what is still owed, and the documents issued. */
export const publicAccountKeys = {
  detail: (token: string) => ['public-quote', token, 'account'] as const,
};

const base = (token: string) => `/api/public/quotes/${encodeURIComponent(token)}`;

export const publicAccountQueryOptions = (token: string) =>
  queryOptions({
    queryKey: publicAccountKeys.detail(token),
    queryFn: ({ signal }) => api<PublicAccount>(`${base(token)}/account`, { signal }),
    staleTime: 0,
  });

export function usePublicAccount(token: string, enabled: boolean) {
  return useQuery({ ...publicAccountQueryOptions(token), enabled });
}

/** Opens the card payment page for the balance still owed: the answer is its address. */
export function useBalanceCheckout(token: string) {
  return useMutation({
    mutationFn: () => api<{ url: string }>(`${base(token)}/balance`, { method: 'POST', body: {} }),
  });
}

export const publicDocumentUrl = (token: string, id: number) => `${base(token)}/documents/${id}/pdf`;
