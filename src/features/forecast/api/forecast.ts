import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { MaterialForecast, StockRow } from '@shared/schemas/planning';
import { api } from '@/lib/api';

export const forecastKeys = {
  all: ['forecast'] as const,
  forecast: (weeks: number) => ['forecast', 'weeks', weeks] as const,
  stock: ['forecast', 'stock'] as const,
};

export const forecastQueryOptions = (weeks: number) =>
  queryOptions({
    queryKey: forecastKeys.forecast(weeks),
    queryFn: ({ signal }) => api<MaterialForecast>(`/api/planning/forecast?weeks=${weeks}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useForecast(weeks: number) {
  return useQuery(forecastQueryOptions(weeks));
}

export const stockQueryOptions = queryOptions({
  queryKey: forecastKeys.stock,
  queryFn: ({ signal }) => api<StockRow[]>('/api/planning/stock', { signal }),
});

export function useStock() {
  return useQuery(stockQueryOptions);
}

export function useSetStock() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ materialId, quantity }: { materialId: number; quantity: number }) =>
      api<StockRow>(`/api/planning/stock/${materialId}`, { method: 'PUT', body: { quantity } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: forecastKeys.all }),
  });
}
