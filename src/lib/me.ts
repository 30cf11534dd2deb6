import { queryOptions, useQuery } from '@tanstack/react-query';
import type { User } from '@shared/schemas/auth';
import { api } from './api';
import { authKeys } from './query-keys';

/** The signed-in user, or null when signed out. */
export async function getMe(): Promise<User | null> {
  const { user } = await api<{ user: User | null }>('/api/auth/session');
  return user;
}

export const meQueryOptions = queryOptions({ queryKey: authKeys.me, queryFn: getMe, staleTime: 60_000 });

export function useMe() {
  return useQuery(meQueryOptions);
}
