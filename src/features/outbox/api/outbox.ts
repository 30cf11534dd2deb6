import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type { OutboxDetail, OutboxSummary } from '@shared/schemas/quotes';
import { api, toQuery } from '@/lib/api';

export type OutboxStatus = OutboxSummary['status'];
export interface OutboxQuery {
  status?: OutboxStatus;
  page?: number;
  pageSize?: number;
}

export const outboxKeys = {
  all: ['outbox'] as const,
  list: (query: OutboxQuery) => ['outbox', 'list', query] as const,
  detail: (id: number) => ['outbox', 'detail', id] as const,
};

export const outboxQueryOptions = (query: OutboxQuery) =>
  queryOptions({
    queryKey: outboxKeys.list(query),
    queryFn: ({ signal }) => api<Page<OutboxSummary>>(`/api/outbox${toQuery({ ...query })}`, { signal }),
    placeholderData: keepPreviousData,
  });

export const outboxMessageQueryOptions = (id: number) =>
  queryOptions({
    queryKey: outboxKeys.detail(id),
    queryFn: ({ signal }) => api<OutboxDetail>(`/api/outbox/${id}`, { signal }),
  });

export function useOutbox(query: OutboxQuery, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...outboxQueryOptions(query), enabled });
}

export function useOutboxMessage(id: number | undefined) {
  return useQuery({ ...outboxMessageQueryOptions(id ?? 0), enabled: id !== undefined && id > 0 });
}

/** Tries a failed message again; a quote whose message goes out becomes sent, so quotes and estimates refresh. */
export function useRetryMessage() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<OutboxDetail>(`/api/outbox/${id}/retry`, { method: 'POST', body: {} }),
    onSuccess: async (message) => {
      qc.setQueryData(outboxKeys.detail(message.id), message);
      await Promise.all([
        qc.invalidateQueries({ queryKey: ['outbox', 'list'] }),
        qc.invalidateQueries({ queryKey: ['quotes'] }),
        qc.invalidateQueries({ queryKey: ['estimates'] }),
      ]);
    },
  });
}

export const attachmentUrl = (id: number) => `/api/outbox/${id}/attachment`;
