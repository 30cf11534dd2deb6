import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LoginInput, User } from '@shared/schemas/auth';
import { api, setCsrfToken } from '@/lib/api';
import { authKeys } from '@/lib/query-keys';

export async function signIn(input: LoginInput): Promise<User> {
  const { user, csrfToken } = await api<{ user: User; csrfToken: string }>('/api/auth/login', { method: 'POST', body: input });
  setCsrfToken(csrfToken);
  return user;
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: async () => {
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      await queryClient.invalidateQueries({ queryKey: authKeys.me });
    },
  });
}
