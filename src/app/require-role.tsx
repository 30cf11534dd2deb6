import type { ReactNode } from 'react';
import type { Role } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { useMe } from '@/features/auth/api/get-me';

/** Hides a page from roles that may not use it (the server refuses them too). */
export function RequireRole({ roles, children }: { roles: readonly Role[]; children: ReactNode }) {
  const me = useMe();
  if (!me.data) return null;
  if (!roles.includes(me.data.role)) {
    return (
      <div className="max-w-xl">
        <Alert tone="warning" title="Not available to your role">
          Ask the workshop owner if you need this page.
        </Alert>
      </div>
    );
  }
  return <>{children}</>;
}
