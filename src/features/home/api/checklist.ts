import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Checklist } from '@shared/schemas/signup';
import { api } from '@/lib/api';

export const checklistKeys = { all: ['workshop-checklist'] as const };

/** The owner's first-run checklist, read afresh each time the overview opens (it follows the price list, rates…). */
export const checklistQueryOptions = queryOptions({
  queryKey: checklistKeys.all,
  queryFn: () => api<Checklist>('/api/workshop/checklist'),
  staleTime: 0,
  refetchOnMount: 'always',
});

export function useChecklist(enabled: boolean) {
  return useQuery({ ...checklistQueryOptions, enabled });
}

export function useSetChecklistDismissed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (dismissed: boolean) => api<Checklist>('/api/workshop/checklist/dismissed', { method: 'PUT', body: { dismissed } }),
    onSuccess: (checklist) => queryClient.setQueryData(checklistKeys.all, checklist),
  });
}
