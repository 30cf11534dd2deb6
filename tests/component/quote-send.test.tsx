import { fireEvent, screen, within } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { QuotePage } from '../../src/features/quotes/routes/quote';
import { ME } from './estimates-fixtures';
import { QUOTE } from './quote-fixtures';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const SALES = { user: { ...ME.user, id: 3, role: 'sales', name: 'Saskia Threlfall' } };

function renderQuote(role: string, send: () => Response) {
  const net = fakeFetch({
    '/api/auth/csrf': () => json({ csrfToken: 't' }),
    '/api/auth/session': () => json({ user: { ...SALES.user, role } }),
    '/api/quotes/55/send': send,
    '/api/quotes/55': () => json(QUOTE),
    '/api/outbox?status=failed': () =>
      json({ rows: [{ id: 9, quoteId: 55, to: 'hester@example.com', subject: 'Quote', status: 'failed', attempts: 1, lastError: 'connect ECONNREFUSED 127.0.0.1:9', attachmentName: 'Q.pdf', createdAt: '2027-01-02T10:00:00Z', sentAt: null }], total: 1, page: 1, pageSize: 25 }),
  });
  vi.stubGlobal('fetch', net.fn);
  renderWithApp(
    <Routes>
      <Route path="/quotes/:quoteId" element={<QuotePage />} />
    </Routes>,
    { route: '/quotes/55' },
  );
  return net;
}

describe('sending a quote', () => {
  it('offers the link once after sending, to copy', async () => {
    renderQuote('sales', () => json({ ...QUOTE, state: 'quoted', sentAt: '2027-01-02T11:00:00Z', link: 'http://shop.example/q/abc.def' }));
    fireEvent.click(await screen.findByRole('button', { name: /Send to the customer/ }));
    expect(((await screen.findByLabelText('Customer’s link')) as HTMLInputElement).value).toBe('http://shop.example/q/abc.def');
    expect(screen.getByRole('button', { name: /Copy link/ })).toBeTruthy();
  });

  it('says when the mail server refused the message and points to the outbox', async () => {
    renderQuote('sales', () => json(QUOTE));
    fireEvent.click(await screen.findByRole('button', { name: /Send to the customer/ }));
    const alert = await screen.findByText(/The e-mail could not be delivered/);
    const box = alert.closest('[role="alert"]') as HTMLElement;
    expect(box.textContent).toContain('ECONNREFUSED');
    expect(within(box).getByRole('link', { name: 'outbox' }).getAttribute('href')).toBe('/outbox');
    expect(screen.queryByLabelText('Customer’s link')).toBeNull();
  });

  it('lets the workshop read a quote without sending or withdrawing it', async () => {
    renderQuote('workshop', () => json(QUOTE));
    expect(await screen.findByRole('heading', { name: 'Timeline' })).toBeTruthy();
    expect(screen.getByRole('link', { name: /PDF/ }).getAttribute('href')).toBe('/api/quotes/55/pdf');
    expect(screen.queryByRole('button', { name: /Send/ })).toBeNull();
    expect(screen.queryByRole('button', { name: /Withdraw/ })).toBeNull();
  });
});
