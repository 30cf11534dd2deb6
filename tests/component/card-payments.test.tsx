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
});
