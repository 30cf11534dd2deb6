import { Check, Copy, Link2, MailWarning, Send } from 'lucide-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { Page } from '@shared/schemas/auth';
import type { OutboxSummary, QuoteDetail } from '@shared/schemas/quotes';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { TextField } from '@/components/field';
import { paths } from '@/config/paths';
import { api, ApiError } from '@/lib/api';
import { useSendQuote } from '../api/quotes';

/** The customer's link, shown once after sending: it cannot be read back later, only replaced by sending again. */
export function OneTimeLink({ link }: { link: string }) {
  const [copied, setCopied] = useState(false);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(link);
      setCopied(true);
    } catch {
      (document.getElementById('quote-link') as HTMLInputElement | null)?.select();
    }
  };
  return (
    <div className="rounded-lg border border-moss-600/40 bg-moss-100 px-4 py-3 text-sm text-moss-700" data-testid="quote-link-box">
      <p className="flex items-center gap-2 font-semibold">
        <Link2 className="h-4 w-4" aria-hidden /> The customer’s link
      </p>
      <p className="mt-0.5 text-walnut-700">Shown this once. Copy it now if you want to send it another way; sending again makes a new one and the old one stops working.</p>
      <div className="mt-2 flex flex-wrap gap-2">
        <label htmlFor="quote-link" className="sr-only">Customer’s link</label>
        <input id="quote-link" readOnly value={link} onFocus={(e) => e.currentTarget.select()} className="num min-w-0 flex-1 rounded-md border border-moss-600/40 bg-white px-3 py-1.5 text-xs text-walnut-900" />
        <Button size="sm" variant="secondary" onClick={() => void copy()}>
          {copied ? <Check className="h-3.5 w-3.5" aria-hidden /> : <Copy className="h-3.5 w-3.5" aria-hidden />}
          {copied ? 'Copied' : 'Copy link'}
        </Button>
      </div>
    </div>
  );
}

/** The newest failed message of a quote, for the reason the mail server gave. */
async function failureOf(quoteId: number): Promise<OutboxSummary | undefined> {
  const page = await api<Page<OutboxSummary>>('/api/outbox?status=failed&pageSize=25');
  return page.rows.find((m) => m.quoteId === quoteId);
}

/**
 * Sends a quote (or sends it again) to the recipient, then offers the link to copy. A quote stays unsent when the mail
 * server refuses the message: then the error shows here, and the outbox can try again.
 */
export function SendQuote({ quote, onSent }: { quote: QuoteDetail; onSent?: (link: string | undefined) => void }) {
  const send = useSendQuote();
  const [recipient, setRecipient] = useState(quote.recipient ?? '');
  const [link, setLink] = useState<string>();
  const [failure, setFailure] = useState<{ error: string } | null>(null);
  const again = quote.state !== 'draft';
  const go = () => {
    setFailure(null);
    setLink(undefined);
    const before = quote.sentAt;
    send.mutate(
      { id: quote.id, recipient: recipient.trim() && recipient.trim() !== quote.recipient ? recipient.trim() : undefined },
      {
        onSuccess: async (res) => {
          const delivered = res.state !== 'draft' && res.sentAt !== null && res.sentAt !== before;
          if (delivered) {
            setLink(res.link);
            onSent?.(res.link);
            return;
          }
          const failed = await failureOf(quote.id).catch(() => undefined);
          setFailure({ error: failed?.lastError ?? 'The mail server did not take the message.' });
        },
      },
    );
  };
  const fieldError = send.error instanceof ApiError ? send.error.fieldMessage('recipient') : undefined;
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-2">
        <div className="min-w-64 flex-1">
          <TextField label="Send to" type="email" value={recipient} onChange={(e) => setRecipient(e.target.value)} error={fieldError?.replace(/^recipient: /, '')} placeholder="customer@example.com" />
        </div>
        <Button variant="accent" busy={send.isPending} onClick={go} disabled={!recipient.trim()}>
          <Send className="h-4 w-4" aria-hidden /> {again ? 'Send again' : 'Send to the customer'}
        </Button>
      </div>
      {again && !link && <p className="text-xs text-walnut-500">Sending again makes a new link; the one sent before stops working.</p>}
      {send.error && !fieldError && <Alert tone="error" title="The quote was not sent">{send.error.message}</Alert>}
      {failure && (
        <div role="alert" className="flex gap-3 rounded-lg border border-brick-600/40 bg-brick-100 px-4 py-3 text-sm text-brick-700">
          <MailWarning className="mt-0.5 h-4 w-4 shrink-0" aria-hidden />
          <div>
            <p className="font-semibold">The e-mail could not be delivered: the quote is not marked as sent</p>
            <p className="mt-0.5 break-words">Mail server: {failure.error}</p>
            <p className="mt-1">
              The message waits in the{' '}
              <Link to={paths.outbox} className="font-semibold underline">outbox</Link>
              , where you can try it again once the mail server answers.
            </p>
          </div>
        </div>
      )}
      {link && (
        <>
          <Alert tone="info" title={`Sent to ${recipient || quote.recipient}`}>The e-mail went out with the PDF attached and the customer’s link.</Alert>
          <OneTimeLink link={link} />
        </>
      )}
    </div>
  );
}
