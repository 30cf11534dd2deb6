import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type { CopySystemInput, CreateSpeciesInput, FinishingSystemDto, SpeciesDto, SpeciesListQuery, SystemUpdateInput, UpdateSpeciesInput } from '@shared/schemas/finishing-admin';
import { api, toQuery } from '@/lib/api';

export const finishingKeys = {
  all: ['finishing'] as const,
  systems: (archived: string) => ['finishing', 'systems', archived] as const,
  system: (id: number) => ['finishing', 'system', id] as const,
  species: (query: Partial<SpeciesListQuery>) => ['finishing', 'species', query] as const,
};

export const systemsQueryOptions = (archived: 'active' | 'archived' | 'all') =>
  queryOptions({ queryKey: finishingKeys.systems(archived), queryFn: ({ signal }) => api<FinishingSystemDto[]>(`/api/finishing-systems${toQuery({ archived })}`, { signal }) });

export function useSystems(archived: 'active' | 'archived' | 'all') {
  return useQuery(systemsQueryOptions(archived));
}

export const systemQueryOptions = (id: number) =>
  queryOptions({ queryKey: finishingKeys.system(id), queryFn: ({ signal }) => api<FinishingSystemDto>(`/api/finishing-systems/${id}`, { signal }) });

export function useSystem(id: number) {
  return useQuery(systemQueryOptions(id));
}

function useInvalidate() {
  const qc = useQueryClient();
  return () => Promise.all([qc.invalidateQueries({ queryKey: finishingKeys.all }), qc.invalidateQueries({ queryKey: ['calc'] })]);
}

export function useSaveSystem() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, ...input }: SystemUpdateInput & { id: number }) => api<FinishingSystemDto>(`/api/finishing-systems/${id}`, { method: 'PUT', body: input }),
    onSuccess: invalidate,
  });
}

export function useCopySystem() {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (input: CopySystemInput) => api<FinishingSystemDto>('/api/finishing-systems', { method: 'POST', body: input }), onSuccess: invalidate });
}

export function useArchiveSystem() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, archived }: { id: number; archived: boolean }) => api<FinishingSystemDto>(`/api/finishing-systems/${id}`, { method: 'PATCH', body: { archived } }),
    onSuccess: invalidate,
  });
}

export const speciesQueryOptions = (query: Partial<SpeciesListQuery>) =>
  queryOptions({
    queryKey: finishingKeys.species(query),
    queryFn: ({ signal }) => api<Page<SpeciesDto>>(`/api/species${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useSpecies(query: Partial<SpeciesListQuery>) {
  return useQuery(speciesQueryOptions(query));
}

export function useCreateSpecies() {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (input: CreateSpeciesInput) => api<SpeciesDto>('/api/species', { method: 'POST', body: input }), onSuccess: invalidate });
}

export function useUpdateSpecies() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, ...input }: UpdateSpeciesInput & { id: number }) => api<SpeciesDto>(`/api/species/${id}`, { method: 'PATCH', body: input }),
    onSuccess: invalidate,
  });
}
