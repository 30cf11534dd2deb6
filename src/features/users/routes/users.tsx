import { CircleCheck, CircleSlash, KeyRound, Plus } from 'lucide-react';
import { useState } from 'react';
import { ROLE_LABELS, ROLES, type Role, type User, type UserListQuery } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { SearchBox } from '@/components/search-box';
import { PagedTable } from '@/components/paged-table';
import { useMe } from '@/lib/me';
import { useTableState } from '@/lib/use-table-state';
import { useUpdateUser, useUsers } from '../api/users';
import { InvitationsTable } from '../components/invitations-table';
import { InviteForm } from '../components/invite-form';
import { AddUserDialog } from '../components/user-form-dialog';
import { ResetPasswordDialog } from '../components/reset-password-dialog';

const PAGE_SIZE = 25;

function StatusBadge({ active }: { active: boolean }) {
  return active ? (
    <span className="inline-flex items-center gap-1 rounded-full bg-moss-100 px-2 py-0.5 text-xs font-medium text-moss-700">
      <CircleCheck className="h-3.5 w-3.5" aria-hidden /> Active
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 rounded-full bg-walnut-100 px-2 py-0.5 text-xs font-medium text-walnut-600">
      <CircleSlash className="h-3.5 w-3.5" aria-hidden /> Deactivated
    </span>
  );
}

export function UsersPage() {
  const me = useMe();
  const table = useTableState({ sort: 'name', filters: ['role'] });
  const [adding, setAdding] = useState(false);
  const [resetting, setResetting] = useState<User | null>(null);
  const update = useUpdateUser();
  const query: Partial<UserListQuery> = {
    q: table.state.q || undefined,
    role: (table.state.filters.role as Role) || undefined,
    sort: table.state.sort as UserListQuery['sort'],
    dir: table.state.dir,
    page: table.state.page,
    pageSize: PAGE_SIZE,
  };
  const users = useUsers(query);

  const columns: Column<User>[] = [
    { key: 'name', header: 'Name', sortKey: 'name', render: (u) => <span className="font-medium text-walnut-900">{u.name}</span> },
    { key: 'email', header: 'E-mail', sortKey: 'email', render: (u) => u.email },
    {
      key: 'role',
      header: 'Role',
      sortKey: 'role',
      render: (u) => (
        <select
          aria-label={`Role of ${u.name}`}
          className="rounded border border-walnut-200 bg-white px-2 py-1 text-sm"
          value={u.role}
          disabled={update.isPending}
          onChange={(e) => update.mutate({ id: u.id, role: e.target.value as Role })}
        >
          {ROLES.map((r) => (
            <option key={r} value={r}>{ROLE_LABELS[r]}</option>
          ))}
        </select>
      ),
    },
    { key: 'status', header: 'Status', render: (u) => <StatusBadge active={u.active} /> },
    {
      key: 'lastLoginAt',
      header: 'Last sign-in',
      sortKey: 'lastLoginAt',
      render: (u) => (u.lastLoginAt ? new Date(u.lastLoginAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : 'never'),
    },
    {
      key: 'actions',
      header: 'Actions',
      render: (u) => (
        <div className="flex gap-1.5">
          <Button size="sm" variant="ghost" onClick={() => setResetting(u)} aria-label={`Reset password for ${u.name}`}>
            <KeyRound className="h-3.5 w-3.5" aria-hidden /> Password
          </Button>
          {u.id !== me.data?.id &&
            (u.active ? (
              <Button
                size="sm"
                variant="ghost"
                onClick={() => {
                  if (window.confirm(`Deactivate ${u.name}? They are signed out at once and cannot sign in again until reactivated.`)) {
                    update.mutate({ id: u.id, active: false });
                  }
                }}
              >
                Deactivate
              </Button>
            ) : (
              <Button size="sm" variant="ghost" onClick={() => update.mutate({ id: u.id, active: true })}>
                Reactivate
              </Button>
            ))}
        </div>
      ),
    },
  ];

  return (
    <>
      <PageHeader
        title="Users"
        description="Who may sign in to the workshop's Shellwright, and in which role. Invite people by e-mail: they choose their own name and password."
        actions={
          <Button variant="secondary" onClick={() => setAdding(true)}>
            <Plus className="h-4 w-4" aria-hidden /> Add user
          </Button>
        }
      />
      <div className="mb-6 space-y-4">
        <Card title="Invite someone">
          <InviteForm />
        </Card>
        <section aria-labelledby="invitations-heading" className="space-y-2">
          <h2 id="invitations-heading" className="text-lg font-semibold text-walnut-800">Invitations</h2>
          <InvitationsTable />
        </section>
      </div>
      <h2 className="mb-2 font-serif text-lg font-semibold text-walnut-900">People with an account</h2>
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <SearchBox value={table.state.q} onSearch={table.setSearch} label="Search users by name or e-mail" placeholder="Search name or e-mail" className="w-72" />
        <select
          aria-label="Filter by role"
          value={table.state.filters.role}
          onChange={(e) => table.setFilter('role', e.target.value)}
          className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm"
        >
          <option value="">All roles</option>
          {ROLES.map((r) => (
            <option key={r} value={r}>{ROLE_LABELS[r]}</option>
          ))}
        </select>
      </div>
      {update.isError && (
        <div className="mb-4">
          <Alert tone="error" title="Change not saved">{update.error.message}</Alert>
        </div>
      )}
      <PagedTable
        caption="Users"
        columns={columns}
        rowKey={(u) => u.id}
        query={users}
        table={table}
        pageSize={PAGE_SIZE}
        empty="No user matches."
        errorTitle="Users could not be loaded"
      />
      <AddUserDialog open={adding} onClose={() => setAdding(false)} />
      <ResetPasswordDialog user={resetting} onClose={() => setResetting(null)} />
    </>
  );
}
