import type { z } from 'zod';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type { Customer, CustomerInput, CustomerListQuerySchema } from '@shared/schemas/customers';
import { api, toQuery } from '@/lib/api';

/** The list's search, filters, sort and page (every field optional; the server fills defaults). */
export type CustomerListQueryInput = Partial<z.output<typeof CustomerListQuerySchema>>;

export const customerKeys = {
  all: ['customers'] as const,
  lists: () => ['customers', 'list'] as const,
  list: (query: CustomerListQueryInput) => ['customers', 'list', query] as const,
  detail: (id: number) => ['customers', 'detail', id] as const,
};

export const customersQueryOptions = (query: CustomerListQueryInput) =>
  queryOptions({
    queryKey: customerKeys.list(query),
    queryFn: ({ signal }) => api<Page<Customer>>(`/api/customers${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export const customerQueryOptions = (id: number) =>
  queryOptions({
    queryKey: customerKeys.detail(id),
    queryFn: ({ signal }) => api<Customer>(`/api/customers/${id}`, { signal }),
  });

export function useCustomers(query: CustomerListQueryInput, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...customersQueryOptions(query), enabled });
}

export function useCustomer(id: number | undefined) {
  return useQuery({ ...customerQueryOptions(id ?? 0), enabled: id !== undefined && id > 0 });
}

export function useCreateCustomer() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CustomerInput) => api<Customer>('/api/customers', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: customerKeys.lists() }),
  });
}

export function useUpdateCustomer() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: Partial<CustomerInput> & { id: number }) => api<Customer>(`/api/customers/${id}`, { method: 'PATCH', body: input }),
    onSuccess: (customer) => {
      qc.setQueryData(customerKeys.detail(customer.id), customer);
      return qc.invalidateQueries({ queryKey: customerKeys.lists() });
    },
  });
}

export function useArchiveCustomer() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, archived }: { id: number; archived: boolean }) => api<Customer>(`/api/customers/${id}/archive`, { method: 'POST', body: { archived } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: customerKeys.all }),
  });
}
