import { CreditCard, ExternalLink, RefreshCw, Unlink } from 'lucide-react';
import { useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { CARD_PAYMENT_STATE_LABELS, CARD_PAYMENTS_RETURN } from '@shared/schemas/card-payments';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { Dialog } from '@/components/dialog';
import { Spinner } from '@/components/spinner';
import { useCardPayments, useConnectCardPayments, useDisconnectCardPayments, useRefreshCardPayments } from '../api/card-payments';

/**
 * The workshop's own account with the payment provider: deposits and balances paid by card go into it. The owner
 * connects it (the provider's set-up form opens), and is brought back here, where the state is asked again.
 */
export function CardPaymentsCard() {
  const status = useCardPayments();
  const connect = useConnectCardPayments();
  const refresh = useRefreshCardPayments();
  const disconnect = useDisconnectCardPayments();
  const [confirming, setConfirming] = useState(false);
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
  const shown = disconnect.data ?? refresh.data ?? s;
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
          {shown.state === 'none' && !disconnect.isSuccess && <Alert tone="info" title="Not connected">Customers cannot pay by card yet: their quote page asks them to pay another way.</Alert>}
          {(connect.error ?? refresh.error) && <Alert tone="error" title="The payment provider did not answer">{(connect.error ?? refresh.error)!.message}</Alert>}
          {disconnect.error && <Alert tone="error" title="The account was not disconnected">{disconnect.error.message}</Alert>}
          {disconnect.isSuccess && shown.state === 'none' && (
            <Alert tone="info" title="Card payments disconnected">
              Customers cannot pay by card until an account is connected again: their quote pages ask them to pay another way. Card payments taken before stay
              recorded, and any refund of them still goes to the account that took them.
            </Alert>
          )}
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
            {shown.accountId && (
              <Button variant="ghost" onClick={() => setConfirming(true)}>
                <Unlink className="h-4 w-4" aria-hidden /> Disconnect this account
              </Button>
            )}
          </div>
        </div>
      )}
      <Dialog title="Disconnect card payments?" open={confirming && Boolean(shown?.accountId)} onClose={() => setConfirming(false)}>
        <div className="space-y-3 text-sm text-walnut-800">
          <p>
            Customers will not be able to pay by card until an account is connected again: their quote pages will ask them to pay another way. Any card payment page a
            customer has open now is closed.
          </p>
          <p>Payments already taken stay recorded, and refunds of them still go to the account that took them. You can connect this account or another one afterwards.</p>
          <div className="flex flex-wrap justify-end gap-2 pt-1">
            <Button variant="secondary" onClick={() => setConfirming(false)}>
              Keep it connected
            </Button>
            <Button
              variant="danger"
              busy={disconnect.isPending}
              onClick={() => shown?.accountId && disconnect.mutate(shown.accountId, { onSettled: () => setConfirming(false) })}
            >
              <Unlink className="h-4 w-4" aria-hidden /> Disconnect
            </Button>
          </div>
        </div>
      </Dialog>
    </Card>
  );
}
