import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { User } from '@shared/schemas/auth';
import type { AcceptInvitation, PublicInvitation } from '@shared/schemas/invitations';
import { api, setCsrfToken } from '@/lib/api';
import { authKeys } from '@/lib/query-keys';

/** The invitation behind an e-mailed link, read and accepted without an account. */
export const inviteKeys = { one: (token: string) => ['public-invitation', token] as const };

const base = (token: string) => `/api/public/invitations/${encodeURIComponent(token)}`;

export function usePublicInvitation(token: string) {
  return useQuery({ queryKey: inviteKeys.one(token), queryFn: ({ signal }) => api<PublicInvitation>(base(token), { signal }), staleTime: 0, retry: false });
}

/** Accepts: the account is made and signed in (the session and a fresh CSRF token come back, as from sign-in). */
export function useAcceptInvitation(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: AcceptInvitation) => {
      const { user, csrfToken } = await api<{ user: User; csrfToken: string }>(`${base(token)}/accept`, { method: 'POST', body: input });
      setCsrfToken(csrfToken);
      return user;
    },
    onSuccess: async () => {
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      await qc.invalidateQueries({ queryKey: authKeys.me });
    },
  });
}
