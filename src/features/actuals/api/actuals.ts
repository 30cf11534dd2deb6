import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ActualsReport, ApplyActualsInput, ApplyActualsResult } from '@shared/schemas/planning';
import { api } from '@/lib/api';

export const actualsKeys = { all: ['actuals'] as const };

export const actualsQueryOptions = queryOptions({
  queryKey: actualsKeys.all,
  queryFn: ({ signal }) => api<ActualsReport>('/api/planning/actuals', { signal }),
});

export function useActuals() {
  return useQuery(actualsQueryOptions);
}

/** Writes the chosen corrections into the finishing systems; the estimator prices with them from then on. */
export function useApplyActuals() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: ApplyActualsInput) => api<ApplyActualsResult>('/api/planning/actuals/apply', { method: 'POST', body: input }),
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: actualsKeys.all }), qc.invalidateQueries({ queryKey: ['finishing'] }), qc.invalidateQueries({ queryKey: ['calc'] })]),
  });
}
