import { CreditCard, ExternalLink, RefreshCw } from 'lucide-react';
import { useEffect, useRef } from 'react';
import { useSearchParams } from 'react-router-dom';
import { CARD_PAYMENT_STATE_LABELS, CARD_PAYMENTS_RETURN } from '@shared/schemas/card-payments';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { useCardPayments, useConnectCardPayments, useRefreshCardPayments } from '../api/card-payments';

/**
 * The workshop's own account with the payment provider: deposits and balances paid by card go into it. The owner
 * connects it (the provider's set-up form opens), and is brought back here, where the state is asked again.
 */
export function CardPaymentsCard() {
  const status = useCardPayments();
  const connect = useConnectCardPayments();
  const refresh = useRefreshCardPayments();
  const [params, setParams] = useSearchParams();
  const returned = params.get(CARD_PAYMENTS_RETURN);
  const asked = useRef(false);

  // Back from the provider's form (finished or not): ask how far the account has got, once.
  useEffect(() => {
    if (!returned || asked.current) return;
    asked.current = true;
    refresh.mutate();
    const next = new URLSearchParams(params);
    next.delete(CARD_PAYMENTS_RETURN);
    setParams(next, { replace: true });
  }, [returned, refresh, params, setParams]);

  const s = status.data;
  const shown = refresh.data ?? s;
  const start = () => connect.mutate(undefined, { onSuccess: ({ url }) => window.location.assign(url) });
  return (
    <Card
      title={
        <span className="inline-flex items-center gap-2">
          <CreditCard className="h-4 w-4 text-amber-600" aria-hidden /> Card payments
        </span>
      }
    >
      <p className="mb-3 text-sm text-walnut-600">
        Customers pay deposits and balances by card into this workshop&rsquo;s own account with the payment provider. Connect it once; the provider asks for the
        business&rsquo;s details on its own page and sends you back here.
      </p>
      {status.isPending && <Spinner label="Loading the card payment account…" />}
      {status.isError && <Alert tone="error" title="The card payment account could not be loaded">{status.error.message}</Alert>}
      {shown && (
        <div className="space-y-3" data-testid="card-payments">
          <p className="text-sm text-walnut-800">
            State: <strong data-testid="card-payments-state">{CARD_PAYMENT_STATE_LABELS[shown.state]}</strong>
            {shown.accountId && <span className="ml-2 break-all text-xs text-walnut-500">(account {shown.accountId})</span>}
          </p>
          {!shown.configured && <Alert tone="warning" title="No payment provider is configured">Card payments need the provider&rsquo;s keys in this installation&rsquo;s settings.</Alert>}
          {returned === 'again' && shown.state !== 'ready' && <Alert tone="warning" title="The set-up link ran out">Open the set-up again to carry on where you left off.</Alert>}
          {shown.state === 'onboarding' && <Alert tone="info" title="Set-up not finished">Customers cannot pay by card until the provider&rsquo;s set-up is finished.</Alert>}
          {shown.state === 'none' && <Alert tone="info" title="Not connected">Customers cannot pay by card yet: their quote page asks them to pay another way.</Alert>}
          {(connect.error ?? refresh.error) && <Alert tone="error" title="The payment provider did not answer">{(connect.error ?? refresh.error)!.message}</Alert>}
          <div className="flex flex-wrap gap-2">
            {shown.state !== 'ready' && shown.configured && (
              <Button onClick={start} busy={connect.isPending}>
                <ExternalLink className="h-4 w-4" aria-hidden /> {shown.state === 'none' ? 'Connect card payments' : 'Finish the set-up'}
              </Button>
            )}
            {shown.accountId && (
              <Button variant="secondary" onClick={() => refresh.mutate()} busy={refresh.isPending}>
                <RefreshCw className="h-4 w-4" aria-hidden /> Check the state again
              </Button>
            )}
          </div>
        </div>
      )}
    </Card>
  );
}
