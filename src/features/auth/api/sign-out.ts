import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from '@/lib/api';
import { authKeys } from '@/lib/query-keys';

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>('/api/auth/logout', { method: 'POST' }),
    onSettled: () => {
      setCsrfToken(null);
      queryClient.clear();
      queryClient.setQueryData(authKeys.me, null);
    },
  });
}
