import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Workshop } from '@shared/schemas/workshop';
import { api } from './api';
import { workshopKeys } from './query-keys';

export const workshopQueryOptions = queryOptions({
  queryKey: workshopKeys.all,
  queryFn: () => api<Workshop>('/api/workshop'),
  staleTime: 5 * 60_000,
});

export function useWorkshop() {
  return useQuery(workshopQueryOptions);
}
