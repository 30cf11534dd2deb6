import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { PlanningBoard, ReadyToBook } from '@shared/schemas/planning';
import { api, toQuery } from '@/lib/api';
import { planningKeys } from './planning-keys';

export const boardQueryOptions = (from: string | undefined, weeks: number) =>
  queryOptions({
    queryKey: planningKeys.board(from, weeks),
    queryFn: ({ signal }) => api<PlanningBoard>(`/api/planning/board${toQuery({ from, weeks })}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useBoard(from: string | undefined, weeks: number) {
  return useQuery(boardQueryOptions(from, weeks));
}

export const readyQueryOptions = queryOptions({
  queryKey: planningKeys.ready,
  queryFn: ({ signal }) => api<ReadyToBook>('/api/planning/ready', { signal }),
});

export function useReadyToBook() {
  return useQuery(readyQueryOptions);
}
