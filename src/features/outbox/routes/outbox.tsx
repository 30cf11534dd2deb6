import { Paperclip } from 'lucide-react';
import { useCallback, useState } from 'react';
import { Link } from 'react-router-dom';
import type { OutboxSummary } from '@shared/schemas/quotes';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { PagedTable } from '@/components/paged-table';
import { pathTo } from '@/config/paths';
import { formatDateTime } from '@/lib/format';
import { useTableState } from '@/lib/use-table-state';
import { useOutbox, type OutboxStatus as Status } from '../api/outbox';
import { MessageDialog } from '../components/message-dialog';
import { OUTBOX_STATUS_LABELS, OutboxStatus } from '../components/outbox-status';

const PAGE_SIZE = 25;

/** Every e-mail the workshop sent, newest first: whether it went, why not, and what it said. */
export function OutboxPage() {
  const table = useTableState({ sort: 'createdAt', dir: 'desc', filters: ['status'] });
  const status = (table.state.filters.status as Status) || undefined;
  const outbox = useOutbox({ status, page: table.state.page, pageSize: PAGE_SIZE });
  const [open, setOpen] = useState<number>();
  const close = useCallback(() => setOpen(undefined), []);

  const columns: Column<OutboxSummary>[] = [
    { key: 'createdAt', header: 'Written', render: (m) => <span className="num whitespace-nowrap text-walnut-600">{formatDateTime(m.createdAt)}</span> },
    { key: 'to', header: 'To', render: (m) => <span className="break-all">{m.to}</span> },
    {
      key: 'subject',
      header: 'Subject',
      render: (m) => (
        <button type="button" onClick={() => setOpen(m.id)} className="text-left font-medium text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700">
          {m.subject}
          {m.attachmentName && (
            <span className="ml-1.5 inline-flex items-center gap-0.5 text-xs font-normal text-walnut-500 no-underline">
              <Paperclip className="h-3 w-3" aria-hidden /> {m.attachmentName}
            </span>
          )}
        </button>
      ),
    },
    {
      key: 'status',
      header: 'Status',
      render: (m) => (
        <div className="max-w-xs">
          <OutboxStatus status={m.status} />
          {m.status === 'failed' && m.lastError && <p className="mt-1 line-clamp-2 text-xs text-brick-700">{m.lastError}</p>}
          {m.status === 'sent' && m.sentAt && <p className="num mt-0.5 text-xs text-walnut-500">{formatDateTime(m.sentAt)}</p>}
        </div>
      ),
    },
    { key: 'attempts', header: 'Attempts', align: 'right', render: (m) => m.attempts },
    {
      key: 'quote',
      header: 'Quote',
      render: (m) => (m.quoteId === null ? '—' : <Link to={pathTo.quote(m.quoteId)} className="hover:text-amber-700 hover:underline">Open</Link>),
    },
  ];

  return (
    <>
      <PageHeader title="Outbox" description="E-mail sent from Shellwright, newest first. A failed message can be read and sent again." />
      <div className="mb-4">
        <label htmlFor="outbox-status" className="block text-xs font-medium uppercase tracking-wide text-walnut-600">Status</label>
        <select id="outbox-status" value={table.state.filters.status} onChange={(e) => table.setFilter('status', e.target.value)} className="mt-0.5 rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
          <option value="">Any status</option>
          {Object.entries(OUTBOX_STATUS_LABELS).map(([value, label]) => (
            <option key={value} value={value}>{label}</option>
          ))}
        </select>
      </div>
      <PagedTable
        caption="Outbox"
        columns={columns}
        rowKey={(m) => m.id}
        query={outbox}
        table={table}
        pageSize={PAGE_SIZE}
        empty={status ? 'No message with this status.' : 'Nothing sent yet.'}
        errorTitle="The outbox could not be loaded"
        sort={false}
      />
      {open !== undefined && <MessageDialog id={open} onClose={close} />}
    </>
  );
}

/** The route module's component for React Router's lazy loading. */
export const Component = OutboxPage;
