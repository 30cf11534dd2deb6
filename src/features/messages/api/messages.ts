import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  CustomerMessagesPage,
  MessageKind,
  MessagePreview,
  MessageSettings,
  MessageSettingsInput,
  MessageTemplateDto,
  MessageTemplateUpdateInput,
} from '@shared/schemas/messages';
import { api, toQuery } from '@/lib/api';

export interface CustomerMessagesQuery {
  sort?: 'createdAt' | 'sentAt' | 'status' | 'subject';
  dir?: 'asc' | 'desc';
  page?: number;
  pageSize?: number;
}

export const messageKeys = {
  all: ['messages'] as const,
  templates: ['messages', 'templates'] as const,
  settings: ['messages', 'settings'] as const,
  customer: (customerId: number, query: CustomerMessagesQuery) => ['messages', 'customer', customerId, query] as const,
};

export const customerMessagesQueryOptions = (customerId: number, query: CustomerMessagesQuery) =>
  queryOptions({
    queryKey: messageKeys.customer(customerId, query),
    queryFn: ({ signal }) => api<CustomerMessagesPage>(`/api/messages/customers/${customerId}${toQuery({ ...query })}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useCustomerMessages(customerId: number, query: CustomerMessagesQuery) {
  return useQuery({ ...customerMessagesQueryOptions(customerId, query), enabled: customerId > 0 });
}

export function useMessageTemplates() {
  return useQuery({ queryKey: messageKeys.templates, queryFn: ({ signal }) => api<MessageTemplateDto[]>('/api/messages/templates', { signal }) });
}

export function useMessageSettings() {
  return useQuery({ queryKey: messageKeys.settings, queryFn: ({ signal }) => api<MessageSettings>('/api/messages/settings', { signal }) });
}

export function useUpdateTemplate(kind: MessageKind) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: MessageTemplateUpdateInput) => api<MessageTemplateDto>(`/api/messages/templates/${kind}`, { method: 'PUT', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: messageKeys.templates }),
  });
}

export function usePreviewTemplate(kind: MessageKind) {
  return useMutation({
    mutationFn: (input: MessageTemplateUpdateInput) => api<MessagePreview>(`/api/messages/templates/${kind}/preview`, { method: 'POST', body: input }),
  });
}

export function useUpdateMessageSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: MessageSettingsInput) => api<MessageSettings>('/api/messages/settings', { method: 'PUT', body: input }),
    onSuccess: (s) => qc.setQueryData(messageKeys.settings, s),
  });
}
