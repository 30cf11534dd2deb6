import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditEntryDto, AuditFilters, AuditQuery } from '@shared/schemas/audit';
import type { Page } from '@shared/schemas/auth';
import { api, toQuery } from '@/lib/api';

export const auditKeys = {
  all: ['audit'] as const,
  list: (query: Partial<AuditQuery>) => ['audit', 'list', query] as const,
  filters: ['audit', 'filters'] as const,
};

export const auditQueryOptions = (query: Partial<AuditQuery>) =>
  queryOptions({ queryKey: auditKeys.list(query), queryFn: ({ signal }) => api<Page<AuditEntryDto>>(`/api/audit${toQuery(query)}`, { signal }), placeholderData: keepPreviousData, staleTime: 0 });

export function useAudit(query: Partial<AuditQuery>) {
  return useQuery(auditQueryOptions(query));
}

export function useAuditFilters() {
  return useQuery(queryOptions({ queryKey: auditKeys.filters, queryFn: ({ signal }) => api<AuditFilters>('/api/audit/filters', { signal }), staleTime: 0 }));
}
