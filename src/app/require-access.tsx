import type { ReactNode } from 'react';
import { allows, type Access } from '@shared/roles';
import { Alert } from '@/components/alert';
import { useMe } from '@/lib/me';

/** Hides a page from roles that may not use it (the server refuses them too). */
export function RequireAccess({ access, children }: { access: Access; children: ReactNode }) {
  const me = useMe();
  if (!me.data) return null;
  if (!allows(access, me.data.role)) {
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
