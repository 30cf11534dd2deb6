import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Workshop } from '@shared/schemas/workshop';
import { setWorkshopTimeZone } from '@shared/time';
import { api } from './api';
import { workshopKeys } from './query-keys';

export const workshopQueryOptions = queryOptions({
  queryKey: workshopKeys.all,
  queryFn: async () => {
    const workshop = await api<Workshop>('/api/workshop');
    // The browser's "today" is the workshop's (shared/time.ts), whatever the computer's own zone.
    setWorkshopTimeZone(workshop.settings.timeZone);
    return workshop;
  },
  staleTime: 5 * 60_000,
});

export function useWorkshop() {
  return useQuery(workshopQueryOptions);
}
