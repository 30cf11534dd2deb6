import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Catalog } from '@shared/schemas/catalog';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { api } from './api';
import { calcKeys } from './query-keys';

/** What the client needs to run the estimator itself: the price list, the settings, and what the owner should fix. */
export interface CalcCatalog {
  catalog: Catalog;
  settings: WorkshopSettings;
  warnings: { code: string; text: string }[];
}

export const calcCatalogQueryOptions = queryOptions({
  queryKey: calcKeys.catalog,
  queryFn: ({ signal }) => api<CalcCatalog>('/api/calc/catalog', { signal }),
  staleTime: 5 * 60_000,
});

export function useCalcCatalog() {
  return useQuery(calcCatalogQueryOptions);
}
