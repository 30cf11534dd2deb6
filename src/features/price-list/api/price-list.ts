import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  CatalogVersionChange,
  CreateMaterialInput,
  CreatePackInput,
  MaterialDto,
  MaterialHistory,
  NewPriceInput,
  UpdateMaterialInput,
  UpdatePackInput,
} from '@shared/schemas/price-list';
import { api } from '@/lib/api';
import { calcKeys, priceListKeys, setPackPriceMutationKey } from '@/lib/query-keys';

// The materials list (read by other features too) and the price list's query keys are in the kernel: src/lib/materials.ts
// and src/lib/query-keys.ts.

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
  return () => Promise.all([qc.invalidateQueries({ queryKey: priceListKeys.all }), qc.invalidateQueries({ queryKey: calcKeys.all })]);
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

export function useSetPackPrice() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationKey: setPackPriceMutationKey,
    mutationFn: ({ packId, ...input }: NewPriceInput & { packId: number }) =>
      api<{ material: MaterialDto; catalogVersion: CatalogVersionChange }>(`/api/price-list/packs/${packId}/prices`, { method: 'POST', body: input }),
    onSuccess: invalidate,
  });
}
