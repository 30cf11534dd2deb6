import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type {
  CatalogVersionChange,
  CreateMaterialInput,
  CreatePackInput,
  MaterialDto,
  MaterialHistory,
  MaterialListQuery,
  NewPriceInput,
  UpdateMaterialInput,
  UpdatePackInput,
} from '@shared/schemas/price-list';
import { api, toQuery } from '@/lib/api';

export const priceListKeys = {
  all: ['price-list'] as const,
  list: (query: Partial<MaterialListQuery>) => ['price-list', 'list', query] as const,
  history: (id: number) => ['price-list', 'history', id] as const,
};

export const materialsQueryOptions = (query: Partial<MaterialListQuery>) =>
  queryOptions({
    queryKey: priceListKeys.list(query),
    queryFn: ({ signal }) => api<Page<MaterialDto>>(`/api/price-list/materials${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useMaterials(query: Partial<MaterialListQuery>) {
  return useQuery(materialsQueryOptions(query));
}

export const materialHistoryQueryOptions = (id: number) =>
  queryOptions({
    queryKey: priceListKeys.history(id),
    queryFn: ({ signal }) => api<MaterialHistory>(`/api/price-list/materials/${id}/history`, { signal }),
  });

export function useMaterialHistory(id: number) {
  return useQuery(materialHistoryQueryOptions(id));
}

/** Every price-list mutation invalidates the whole list (and the catalog the estimator reads). */
function useInvalidate() {
  const qc = useQueryClient();
  return () => Promise.all([qc.invalidateQueries({ queryKey: priceListKeys.all }), qc.invalidateQueries({ queryKey: ['calc'] })]);
}

export function useCreateMaterial() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: (input: CreateMaterialInput) => api<MaterialDto>('/api/price-list/materials', { method: 'POST', body: input }),
    onSuccess: invalidate,
  });
}

export function useUpdateMaterial() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, ...input }: UpdateMaterialInput & { id: number }) => api<MaterialDto>(`/api/price-list/materials/${id}`, { method: 'PATCH', body: input }),
    onSuccess: invalidate,
  });
}

export function useAddPack() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ materialId, ...input }: CreatePackInput & { materialId: number }) =>
      api<MaterialDto>(`/api/price-list/materials/${materialId}/packs`, { method: 'POST', body: input }),
    onSuccess: invalidate,
  });
}

export function useUpdatePack() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, ...input }: UpdatePackInput & { id: number }) => api<MaterialDto>(`/api/price-list/packs/${id}`, { method: 'PATCH', body: input }),
    onSuccess: invalidate,
  });
}

/** Names the new-price mutation, so a page can tell that a price was just changed (the repricing notice). */
export const setPackPriceMutationKey = ['price-list', 'set-price'] as const;

export function useSetPackPrice() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationKey: setPackPriceMutationKey,
    mutationFn: ({ packId, ...input }: NewPriceInput & { packId: number }) =>
      api<{ material: MaterialDto; catalogVersion: CatalogVersionChange }>(`/api/price-list/packs/${packId}/prices`, { method: 'POST', body: input }),
    onSuccess: invalidate,
  });
}
