import { Paperclip, RotateCw } from 'lucide-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { Spinner } from '@/components/spinner';
import { pathTo } from '@/config/paths';
import { formatDateTime } from '@/lib/format';
import { attachmentUrl, useOutboxMessage, useRetryMessage } from '../api/outbox';
import { OutboxStatus } from './outbox-status';

/**
 * One message as it went out: the HTML part in a sandboxed frame (no scripts, no same-origin, nothing from it reaches
 * this page), the plain text, the attachment, and a retry when it failed.
 */
export function MessageDialog({ id, onClose }: { id: number; onClose: () => void }) {
  const message = useOutboxMessage(id);
  const retry = useRetryMessage();
  const [view, setView] = useState<'html' | 'text'>('html');
  const m = message.data;
  const tab = (v: 'html' | 'text', label: string) => (
    <button
      type="button"
      role="tab"
      aria-selected={view === v}
      onClick={() => setView(v)}
      className={`rounded-t-md border-b-2 px-3 py-1.5 text-sm font-medium ${view === v ? 'border-amber-500 text-walnut-900' : 'border-transparent text-walnut-500 hover:text-walnut-800'}`}
    >
      {label}
    </button>
  );
  return (
    <Dialog title={m ? m.subject : 'Message'} open onClose={onClose} wide>
      {message.isError ? (
        <Alert tone="error" title="The message could not be loaded">{message.error.message}</Alert>
      ) : !m ? (
        <Spinner label="Opening the message…" />
      ) : (
        <div className="space-y-4" data-testid="outbox-message">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-walnut-500">To</dt>
            <dd className="break-all font-medium text-walnut-900">{m.to}</dd>
            <dt className="text-walnut-500">Status</dt>
            <dd className="flex flex-wrap items-center gap-2">
              <OutboxStatus status={m.status} />
              <span className="text-xs text-walnut-500">
                {m.sentAt ? `sent ${formatDateTime(m.sentAt)}` : `written ${formatDateTime(m.createdAt)}`} · {m.attempts} {m.attempts === 1 ? 'attempt' : 'attempts'}
              </span>
            </dd>
            {m.quoteId !== null && (
              <>
                <dt className="text-walnut-500">Quote</dt>
                <dd><Link to={pathTo.quote(m.quoteId)} className="underline decoration-amber-400 underline-offset-2 hover:text-amber-700" onClick={onClose}>Open the quote</Link></dd>
              </>
            )}
          </dl>
          {m.status === 'failed' && m.lastError && (
            <Alert tone="error" title="The mail server refused it">
              <span className="break-words">{m.lastError}</span>
            </Alert>
          )}
          {retry.error && <Alert tone="error" title="Retry failed">{retry.error.message}</Alert>}
          <div className="flex flex-wrap gap-2">
            {m.attachmentName && (
              <a href={attachmentUrl(m.id)} download={m.attachmentName} className="inline-flex items-center gap-2 rounded-md border border-walnut-200 bg-white px-3 py-1.5 text-sm font-medium text-walnut-800 hover:bg-parchment-100">
                <Paperclip className="h-4 w-4" aria-hidden /> {m.attachmentName}
              </a>
            )}
            {m.status !== 'sent' && (
              <Button size="sm" variant="accent" busy={retry.isPending} onClick={() => retry.mutate(m.id)}>
                <RotateCw className="h-3.5 w-3.5" aria-hidden /> Try sending again
              </Button>
            )}
          </div>
          <div>
            <div role="tablist" aria-label="Message body" className="flex gap-1 border-b border-parchment-200">
              {tab('html', 'As the customer sees it')}
              {tab('text', 'Plain text')}
            </div>
            {view === 'html' ? (
              <iframe title="The message as HTML" sandbox="" srcDoc={m.html} className="mt-2 h-96 w-full rounded-md border border-parchment-200 bg-white" />
            ) : (
              <pre className="mt-2 max-h-96 overflow-auto whitespace-pre-wrap rounded-md border border-parchment-200 bg-parchment-50 p-3 font-sans text-sm text-walnut-800">{m.text}</pre>
            )}
          </div>
        </div>
      )}
    </Dialog>
  );
}
