import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { CardPayments } from '../../shared/schemas/card-payments';
import { CardPaymentsCard } from '../../src/features/settings/components/card-payments';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

function renderCard(handlers: Record<string, (init?: RequestInit) => Response>, route = '/settings') {
  const net = fakeFetch({ '/api/auth/csrf': () => json({ csrfToken: 't' }), ...handlers });
  vi.stubGlobal('fetch', net.fn);
  renderWithApp(<CardPaymentsCard />, { route });
  return net;
}

describe('the card payments section of the settings', () => {
  it('says a workshop not connected cannot take cards, and sends the owner to the provider’s set-up form', async () => {
    const assign = vi.fn();
    vi.stubGlobal('location', { ...window.location, assign });
    const net = renderCard({
      '/api/settings/card-payments/connect': () => json({ url: 'http://127.0.0.1:9/connect/onboarding/abc' }),
      '/api/settings/card-payments': () => json({ state: 'none', accountId: null, configured: true } satisfies CardPayments),
    });
    const card = await screen.findByTestId('card-payments');
    expect(within(card).getByTestId('card-payments-state').textContent).toBe('Not connected');
    expect(within(card).getByText(/Customers cannot pay by card yet/)).toBeTruthy();
    fireEvent.click(within(card).getByRole('button', { name: /Connect card payments/ }));
    await waitFor(() => expect(assign).toHaveBeenCalledWith('http://127.0.0.1:9/connect/onboarding/abc'));
    expect(net.calls.filter((c) => c.init?.method === 'POST').map((c) => c.url)).toEqual(['/api/settings/card-payments/connect']);
  });

  it('asks the provider again on the owner’s return and shows the account ready', async () => {
    const net = renderCard(
      {
        '/api/settings/card-payments/refresh': () => json({ state: 'ready', accountId: 'acct_0123456789abcdef', configured: true } satisfies CardPayments),
        '/api/settings/card-payments': () => json({ state: 'onboarding', accountId: 'acct_0123456789abcdef', configured: true } satisfies CardPayments),
      },
      '/settings?card-payments=back',
    );
    const card = await screen.findByTestId('card-payments');
    await waitFor(() => expect(within(card).getByTestId('card-payments-state').textContent).toBe('Ready: customers can pay by card'));
    expect(within(card).queryByRole('button', { name: /Connect|Finish/ })).toBeNull();
    expect(net.calls.filter((c) => c.url === '/api/settings/card-payments/refresh')).toHaveLength(1);
  });

  it('disconnects the account shown only after the owner confirms, naming it, and then offers to connect again', async () => {
    let state: CardPayments = { state: 'ready', accountId: 'acct_0123456789abcdef', configured: true };
    const net = renderCard({
      '/api/settings/card-payments/disconnect': (init) => {
        expect(JSON.parse(String(init?.body))).toEqual({ accountId: 'acct_0123456789abcdef' });
        state = { state: 'none', accountId: null, configured: true };
        return json(state);
      },
      '/api/settings/card-payments': () => json(state),
    });
    const card = await screen.findByTestId('card-payments');
    fireEvent.click(within(card).getByRole('button', { name: /Disconnect this account/ }));
    const dialog = await screen.findByRole('dialog', { name: 'Disconnect card payments?' });
    expect(within(dialog).getByText(/will not be able to pay by card/)).toBeTruthy();
    // Keeping it sends nothing.
    fireEvent.click(within(dialog).getByRole('button', { name: 'Keep it connected' }));
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(net.calls.filter((c) => c.url.endsWith('/disconnect'))).toHaveLength(0);

    fireEvent.click(within(card).getByRole('button', { name: /Disconnect this account/ }));
    fireEvent.click(within(await screen.findByRole('dialog')).getByRole('button', { name: /^Disconnect$/ }));
    await waitFor(() => expect(within(card).getByTestId('card-payments-state').textContent).toBe('Not connected'));
    expect(within(card).getByText(/Card payments disconnected/)).toBeTruthy();
    expect(within(card).getByRole('button', { name: /Connect card payments/ })).toBeTruthy();
    expect(within(card).queryByRole('button', { name: /Disconnect this account/ })).toBeNull();
    expect(net.calls.filter((c) => c.url.endsWith('/disconnect'))).toHaveLength(1);
  });

  it('says why the account was not disconnected when a customer is paying', async () => {
    renderCard({
      '/api/settings/card-payments/disconnect': () =>
        json({ status: 409, code: 'payment_in_progress', title: 'Conflict', detail: 'A customer has just paid by card on quote Q-2026-0004 and the payment is still being recorded. Try again in a few minutes.' }, 409),
      '/api/settings/card-payments': () => json({ state: 'ready', accountId: 'acct_0123456789abcdef', configured: true } satisfies CardPayments),
    });
    const card = await screen.findByTestId('card-payments');
    fireEvent.click(within(card).getByRole('button', { name: /Disconnect this account/ }));
    fireEvent.click(within(await screen.findByRole('dialog')).getByRole('button', { name: /^Disconnect$/ }));
    expect(await within(card).findByText(/just paid by card on quote Q-2026-0004/)).toBeTruthy();
    expect(within(card).getByTestId('card-payments-state').textContent).toBe('Ready: customers can pay by card');
  });
});
