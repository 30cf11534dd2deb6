import { RotateCw, Undo2 } from 'lucide-react';
import { useState } from 'react';
import { ROLE_LABELS } from '@shared/schemas/auth';
import { INVITATION_STATE_LABELS, INVITATION_STATES, type Invitation, type InvitationListQuery, type InvitationState } from '@shared/schemas/invitations';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { DataTable, type Column } from '@/components/data-table';
import { useInvitationAction, useInvitations } from '../api/invitations';

const PAGE_SIZE = 10;

const STATE_STYLE: Record<InvitationState, string> = {
  pending: 'bg-amber-50 text-amber-800',
  expired: 'bg-walnut-100 text-walnut-600',
  accepted: 'bg-moss-100 text-moss-700',
  revoked: 'bg-walnut-100 text-walnut-600',
};

const when = (iso: string) => new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });

function StateBadge({ invitation }: { invitation: Invitation }) {
  return (
    <span className={`inline-flex whitespace-nowrap rounded-full px-2 py-0.5 text-xs font-medium ${STATE_STYLE[invitation.state]}`}>{INVITATION_STATE_LABELS[invitation.state]}</span>
  );
}

/** The workshop's invitations: waiting ones first by default, with Resend and Withdraw while they are open. */
export function InvitationsTable() {
  const [state, setState] = useState<InvitationState | ''>('pending');
  const [sort, setSort] = useState<InvitationListQuery['sort']>('createdAt');
  const [dir, setDir] = useState<'asc' | 'desc'>('desc');
  const [page, setPage] = useState(1);
  const invitations = useInvitations({ state: state || undefined, sort, dir, page, pageSize: PAGE_SIZE });
  const action = useInvitationAction();

  const columns: Column<Invitation>[] = [
    { key: 'email', header: 'E-mail', sortKey: 'email', render: (i) => <span className="font-medium text-walnut-900">{i.email}</span> },
    { key: 'role', header: 'Role', sortKey: 'role', render: (i) => ROLE_LABELS[i.role] },
    { key: 'state', header: 'State', sortKey: 'state', render: (i) => <StateBadge invitation={i} /> },
    {
      key: 'expiresAt',
      header: 'Link works until',
      sortKey: 'expiresAt',
      render: (i) => (i.state === 'pending' || i.state === 'expired' ? when(i.expiresAt) : '—'),
    },
    {
      key: 'sent',
      header: 'Sent',
      render: (i) => (
        <span>
          {i.sendCount === 1 ? 'once' : `${i.sendCount} times`}
          {i.lastSentAt ? `, last ${when(i.lastSentAt)}` : ''}
          {i.delivered === false && <span className="block text-xs text-brick-700">The last e-mail did not go: resend it.</span>}
        </span>
      ),
    },
    { key: 'invitedBy', header: 'Invited by', render: (i) => i.invitedBy ?? '—' },
    {
      key: 'actions',
      header: 'Actions',
      render: (i) =>
        i.state === 'pending' || i.state === 'expired' ? (
          <div className="flex gap-1.5">
            <Button
              size="sm"
              variant="ghost"
              aria-label={`Resend the invitation to ${i.email}`}
              busy={action.isPending && action.variables?.id === i.id && action.variables.action === 'resend'}
              disabled={action.isPending}
              onClick={() => action.mutate({ id: i.id, action: 'resend' })}
            >
              <RotateCw className="h-3.5 w-3.5" aria-hidden /> Resend
            </Button>
            <Button
              size="sm"
              variant="ghost"
              aria-label={`Withdraw the invitation to ${i.email}`}
              disabled={action.isPending}
              onClick={() => {
                if (window.confirm(`Withdraw the invitation to ${i.email}? Its link stops working at once.`)) action.mutate({ id: i.id, action: 'revoke' });
              }}
            >
              <Undo2 className="h-3.5 w-3.5" aria-hidden /> Withdraw
            </Button>
          </div>
        ) : null,
    },
  ];

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        <label className="text-sm text-walnut-800">
          <span className="sr-only">Show invitations</span>
          <select
            aria-label="Show invitations"
            value={state}
            onChange={(e) => {
              setState(e.target.value as InvitationState | '');
              setPage(1);
            }}
            className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm"
          >
            <option value="">All invitations</option>
            {INVITATION_STATES.map((s) => (
              <option key={s} value={s}>{INVITATION_STATE_LABELS[s]}</option>
            ))}
          </select>
        </label>
      </div>
      {action.isError && <Alert tone="error" title="Not done">{action.error.message}</Alert>}
      {action.isSuccess && action.variables.action === 'resend' && action.data.delivered !== false && (
        <Alert tone="info" title="Sent again">{action.data.email} has a new link; the old one no longer works.</Alert>
      )}
      {invitations.isError ? (
        <Alert tone="error" title="Invitations could not be loaded">{invitations.error.message}</Alert>
      ) : (
        <DataTable
          caption="Invitations"
          columns={columns}
          rows={invitations.data?.rows ?? []}
          rowKey={(i) => i.id}
          total={invitations.data?.total ?? 0}
          totalCapped={invitations.data?.totalCapped}
          page={page}
          pageSize={PAGE_SIZE}
          sort={sort}
          dir={dir}
          loading={invitations.isFetching}
          empty={state === 'pending' ? 'No invitation is waiting for an answer.' : 'No invitation to show.'}
          onSort={(key) => {
            setDir(sort === key && dir === 'asc' ? 'desc' : 'asc');
            setSort(key as InvitationListQuery['sort']);
            setPage(1);
          }}
          onPage={setPage}
        />
      )}
    </div>
  );
}
