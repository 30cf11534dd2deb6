import { useState } from 'react';
import type { CustomerMessageDto } from '@shared/schemas/messages';
import type { Column } from '@/components/data-table';
import { PagedTable } from '@/components/paged-table';
import { formatDate } from '@/lib/format';
import type { TableState } from '@/lib/use-table-state';
import { useCustomerMessages, type CustomerMessagesQuery } from '../api/messages';

const PAGE_SIZE = 10;
const STATE_WORDS: Record<CustomerMessageDto['status'], string> = { queued: 'Queued', sending: 'Being sent', sent: 'Sent', failed: 'Failed' };
const when = (iso: string | null) => (iso ? `${formatDate(iso)} ${new Date(iso).toLocaleTimeString([], { hour: '2-digit', minute: '2-digit' })}` : '—');

/** Every message sent to a customer with its state, newest first, sortable and paged (kept out of the address bar). */
export function CustomerMessages({ customerId }: { customerId: number }) {
  const [state, setState] = useState<TableState>({ q: '', sort: 'createdAt', dir: 'desc', page: 1, filters: {} });
  const table = {
    state,
    toggleSort: (key: string) => setState((s) => ({ ...s, sort: key, dir: s.sort === key && s.dir === 'asc' ? 'desc' : 'asc', page: 1 })),
    setPage: (page: number) => setState((s) => ({ ...s, page })),
  };
  const messages = useCustomerMessages(customerId, { sort: state.sort as CustomerMessagesQuery['sort'], dir: state.dir, page: state.page, pageSize: PAGE_SIZE });
  const columns: Column<CustomerMessageDto>[] = [
    { key: 'createdAt', header: 'Made', sortKey: 'createdAt', render: (m) => <span className="num whitespace-nowrap">{when(m.createdAt)}</span> },
    { key: 'subject', header: 'Message', sortKey: 'subject', render: (m) => <span><span className="block font-medium">{m.label}</span>{m.kind && <span className="block text-xs text-walnut-500">{m.subject}</span>}</span> },
    {
      key: 'status',
      header: 'State',
      sortKey: 'status',
      render: (m) => (
        <span className={m.status === 'failed' ? 'text-brick-700' : undefined} title={m.lastError ?? undefined}>
          {STATE_WORDS[m.status]}
          {m.status === 'queued' && m.sendAfter && new Date(m.sendAfter).getTime() > Date.now() ? ` for ${when(m.sendAfter)}` : ''}
          {m.status === 'failed' && m.lastError ? `: ${m.lastError}` : ''}
        </span>
      ),
    },
    { key: 'sentAt', header: 'Sent', sortKey: 'sentAt', render: (m) => <span className="num whitespace-nowrap">{when(m.sentAt)}</span> },
    { key: 'to', header: 'To', render: (m) => <span className="break-all">{m.to}</span> },
  ];
  return (
    <div className="overflow-x-auto">
      <PagedTable
        caption="Messages to this customer"
        columns={columns}
        rowKey={(m) => m.id}
        query={messages}
        table={table}
        pageSize={PAGE_SIZE}
        empty="No message has been sent to this customer yet."
        errorTitle="The messages could not be loaded"
      />
    </div>
  );
}
