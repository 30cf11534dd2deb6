import { Banknote, CircleCheck, FileText } from 'lucide-react';
import { useEffect } from 'react';
import { DOCUMENT_KIND_LABELS } from '@shared/schemas/accounts';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { formatDate, formatMoney } from '@/lib/format';
import { publicDocumentUrl, useBalanceCheckout, usePublicAccount } from '../api/account';
import { Section } from './parts';

/**
 * After the deposit: what the customer has paid, what is still owed, a button to pay it by card, and their
 * receipts, invoice and credit notes. Plain figures only; nothing of how the price was built.
 */
export function Balance({ token, returned }: { token: string; returned: string | null }) {
  const account = usePublicAccount(token, true);
  const checkout = useBalanceCheckout(token);
  const a = account.data;
  const awaiting = returned === 'paid' && a !== undefined && Number(a.balance) > 0;
  const { refetch } = account;

  // Back from the payment page: the confirmation may trail the customer by a moment, so look again a few times.
  useEffect(() => {
    if (!awaiting) return;
    const timer = window.setInterval(() => void refetch(), 2000);
    const stop = window.setTimeout(() => window.clearInterval(timer), 60_000);
    return () => {
      window.clearInterval(timer);
      window.clearTimeout(stop);
    };
  }, [awaiting, refetch]);

  if (account.isError) return <Alert tone="error" title="Your payments could not be shown">{account.error.message} Please try again in a moment.</Alert>;
  if (!a || typeof a.balance !== 'string') return null;
  const c = a.currency;
  const settled = Number(a.balance) <= 0;
  return (
    <Section id="balance-heading" title={settled ? 'Paid in full' : 'Your balance'}>
      <div data-testid="public-balance" className="space-y-3">
        <dl className="grid grid-cols-1 gap-2 text-sm sm:grid-cols-3">
          <div>
            <dt className="text-xs uppercase tracking-wide text-walnut-500">Agreed total</dt>
            <dd className="num text-walnut-900">{formatMoney(a.agreedTotal, c)}</dd>
          </div>
          <div>
            <dt className="text-xs uppercase tracking-wide text-walnut-500">Paid so far</dt>
            <dd className="num text-walnut-900">{formatMoney(a.paid, c)}</dd>
          </div>
          {a.credited !== '0.00' && (
            <div>
              <dt className="text-xs uppercase tracking-wide text-walnut-500">Taken off by credit note</dt>
              <dd className="num text-walnut-900">{formatMoney(a.credited, c)}</dd>
            </div>
          )}
        </dl>
        {settled ? (
          <p className="flex items-center gap-2 text-walnut-800">
            <CircleCheck className="h-5 w-5 text-moss-700" aria-hidden /> Nothing more to pay. Thank you.
          </p>
        ) : (
          <>
            <p className="text-walnut-800">
              Still to pay: <strong className="num text-lg" data-testid="balance-owed">{formatMoney(a.balance, c)}</strong>.{' '}
              {a.cardPayments
                ? 'You can pay it by card on a secure payment page, or by bank transfer quoting your invoice number.'
                : 'Card payments are not set up for this workshop: please pay by bank transfer quoting your invoice number, or as the workshop tells you.'}
            </p>
            {awaiting && <Alert tone="info" title="Payment made: waiting for the confirmation">This part of the page updates itself in a moment.</Alert>}
            {returned === 'cancelled' && <Alert tone="warning" title="Payment cancelled">Nothing was charged. You can pay whenever you are ready.</Alert>}
            {checkout.error && <Alert tone="error" title="The payment page could not be opened">{checkout.error.message}</Alert>}
            {a.canPay && (
              <Button variant="accent" className="px-5 py-2.5 text-base" busy={checkout.isPending} onClick={() => checkout.mutate(undefined, { onSuccess: ({ url }) => window.location.assign(url) })}>
                <Banknote className="h-5 w-5" aria-hidden /> Pay the balance of {formatMoney(a.balance, c)} by card
              </Button>
            )}
          </>
        )}
        {a.documents.length > 0 && (
          <ul className="divide-y divide-parchment-200 text-sm" aria-label="Your receipts and invoices">
            {a.documents.map((d) => (
              <li key={d.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                <a href={publicDocumentUrl(token, d.id)} target="_blank" rel="noopener" className="inline-flex items-center gap-1.5 font-medium text-amber-800 underline decoration-amber-400 underline-offset-2">
                  <FileText className="h-4 w-4" aria-hidden /> {DOCUMENT_KIND_LABELS[d.kind]} {d.number} (PDF)
                </a>
                <span className="num text-walnut-600">
                  {formatDate(d.issuedOn)} · {formatMoney(d.total, c)}
                </span>
              </li>
            ))}
          </ul>
        )}
      </div>
    </Section>
  );
}
