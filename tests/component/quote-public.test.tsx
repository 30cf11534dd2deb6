import { fireEvent, screen, within } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { PublicQuotePage } from '../../src/features/public-quote/routes/public-quote';
import { EXTRA, PUBLIC_QUOTE } from './quote-fixtures';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const TOKEN = 'abcdefghijklmnopqrstuvwxyz012345.abcdefghijklmnopqrstuv';

function renderPublic(handlers: Record<string, (init?: RequestInit) => Response>, search = '') {
  const net = fakeFetch({ '/api/auth/csrf': () => json({ csrfToken: 't' }), ...handlers });
  vi.stubGlobal('fetch', net.fn);
  renderWithApp(
    <Routes>
      <Route path="/q/:token" element={<PublicQuotePage />} />
    </Routes>,
    { route: `/q/${TOKEN}${search}` },
  );
  return net;
}

describe('the customer’s quote page', () => {
  it('says plainly that an expired link has expired, with the workshop’s contact', async () => {
    renderPublic({ [`/api/public/quotes/${TOKEN}`]: () => json({ ...PUBLIC_QUOTE, state: 'expired', closed: 'expired', validUntil: '2026-01-31' }) });
    const notice = await screen.findByTestId('link-notice');
    expect(within(notice).getByRole('heading', { name: 'This quote has expired' })).toBeTruthy();
    expect(notice.textContent).toMatch(/valid until 31 Jan 2026/);
    expect(notice.textContent).toContain('01632 960 000');
    expect(screen.queryByRole('form', { name: 'Accept the quote' })).toBeNull();
  });

  it('says a bad link is not valid', async () => {
    renderPublic({
      [`/api/public/quotes/${TOKEN}`]: () =>
        json({ status: 404, code: 'link_invalid', title: 'Link not valid', detail: 'This quote link is not valid.' }, 404, 'application/problem+json'),
    });
    expect(await screen.findByRole('heading', { name: 'This link is not valid' })).toBeTruthy();
  });

  it('needs the full name and the terms before accepting, and shows the total and deposit with the chosen extras', async () => {
    const net = renderPublic({
      [`/api/public/quotes/${TOKEN}/accept`]: () => json({ ...PUBLIC_QUOTE, state: 'accepted', closed: 'accepted', acceptedName: 'Hester Quillfeather', acceptedAt: '2027-01-03T09:00:00Z', acceptedExtras: ['x1'], acceptedTotal: '4906.08', acceptedDeposit: '1471.82', agreed: { total: '4906.08', deposit: '1471.82', balance: '3434.26', extras: [EXTRA], extraHours: 6 } }),
      [`/api/public/quotes/${TOKEN}`]: () => json(PUBLIC_QUOTE),
    });
    const form = await screen.findByRole('form', { name: 'Accept the quote' });
    expect(screen.getByText('Full French polish')).toBeTruthy();
    expect(screen.getByRole('heading', { name: 'Safety' })).toBeTruthy();
    expect(within(form).getByTestId('accept-total').textContent).toBe('£4,546.08');

    fireEvent.click(within(form).getByRole('button', { name: /Accept for/ }));
    expect(await within(form).findByText('type your full name')).toBeTruthy();
    expect(within(form).getByText('tick to accept the terms')).toBeTruthy();
    expect(net.calls.filter((c) => c.init?.method === 'POST')).toHaveLength(0);

    fireEvent.click(screen.getByRole('checkbox', { name: /Regulate the action/ }));
    expect(within(form).getByTestId('accept-total').textContent).toBe('£4,906.08');
    expect(within(form).getByTestId('accept-deposit').textContent).toBe('£1,471.82');
    fireEvent.change(within(form).getByLabelText('Your full name'), { target: { value: 'Hester Quillfeather' } });
    fireEvent.click(within(form).getByRole('button', { name: /Accept for/ }));
    expect(within(form).getByText('tick to accept the terms')).toBeTruthy();
    fireEvent.click(within(form).getByRole('checkbox', { name: /I have read the quote/ }));
    fireEvent.click(within(form).getByRole('button', { name: /Accept for £4,906.08/ }));

    const outcome = await screen.findByTestId('outcome');
    expect(outcome.textContent).toMatch(/Accepted by Hester Quillfeather/);
    expect(within(outcome).getByRole('button', { name: /Pay the deposit of £1,471.82/ })).toBeTruthy();
    const post = net.calls.find((c) => c.init?.method === 'POST' && c.url.endsWith('/accept'))!;
    expect(JSON.parse(String(post.init!.body))).toEqual({ name: 'Hester Quillfeather', acceptTerms: true, extras: ['x1'] });
  });

  it('shows a paid deposit after coming back from the payment page', async () => {
    renderPublic(
      { [`/api/public/quotes/${TOKEN}`]: () => json({ ...PUBLIC_QUOTE, state: 'deposit-paid', closed: 'deposit-paid', acceptedName: 'Hester Quillfeather', acceptedAt: '2027-01-03T09:00:00Z', acceptedExtras: [], acceptedTotal: '4546.08', acceptedDeposit: '1363.82', agreed: { total: '4546.08', deposit: '1363.82', balance: '3182.26', extras: [], extraHours: 0 }, depositPaidAt: '2027-01-03T09:05:00Z' }) },
      '?deposit=paid',
    );
    expect((await screen.findByTestId('deposit-paid')).textContent).toMatch(/Deposit paid: £1,363.82 on 3 Jan 2027/);
  });
});
