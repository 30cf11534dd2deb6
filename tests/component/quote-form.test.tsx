import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { EstimatePage } from '../../src/app/routes/estimate';
import { QuotePage } from '../../src/features/quotes/routes/quote';
import { CALC, detail, GRAND_INPUT, ME, revision } from './estimates-fixtures';
import { QUOTE } from './quote-fixtures';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const SALES = { user: { ...ME.user, id: 3, role: 'sales', name: 'Saskia Threlfall' } };
const priced = { ...detail([revision(1, { ...GRAND_INPUT, discountPct: 5 })]), state: 'priced' as const };
const customer = { id: 3, name: 'Hester Quillfeather', email: 'hester@example.com' };
const problem = (status: number, body: object) => json({ status, title: 'Bad request', ...body }, status, 'application/problem+json');

function renderEstimate(handlers: Record<string, (init?: RequestInit) => Response>) {
  const net = fakeFetch({
    '/api/auth/csrf': () => json({ csrfToken: 't' }),
    '/api/auth/session': () => json(SALES),
    '/api/calc/catalog': () => json(CALC),
    '/api/quotes?': () => json({ rows: [], total: 0, page: 1, pageSize: 100 }),
    '/api/customers/3': () => json(customer),
    ...handlers,
    '/api/estimates/1': () => json(priced),
  });
  vi.stubGlobal('fetch', net.fn);
  renderWithApp(
    <Routes>
      <Route path="/estimates/:estimateId" element={<EstimatePage />} />
      <Route path="/quotes/:quoteId" element={<QuotePage />} />
    </Routes>,
    { route: '/estimates/1' },
  );
  return net;
}

const posts = (net: ReturnType<typeof fakeFetch>) => net.calls.filter((c) => c.init?.method === 'POST' && c.url.endsWith('/quotes'));

describe('preparing a quote on the estimate page', () => {
  it('offers the customer’s PDF to everyone and starts from the revision’s discount, the cap and the customer’s e-mail', async () => {
    renderEstimate({});
    expect((await screen.findByRole('link', { name: /Customer’s view \(PDF\)/ })).getAttribute('href')).toBe('/api/estimates/1/quote.pdf');
    fireEvent.click(await screen.findByRole('button', { name: /Prepare a quote/ }));
    const form = await screen.findByRole('form', { name: 'Prepare a quote' });
    expect((within(form).getByLabelText('Discount (%)') as HTMLInputElement).value).toBe('5');
    expect(within(form).getByText(/Up to 15 %: the owner’s limit for sales/)).toBeTruthy();
    await waitFor(() => expect((within(form).getByLabelText('Recipient’s e-mail') as HTMLInputElement).value).toBe('hester@example.com'));
    expect((within(form).getByLabelText('Deposit (%)') as HTMLInputElement).value).toBe(String(CALC.settings.pricing.depositPct));
  });

  it('checks an extra with the shared schema before anything is sent', async () => {
    const net = renderEstimate({});
    fireEvent.click(await screen.findByRole('button', { name: /Prepare a quote/ }));
    const form = await screen.findByRole('form', { name: 'Prepare a quote' });
    fireEvent.click(within(form).getByRole('button', { name: /Add an extra/ }));
    fireEvent.change(within(form).getByLabelText(/Price \(GBP/), { target: { value: 'lots' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Prepare the quote' }));
    expect(await within(form).findByText('is required')).toBeTruthy();
    expect(within(form).getByText('must be an amount like 120.00')).toBeTruthy();
    expect(posts(net)).toHaveLength(0);
  });

  it('shows the server’s message beside the discount when it is over the cap', async () => {
    const net = renderEstimate({
      '/api/estimates/1/quotes': () =>
        problem(400, {
          code: 'discount_over_cap',
          detail: 'discountPct: at most 15 % (the owner\u2019s limit for sales)',
          field: 'discountPct',
          errors: [{ field: 'discountPct', message: 'discountPct: at most 15 % (the owner\u2019s limit for sales)' }],
        }),
    });
    fireEvent.click(await screen.findByRole('button', { name: /Prepare a quote/ }));
    const form = await screen.findByRole('form', { name: 'Prepare a quote' });
    const discount = within(form).getByLabelText('Discount (%)');
    fireEvent.change(discount, { target: { value: '40' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Prepare the quote' }));
    expect(await within(form).findByText('at most 15 % (the owner\u2019s limit for sales)')).toBeTruthy();
    expect(discount.getAttribute('aria-invalid')).toBe('true');
    const body = JSON.parse(String(posts(net)[0]!.init!.body)) as { discountPct: number; revision: number };
    expect(body).toMatchObject({ discountPct: 40, revision: 1 });
  });

  it('preparing opens the quote it made: its price with discount, tax, deposit and extras, the PDF preview and sending', async () => {
    renderEstimate({
      '/api/estimates/1/quotes': () => json(QUOTE, 201),
      '/api/quotes/55': () => json(QUOTE),
    });
    fireEvent.click(await screen.findByRole('button', { name: /Prepare a quote/ }));
    const form = await screen.findByRole('form', { name: 'Prepare a quote' });
    fireEvent.click(within(form).getByRole('button', { name: 'Prepare the quote' }));
    // The quote's own page opens, not a copy of it under the estimate.
    await screen.findByRole('heading', { level: 1, name: new RegExp(QUOTE.number) });
    expect(screen.queryByRole('form', { name: 'Prepare a quote' })).toBeNull();
    const prepared = document.body;
    expect(within(prepared).getByText('Discount (5 %)')).toBeTruthy();
    expect(within(prepared).getByText('VAT (20 %)')).toBeTruthy();
    expect(within(prepared).getByTestId('quote-total').textContent).toBe('£4,546.08');
    expect(within(prepared).getByTestId('quote-deposit').textContent).toBe('£1,363.82');
    expect(within(prepared).getByText('Regulate the action')).toBeTruthy();
    expect(within(prepared).getByRole('link', { name: /^PDF$/ }).getAttribute('href')).toBe('/api/quotes/55/pdf');
    expect(within(prepared).getByRole('button', { name: /Send to the customer/ })).toBeTruthy();
  });
});
