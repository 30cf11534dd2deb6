import { FileText } from 'lucide-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { JOB_STATE_LABELS, type JobState } from '@shared/schemas/planning';
import { DOCUMENT_KIND_LABELS, INVOICE_STAGE_LABELS, PAYMENT_METHOD_LABELS, type AccountDto } from '@shared/schemas/accounts';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { pathTo } from '@/config/paths';
import { formatDate, formatMoney } from '@/lib/format';
import { documentPdfUrl, useAccount, useIssueInvoice } from '../api/accounts';
import { CreditNoteForm } from './credit-note-form';
import { RecordPaymentForm } from './record-payment-form';

const MAIL_WORDS = { queued: 'Waiting to send', sending: 'Sending', sent: 'E-mailed', failed: 'Not sent (see the outbox)' } as const;

function Figures({ a }: { a: AccountDto }) {
  const f = a.figures;
  const c = f.currency;
  const rows: [string, string, string][] = [
    ['Agreed total', f.agreedTotal, 'agreed'],
    ['Taken off by credit notes', f.credited, 'credited'],
    ['Paid', f.paid, 'paid'],
    ['Refunded', f.refunded, 'refunded'],
  ];
  return (
    <div className="grid grid-cols-1 gap-4 sm:grid-cols-[1fr_auto] sm:items-end">
      <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4">
        {rows.map(([label, amount, id]) => (
          <div key={id}>
            <dt className="text-xs uppercase tracking-wide text-walnut-500">{label}</dt>
            <dd className="num text-walnut-900" data-testid={`account-${id}`}>{formatMoney(amount, c)}</dd>
          </div>
        ))}
      </dl>
      <div className="rounded-lg border border-walnut-800 bg-walnut-900 px-4 py-2 text-parchment-50">
        <p className="text-xs uppercase tracking-wide text-parchment-200">Balance owed</p>
        <p className="num font-serif text-2xl font-semibold text-amber-300" data-testid="account-balance">{formatMoney(f.balance, c)}</p>
      </div>
    </div>
  );
}

function Documents({ a }: { a: AccountDto }) {
  if (a.documents.length === 0) return <p className="text-sm text-walnut-600">No receipt, invoice or credit note yet.</p>;
  const c = a.figures.currency;
  return (
    <div className="overflow-x-auto">
      <table className="min-w-full text-sm">
        <caption className="sr-only">Documents issued</caption>
        <thead className="text-left text-xs uppercase tracking-wide text-walnut-500">
          <tr>
            <th scope="col" className="py-2 pr-3">Number</th>
            <th scope="col" className="py-2 pr-3">Document</th>
            <th scope="col" className="py-2 pr-3">Issued</th>
            <th scope="col" className="py-2 pr-3 text-right">Amount</th>
            <th scope="col" className="py-2 pr-3 text-right">Tax in it</th>
            <th scope="col" className="py-2 pr-3 text-right">Owed after</th>
            <th scope="col" className="py-2 pr-3">E-mail</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {a.documents.map((d) => (
            <tr key={d.id}>
              <td className="py-2 pr-3">
                <a href={documentPdfUrl(d.id)} target="_blank" rel="noopener" className="num inline-flex items-center gap-1 font-medium text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700">
                  <FileText className="h-3.5 w-3.5" aria-hidden /> {d.number}
                </a>
              </td>
              <td className="py-2 pr-3">
                {DOCUMENT_KIND_LABELS[d.kind]}
                {d.againstNumber && <span className="block text-xs text-walnut-500">against {d.againstNumber}</span>}
                {d.reason && <span className="block text-xs italic text-walnut-500">{d.reason}</span>}
              </td>
              <td className="num whitespace-nowrap py-2 pr-3">{formatDate(d.issuedAt)}</td>
              <td className="num py-2 pr-3 text-right">{formatMoney(d.total, c)}</td>
              <td className="num py-2 pr-3 text-right">
                {formatMoney(d.tax, c)}
                <span className="block text-xs text-walnut-500">{d.taxLabel} {d.taxPct} %</span>
              </td>
              <td className="num py-2 pr-3 text-right">{formatMoney(d.balanceDue, c)}</td>
              <td className="py-2 pr-3 text-xs">{d.mail ? MAIL_WORDS[d.mail.status] : 'No e-mail address'}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function Ledger({ a }: { a: AccountDto }) {
  if (a.entries.length === 0) return <p className="text-sm text-walnut-600">No payment received yet.</p>;
  const c = a.figures.currency;
  return (
    <div className="overflow-x-auto">
      <table className="min-w-full text-sm">
        <caption className="sr-only">Payments and refunds</caption>
        <thead className="text-left text-xs uppercase tracking-wide text-walnut-500">
          <tr>
            <th scope="col" className="py-2 pr-3">Date</th>
            <th scope="col" className="py-2 pr-3">What</th>
            <th scope="col" className="py-2 pr-3">Reference</th>
            <th scope="col" className="py-2 pr-3 text-right">Amount</th>
            <th scope="col" className="py-2 pr-3">Receipt</th>
            <th scope="col" className="py-2 pr-3">Recorded by</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {a.entries.map((e) => (
            <tr key={e.id}>
              <td className="num whitespace-nowrap py-2 pr-3">{formatDate(e.receivedOn)}</td>
              <td className="py-2 pr-3">
                {e.kind === 'refund' ? 'Refund' : 'Payment'} by {PAYMENT_METHOD_LABELS[e.method].toLowerCase()}
                {e.note && <span className="block text-xs text-walnut-500">{e.note}</span>}
              </td>
              <td className="break-all py-2 pr-3 text-xs">{e.reference || '—'}</td>
              <td className="num py-2 pr-3 text-right">{formatMoney(e.kind === 'refund' ? `-${e.amount}` : e.amount, c)}</td>
              <td className="num py-2 pr-3">{e.receiptNumber ?? e.creditNoteNumber ?? '—'}</td>
              <td className="py-2 pr-3">{e.recordedBy ?? (e.method === 'card' ? 'Card payment page' : '—')}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** A job's account: what was agreed, the documents issued, every payment and refund, and what is still owed. */
export function AccountPanel({ quoteId }: { quoteId: number }) {
  const account = useAccount(quoteId);
  const invoice = useIssueInvoice(quoteId);
  const [tab, setTab] = useState<'payment' | 'credit'>('payment');
  if (account.isError) return <Alert tone="error" title="The account could not be loaded">{account.error.message}</Alert>;
  const a = account.data;
  if (!a) return <Spinner label="Opening the account…" />;
  const c = a.figures.currency;
  const issued = a.documents.find((d) => d.kind === 'invoice');
  return (
    <div className="space-y-5" data-testid="account-panel">
      <Card title={`Account for quote ${a.quote.number}`}>
        <p className="mb-3 text-sm text-walnut-700">
          <Link to={pathTo.customer(a.quote.customer.id)} className="font-medium hover:text-amber-700 hover:underline">{a.quote.customer.name}</Link>
          {' · '}
          <Link to={pathTo.quote(a.quote.id)} className="hover:text-amber-700 hover:underline">quote {a.quote.number}</Link>
          {a.jobs.length > 0 && <> · {a.jobs.map((j) => `${j.number} (${JOB_STATE_LABELS[j.state as JobState].toLowerCase()})`).join(', ')}</>}
        </p>
        <Figures a={a} />
      </Card>

      <Card title="Tax invoice">
        {issued ? (
          <p className="text-sm text-walnut-800">
            Invoice <span className="num font-semibold">{issued.number}</span> issued on {formatDate(issued.issuedAt)} for {formatMoney(issued.total, c)}. It is never changed: correct it with a credit note.
          </p>
        ) : (
          <div className="space-y-3">
            <p className="text-sm text-walnut-700">The workshop issues invoices: {INVOICE_STAGE_LABELS[a.invoiceStage].toLowerCase()}.</p>
            {a.invoice.why && <Alert tone="warning" title="Not yet">{a.invoice.why}</Alert>}
            {invoice.error && <Alert tone="error" title="The invoice was not issued">{invoice.error.message}</Alert>}
            <Button variant="accent" busy={invoice.isPending} disabled={!a.invoice.canIssue} onClick={() => invoice.mutate({ note: '' })}>
              Issue the tax invoice for {formatMoney(a.figures.agreedTotal, c)}
            </Button>
          </div>
        )}
      </Card>

      <Card title="Documents">
        <Documents a={a} />
      </Card>
      <Card title="Payments and refunds">
        <Ledger a={a} />
      </Card>

      <Card
        title={tab === 'payment' ? 'Record a payment' : 'Issue a credit note'}
        actions={
          issued && (
            <div role="group" aria-label="What to record" className="flex gap-1">
              <Button size="sm" variant={tab === 'payment' ? 'primary' : 'ghost'} aria-pressed={tab === 'payment'} onClick={() => setTab('payment')}>Payment</Button>
              <Button size="sm" variant={tab === 'credit' ? 'primary' : 'ghost'} aria-pressed={tab === 'credit'} onClick={() => setTab('credit')}>Credit note</Button>
            </div>
          )
        }
      >
        {tab === 'credit' && issued ? (
          <CreditNoteForm quoteId={quoteId} invoice={issued} currency={c} balance={a.figures.balance} />
        ) : (
          <RecordPaymentForm quoteId={quoteId} currency={c} balance={a.figures.balance} />
        )}
      </Card>
    </div>
  );
}
