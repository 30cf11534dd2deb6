import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Workshop } from '@shared/schemas/workshop';
import { api } from '@/lib/api';

export const workshopKeys = { all: ['workshop'] as const };

export const workshopQueryOptions = queryOptions({
  queryKey: workshopKeys.all,
  queryFn: () => api<Workshop>('/api/workshop'),
  staleTime: 5 * 60_000,
});

export function useWorkshop() {
  return useQuery(workshopQueryOptions);
}
