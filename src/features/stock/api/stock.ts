import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PurchaseOrderDto, PurchaseOrderPage, ReceiveOrderInput, SendOrderInput, StockCountInput, StockMovementDto, StockMovementPage, StockOverview } from '@shared/schemas/stock';
import { api, toQuery } from '@/lib/api';

export const stockKeys = {
  all: ['stock'] as const,
  overview: (weeks: number) => ['stock', 'overview', weeks] as const,
  movements: (page: number, materialId?: number) => ['stock', 'movements', page, materialId ?? null] as const,
  orders: (state: string, page: number) => ['stock', 'orders', state, page] as const,
};

export const stockOverviewOptions = (weeks: number) =>
  queryOptions({ queryKey: stockKeys.overview(weeks), queryFn: ({ signal }) => api<StockOverview>(`/api/stock${toQuery({ weeks })}`, { signal }), placeholderData: keepPreviousData });
export const movementsOptions = (page: number, pageSize: number, materialId?: number) =>
  queryOptions({ queryKey: stockKeys.movements(page, materialId), queryFn: ({ signal }) => api<StockMovementPage>(`/api/stock/movements${toQuery({ page, pageSize, materialId })}`, { signal }), placeholderData: keepPreviousData });
export const ordersOptions = (state: string, page: number, pageSize: number) =>
  queryOptions({ queryKey: stockKeys.orders(state, page), queryFn: ({ signal }) => api<PurchaseOrderPage>(`/api/purchase-orders${toQuery({ state, page, pageSize })}`, { signal }), placeholderData: keepPreviousData });

export const useStockOverview = (weeks: number) => useQuery(stockOverviewOptions(weeks));
export const useMovements = (page: number, pageSize: number, materialId?: number) => useQuery(movementsOptions(page, pageSize, materialId));
export const useOrders = (state: string, page: number, pageSize: number) => useQuery(ordersOptions(state, page, pageSize));

/** Every stock write changes levels, the ledger and orders: they are read again together (and the forecast too). */
function useStockMutation<I, O>(fn: (input: I) => Promise<O>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: async () => {
      await Promise.all([qc.invalidateQueries({ queryKey: stockKeys.all }), qc.invalidateQueries({ queryKey: ['forecast'] })]);
    },
  });
}

export const useRecordCount = () => useStockMutation((input: StockCountInput) => api<StockMovementDto>('/api/stock/counts', { method: 'POST', body: input }));
export const useOrdersFromForecast = () => useStockMutation((weeks: number) => api<PurchaseOrderDto[]>('/api/purchase-orders/from-forecast', { method: 'POST', body: { weeks } }));
export const useSendOrder = () =>
  useStockMutation(({ id, ...body }: { id: number } & Omit<SendOrderInput, 'message'> & { message?: string }) => api<PurchaseOrderDto>(`/api/purchase-orders/${id}/send`, { method: 'POST', body }));
export const useReceiveOrder = () =>
  useStockMutation(({ id, ...body }: { id: number } & Omit<ReceiveOrderInput, 'recordPrices'> & { recordPrices: boolean }) => api<PurchaseOrderDto>(`/api/purchase-orders/${id}/receive`, { method: 'POST', body }));
export const useCancelOrder = () => useStockMutation((id: number) => api<PurchaseOrderDto>(`/api/purchase-orders/${id}/cancel`, { method: 'POST' }));
