import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type { MaterialDto, MaterialListQuery } from '@shared/schemas/price-list';
import { api, toQuery } from './api';
import { priceListKeys } from './query-keys';

/** A page of the price list's materials: read by the price list, the finishing systems and the settings. */
export const materialsQueryOptions = (query: Partial<MaterialListQuery>) =>
  queryOptions({
    queryKey: priceListKeys.list(query),
    queryFn: ({ signal }) => api<Page<MaterialDto>>(`/api/price-list/materials${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useMaterials(query: Partial<MaterialListQuery>) {
  return useQuery(materialsQueryOptions(query));
}
