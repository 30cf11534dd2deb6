import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type { CreateInvitationInput, Invitation, InvitationListQuery } from '@shared/schemas/invitations';
import { api, toQuery } from '@/lib/api';

export const invitationKeys = {
  all: ['invitations'] as const,
  list: (query: Partial<InvitationListQuery>) => ['invitations', 'list', query] as const,
};

export const invitationsQueryOptions = (query: Partial<InvitationListQuery>) =>
  queryOptions({
    queryKey: invitationKeys.list(query),
    queryFn: ({ signal }) => api<Page<Invitation>>(`/api/invitations${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useInvitations(query: Partial<InvitationListQuery>) {
  return useQuery(invitationsQueryOptions(query));
}

export function useCreateInvitation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateInvitationInput) => api<Invitation>('/api/invitations', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: invitationKeys.all }),
  });
}

/** Resend (a new link and a new week) or withdraw an invitation. */
export function useInvitationAction() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, action }: { id: number; action: 'resend' | 'revoke' }) => api<Invitation>(`/api/invitations/${id}/${action}`, { method: 'POST', body: {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: invitationKeys.all }),
  });
}
