import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Workshop } from '@shared/schemas/workshop';
import type { LabourRateDto, LabourRateUpdateInput, WorkshopUpdateInput } from '@shared/schemas/workshop-admin';
import { calcKeys, workshopKeys } from '@/lib/query-keys';
import { api } from '@/lib/api';

export const settingsKeys = {
  all: ['settings'] as const,
  workshop: ['settings', 'workshop'] as const,
  rates: ['settings', 'labour-rates'] as const,
};

export const settingsQueryOptions = queryOptions({
  queryKey: settingsKeys.workshop,
  queryFn: ({ signal }) => api<Workshop>('/api/settings', { signal }),
  staleTime: 0,
});

export function useSettings() {
  return useQuery(settingsQueryOptions);
}

export function useSaveSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: WorkshopUpdateInput) => api<Workshop>('/api/settings', { method: 'PUT', body: input }),
    onSuccess: (saved) => {
      qc.setQueryData(settingsKeys.workshop, saved);
      return Promise.all([qc.invalidateQueries({ queryKey: workshopKeys.all }), qc.invalidateQueries({ queryKey: calcKeys.all })]);
    },
  });
}

export const labourRatesQueryOptions = queryOptions({
  queryKey: settingsKeys.rates,
  queryFn: ({ signal }) => api<LabourRateDto[]>('/api/labour-rates', { signal }),
});

export function useLabourRates() {
  return useQuery(labourRatesQueryOptions);
}

export function useUpdateRate() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: LabourRateUpdateInput & { id: number }) => api<LabourRateDto>(`/api/labour-rates/${id}`, { method: 'PATCH', body: input }),
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: settingsKeys.rates }), qc.invalidateQueries({ queryKey: calcKeys.all })]),
  });
}
