import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PolisherDto, PolisherInput, UpdatePolisherInput } from '@shared/schemas/planning';
import { api } from '@/lib/api';
import { planningKeys } from './planning-keys';

export const polishersQueryOptions = queryOptions({
  queryKey: planningKeys.polishers,
  queryFn: ({ signal }) => api<PolisherDto[]>('/api/polishers', { signal }),
});

export function usePolishers() {
  return useQuery(polishersQueryOptions);
}

export function useSavePolisher() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: (PolisherInput | UpdatePolisherInput) & { id?: number }) =>
      id ? api<PolisherDto>(`/api/polishers/${id}`, { method: 'PATCH', body: input }) : api<PolisherDto>('/api/polishers', { method: 'POST', body: input }),
    // Polishers' hours change the board's capacity lines.
    onSuccess: () => qc.invalidateQueries({ queryKey: planningKeys.all }),
  });
}
