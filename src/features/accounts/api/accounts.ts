import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AccountDto, AccountSettings, AgeingBucket, CreditNoteInput, OwedPage, RecordPayment } from '@shared/schemas/accounts';
import { api, toQuery } from '@/lib/api';

export interface OwedQuery {
  sort?: 'age' | 'balance' | 'customer' | 'invoice';
  dir?: 'asc' | 'desc';
  bucket?: AgeingBucket;
  page?: number;
  pageSize?: number;
}

export const accountKeys = {
  all: ['accounts'] as const,
  account: (quoteId: number) => ['accounts', 'quote', quoteId] as const,
  owed: (query: OwedQuery) => ['accounts', 'owed', query] as const,
  settings: ['accounts', 'settings'] as const,
};

export const accountQueryOptions = (quoteId: number) =>
  queryOptions({
    queryKey: accountKeys.account(quoteId),
    queryFn: ({ signal }) => api<AccountDto>(`/api/accounts/quotes/${quoteId}`, { signal }),
  });

export const owedQueryOptions = (query: OwedQuery) =>
  queryOptions({
    queryKey: accountKeys.owed(query),
    queryFn: ({ signal }) => api<OwedPage>(`/api/accounts/owed${toQuery({ ...query })}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useAccount(quoteId: number) {
  return useQuery({ ...accountQueryOptions(quoteId), enabled: quoteId > 0 });
}

export function useOwed(query: OwedQuery) {
  return useQuery(owedQueryOptions(query));
}

export function useAccountSettings() {
  return useQuery({ queryKey: accountKeys.settings, queryFn: ({ signal }) => api<AccountSettings & { canChange: boolean }>('/api/accounts/settings', { signal }) });
}

/** Every change to an account answers with the account; the owed list and the outbox change with it. */
function useAccountChange<I>(quoteId: number, send: (input: I) => Promise<AccountDto>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: async (account) => {
      qc.setQueryData(accountKeys.account(quoteId), account);
      await Promise.all([qc.invalidateQueries({ queryKey: ['accounts', 'owed'] }), qc.invalidateQueries({ queryKey: ['outbox'] })]);
    },
  });
}

export function useRecordPayment(quoteId: number) {
  return useAccountChange(quoteId, (input: RecordPayment) => api<AccountDto>(`/api/accounts/quotes/${quoteId}/payments`, { method: 'POST', body: input }));
}

export function useIssueInvoice(quoteId: number) {
  return useAccountChange(quoteId, (input: { note: string }) => api<AccountDto>(`/api/accounts/quotes/${quoteId}/invoice`, { method: 'POST', body: input }));
}

export function useIssueCreditNote(quoteId: number) {
  return useAccountChange(quoteId, ({ invoiceId, ...input }: CreditNoteInput & { invoiceId: number }) =>
    api<AccountDto>(`/api/accounts/documents/${invoiceId}/credit-notes`, { method: 'POST', body: input }),
  );
}

export function useUpdateAccountSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: AccountSettings) => api<AccountSettings>('/api/accounts/settings', { method: 'PUT', body: input }),
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: ['accounts'] });
    },
  });
}

/** "Send a reminder" from the owed list: the balance-due message queued to the customer (once a day per invoice). */
export function useSendReminder(quoteId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ outboxId: number; status: string; to: string; amount: string; currency: string }>(`/api/accounts/quotes/${quoteId}/reminder`, { method: 'POST', body: {} }),
    onSuccess: async () => {
      await Promise.all([qc.invalidateQueries({ queryKey: ['outbox'] }), qc.invalidateQueries({ queryKey: ['messages'] })]);
    },
  });
}

export const documentPdfUrl = (id: number) => `/api/accounts/documents/${id}/pdf`;
