import type { z } from 'zod';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type {
  CreateEstimateInput, CreateRevisionInput, EstimateDetail, EstimateListQuerySchema, EstimateSummary, Revision,
} from '@shared/schemas/estimates';
import { api, toQuery } from '@/lib/api';

/** The list's search, filters, sort and page (every field optional; the server fills defaults). */
export type EstimateListQueryInput = Partial<z.output<typeof EstimateListQuerySchema>>;

export const estimateKeys = {
  all: ['estimates'] as const,
  lists: () => ['estimates', 'list'] as const,
  list: (query: EstimateListQueryInput) => ['estimates', 'list', query] as const,
  detail: (id: number) => ['estimates', 'detail', id] as const,
  revision: (id: number, number: number) => ['estimates', 'detail', id, 'revision', number] as const,
};

export const estimatesQueryOptions = (query: EstimateListQueryInput) =>
  queryOptions({
    queryKey: estimateKeys.list(query),
    queryFn: ({ signal }) => api<Page<EstimateSummary>>(`/api/estimates${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export const estimateQueryOptions = (id: number) =>
  queryOptions({
    queryKey: estimateKeys.detail(id),
    queryFn: ({ signal }) => api<EstimateDetail>(`/api/estimates/${id}`, { signal }),
  });

export const revisionQueryOptions = (id: number, number: number) =>
  queryOptions({
    queryKey: estimateKeys.revision(id, number),
    queryFn: ({ signal }) => api<Revision>(`/api/estimates/${id}/revisions/${number}`, { signal }),
    // A revision never changes once saved.
    staleTime: Infinity,
  });

export function useEstimates(query: EstimateListQueryInput, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...estimatesQueryOptions(query), enabled });
}

export function useEstimate(id: number) {
  return useQuery({ ...estimateQueryOptions(id), enabled: id > 0 });
}

export function useRevision(id: number, number: number | undefined) {
  return useQuery({ ...revisionQueryOptions(id, number ?? 0), enabled: id > 0 && number !== undefined && number > 0 });
}

/** Keeps the detail the server answered with, and refreshes the lists it appears in. */
function useSettle() {
  const qc = useQueryClient();
  return async (detail: EstimateDetail) => {
    qc.setQueryData(estimateKeys.detail(detail.id), detail);
    await qc.invalidateQueries({ queryKey: estimateKeys.lists() });
    await qc.invalidateQueries({ queryKey: ['customers'] });
  };
}

export function useCreateEstimate() {
  const settle = useSettle();
  return useMutation({
    mutationFn: (input: CreateEstimateInput) => api<EstimateDetail>('/api/estimates', { method: 'POST', body: input }),
    onSuccess: settle,
  });
}

export function useCreateRevision(id: number) {
  const settle = useSettle();
  return useMutation({
    mutationFn: (input: CreateRevisionInput) => api<EstimateDetail>(`/api/estimates/${id}/revisions`, { method: 'POST', body: input }),
    onSuccess: settle,
  });
}

export function useSetEstimateState(id: number) {
  const settle = useSettle();
  return useMutation({
    mutationFn: (state: 'draft' | 'priced') => api<EstimateDetail>(`/api/estimates/${id}/state`, { method: 'POST', body: { state } }),
    onSuccess: settle,
  });
}

export function useArchiveEstimate() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, archived }: { id: number; archived: boolean }) =>
      api<EstimateDetail | EstimateSummary>(`/api/estimates/${id}/archive`, { method: 'POST', body: { archived } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: estimateKeys.all }),
  });
}

export function useDuplicateEstimate() {
  const settle = useSettle();
  return useMutation({
    mutationFn: ({ id, pieceId }: { id: number; pieceId?: number }) =>
      api<EstimateDetail>(`/api/estimates/${id}/duplicate`, { method: 'POST', body: pieceId === undefined ? {} : { pieceId } }),
    onSuccess: settle,
  });
}
