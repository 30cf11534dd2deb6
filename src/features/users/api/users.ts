import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateUserInput, Page, UpdateUserInput, User, UserListQuery } from '@shared/schemas/auth';
import { api, toQuery } from '@/lib/api';

export const userKeys = {
  all: ['users'] as const,
  list: (query: Partial<UserListQuery>) => ['users', 'list', query] as const,
};

export const usersQueryOptions = (query: Partial<UserListQuery>) =>
  queryOptions({
    queryKey: userKeys.list(query),
    queryFn: ({ signal }) => api<Page<User>>(`/api/users${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export function useUsers(query: Partial<UserListQuery>) {
  return useQuery(usersQueryOptions(query));
}

export function useCreateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateUserInput) => api<User>('/api/users', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: UpdateUserInput & { id: number }) => api<User>(`/api/users/${id}`, { method: 'PATCH', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}

export function useResetPassword() {
  return useMutation({
    mutationFn: ({ id, password }: { id: number; password: string }) => api<void>(`/api/users/${id}/password`, { method: 'POST', body: { password } }),
  });
}
