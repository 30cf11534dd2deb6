import { fireEvent, screen, within } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { AccountDto, PublicAccount } from '../../shared/schemas/accounts';
import { AccountPanel } from '../../src/features/accounts/components/account-panel';
import { Balance } from '../../src/features/public-quote/components/balance';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const ACCOUNT: AccountDto = {
  quote: { id: 7, number: 'Q-2026-0007', state: 'deposit-paid', customer: { id: 3, name: 'Perpetua Langstroth', email: 'perpetua@example.com' } },
  jobs: [{ id: 11, number: 'JOB-0011', state: 'in-progress', title: 'Walnut upright' }],
  figures: { currency: 'GBP', agreedTotal: '1234.56', credited: '0.00', paid: '308.64', refunded: '0.00', balance: '925.92' },
  invoiceStage: 'finished',
  invoice: { issued: null, canIssue: false, why: 'The workshop invoices when the work is finished: JOB-0011 is not finished.' },
  documents: [
    { id: 21, kind: 'receipt', number: 'RC-00004', issuedAt: '2026-12-02T10:00:00Z', total: '308.64', net: '257.20', tax: '51.44', taxLabel: 'VAT', taxPct: 20, balanceDue: '925.92', reason: null, againstNumber: null, mail: { status: 'sent', to: 'perpetua@example.com' } },
  ],
  entries: [
    { id: 31, kind: 'payment', method: 'card', amount: '308.64', receivedOn: '2026-12-02', reference: 'pi_test_1', note: 'Deposit', receiptNumber: 'RC-00004', creditNoteNumber: null, recordedBy: null, createdAt: '2026-12-02T10:00:00Z' },
  ],
};

function renderPanel(handlers: Record<string, (init?: RequestInit) => Response>) {
  const net = fakeFetch({ '/api/auth/csrf': () => json({ csrfToken: 't' }), ...handlers });
  vi.stubGlobal('fetch', net.fn);
  renderWithApp(<AccountPanel quoteId={7} />);
  return net;
}

describe('a job’s account panel', () => {
  it('shows the figures, documents and ledger, and says why the invoice waits', async () => {
    renderPanel({ '/api/accounts/quotes/7': () => json(ACCOUNT) });
    const panel = await screen.findByTestId('account-panel');
    expect(within(panel).getByTestId('account-balance').textContent).toBe('£925.92');
    expect(within(panel).getByTestId('account-agreed').textContent).toBe('£1,234.56');
    expect(within(panel).getByTestId('account-paid').textContent).toBe('£308.64');
    expect(within(panel).getByText(/JOB-0011 is not finished/)).toBeTruthy();
    expect((within(panel).getByRole('button', { name: /Issue the tax invoice for £1,234.56/ }) as HTMLButtonElement).disabled).toBe(true);
    const receipt = within(panel).getByRole('link', { name: /RC-00004/ });
    expect(receipt.getAttribute('href')).toBe('/api/accounts/documents/21/pdf');
    expect(within(panel).getByRole('table', { name: 'Payments and refunds' }).textContent).toMatch(/Payment by card/);
  });

  it('checks a payment before sending it, and shows the server’s refusal of an over-payment on the amount', async () => {
    let posted = 0;
    const net = renderPanel({
      '/api/accounts/quotes/7/payments': () => {
        posted++;
        return json({ status: 400, code: 'overpayment', title: 'Bad request', detail: 'The amount is more than the £925.92 still owed on quote Q-2026-0007.', field: 'amount', errors: [{ field: 'amount', message: 'is more than the £925.92 still owed on quote Q-2026-0007' }] }, 400, 'application/problem+json');
      },
      '/api/accounts/quotes/7': () => json(ACCOUNT),
    });
    const form = await screen.findByRole('form', { name: 'Record a payment' });
    fireEvent.click(within(form).getByRole('button', { name: 'Record the payment' }));
    expect(await within(form).findByText(/must be an amount like 125.50/)).toBeTruthy();
    expect(net.calls.filter((c) => c.init?.method === 'POST')).toHaveLength(0);

    fireEvent.change(within(form).getByLabelText('Amount (GBP)'), { target: { value: '1000.00' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Record the payment' }));
    expect(await within(form).findByText(/still owed on quote Q-2026-0007/)).toBeTruthy();
    expect(posted).toBe(1);
    const body = JSON.parse(String(net.calls.find((c) => c.init?.method === 'POST')!.init!.body));
    expect(body).toMatchObject({ method: 'bank-transfer', amount: '1000.00' });
  });

  it('records a part payment and shows the new balance the server answers with', async () => {
    const after: AccountDto = { ...ACCOUNT, figures: { ...ACCOUNT.figures, paid: '708.64', balance: '525.92' } };
    renderPanel({ '/api/accounts/quotes/7/payments': () => json(after, 201), '/api/accounts/quotes/7': () => json(ACCOUNT) });
    const form = await screen.findByRole('form', { name: 'Record a payment' });
    fireEvent.change(within(form).getByLabelText('How it was paid'), { target: { value: 'cash' } });
    fireEvent.change(within(form).getByLabelText('Amount (GBP)'), { target: { value: '400' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Record the payment' }));
    expect(await within(form).findByText(/£400.00 recorded/)).toBeTruthy();
    expect(screen.getByTestId('account-balance').textContent).toBe('£525.92');
  });
});

describe('the customer’s balance', () => {
  const TOKEN = 'abcdefghijklmnopqrstuvwxyz012345.abcdefghijklmnopqrstuv';
  const PUBLIC: PublicAccount = { currency: 'GBP', agreedTotal: '1234.56', paid: '708.64', credited: '100.00', balance: '425.92', canPay: true, cardPayments: true, checkoutOpen: false, documents: [{ id: 5, kind: 'invoice', number: 'INV-00002', issuedOn: '2026-12-02', total: '1234.56' }] };

  it('shows what is still owed in plain words, a pay button, and the invoice to download', async () => {
    const net = fakeFetch({ [`/api/public/quotes/${TOKEN}/account`]: () => json(PUBLIC) });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(
      <Routes>
        <Route path="/q/:token" element={<Balance token={TOKEN} returned={null} />} />
      </Routes>,
      { route: `/q/${TOKEN}` },
    );
    const box = await screen.findByTestId('public-balance');
    expect(within(box).getByTestId('balance-owed').textContent).toBe('£425.92');
    expect(within(box).getByRole('button', { name: 'Pay the balance of £425.92 by card' })).toBeTruthy();
    expect(within(box).getByRole('link', { name: /Tax invoice INV-00002/ }).getAttribute('href')).toBe(`/api/public/quotes/${TOKEN}/documents/5/pdf`);
    expect(box.textContent).not.toMatch(/margin|overhead|per hour|rate/i);
  });
});

describe('owed to us', () => {
  it('shows the total in each age bucket and the invoices owed, and sorts by the column asked for', async () => {
    const { OwedPage } = await import('../../src/features/accounts/routes/owed');
    const page = {
      rows: [
        { quoteId: 7, quoteNumber: 'Q-2026-0007', invoiceNumber: 'INV-00003', invoicedOn: '2026-09-01', ageDays: 92, bucket: '60+', customer: { id: 3, name: 'Perpetua Langstroth' }, currency: 'GBP', invoiced: '1234.56', balance: '525.92' },
        { quoteId: 8, quoteNumber: 'Q-2026-0008', invoiceNumber: 'INV-00009', invoicedOn: '2026-11-20', ageDays: 12, bucket: '0-30', customer: { id: 4, name: 'Isolde Marchbanks' }, currency: 'GBP', invoiced: '600.00', balance: '420.00' },
      ],
      total: 2,
      page: 1,
      pageSize: 25,
      buckets: [
        { bucket: '0-30', currency: 'GBP', count: 1, amount: '420.00' },
        { bucket: '60+', currency: 'GBP', count: 1, amount: '525.92' },
      ],
    };
    const net = fakeFetch({ '/api/accounts/owed': () => json(page), '/api/accounts/settings': () => json({ invoiceStage: 'finished', canChange: false }) });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(
      <Routes>
        <Route path="/accounts/owed" element={<OwedPage />} />
      </Routes>,
      { route: '/accounts/owed' },
    );
    const buckets = await screen.findByTestId('owed-buckets');
    await within(buckets).findByText('£420.00');
    expect(within(buckets).getByRole('button', { name: /over 60 days.*£525\.92/ })).toBeTruthy();
    expect(within(buckets).getByRole('button', { name: /31–60 days.*Nothing/ })).toBeTruthy();
    const table = screen.getByRole('table', { name: /Owed to us/ });
    expect(within(table).getByText('INV-00003')).toBeTruthy();
    expect(within(table).getByRole('link', { name: 'Open Q-2026-0007' }).getAttribute('href')).toBe('/accounts/quotes/7');
    fireEvent.click(within(table).getByRole('button', { name: /Owed/ }));
    await expect.poll(() => net.calls.some((c) => c.url.includes('sort=balance'))).toBe(true);
    expect(((await screen.findByLabelText('Invoices are issued')) as HTMLSelectElement).disabled).toBe(true);
  });

  it('sends a reminder from a row and says so; a refusal is shown in the row in words', async () => {
    const { OwedPage } = await import('../../src/features/accounts/routes/owed');
    const row = (quoteId: number, name: string, invoice: string) => ({ quoteId, quoteNumber: `Q-2026-000${quoteId}`, invoiceNumber: invoice, invoicedOn: '2026-11-20', ageDays: 12, bucket: '0-30', customer: { id: quoteId, name }, currency: 'GBP', invoiced: '600.00', balance: '420.00' });
    const page = { rows: [row(7, 'Perpetua Langstroth', 'INV-00003'), row(8, 'Isolde Marchbanks', 'INV-00009')], total: 2, page: 1, pageSize: 25, buckets: [{ bucket: '0-30', currency: 'GBP', count: 2, amount: '840.00' }] };
    const net = fakeFetch({
      '/api/auth/csrf': () => json({ csrfToken: 't' }),
      '/api/accounts/owed': () => json(page),
      '/api/accounts/settings': () => json({ invoiceStage: 'finished', canChange: false }),
      '/api/accounts/quotes/7/reminder': () => json({ outboxId: 51, to: 'perpetua@example.com', amount: '420.00', currency: 'GBP' }, 201),
      '/api/accounts/quotes/8/reminder': () =>
        json({ status: 409, code: 'already_reminded', title: 'Conflict', detail: 'The customer was already reminded of invoice INV-00009 today (message 50, sent).' }, 409, 'application/problem+json'),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(
      <Routes>
        <Route path="/accounts/owed" element={<OwedPage />} />
      </Routes>,
      { route: '/accounts/owed' },
    );
    const table = await screen.findByRole('table', { name: /Owed to us/ });
    fireEvent.click(await within(table).findByRole('button', { name: 'Send a reminder to Perpetua Langstroth for INV-00003' }));
    expect((await within(table).findByRole('status')).textContent).toBe('Reminder queued to perpetua@example.com');
    expect(net.calls.some((c) => c.url === '/api/accounts/quotes/7/reminder' && c.init?.method === 'POST')).toBe(true);
    fireEvent.click(within(table).getByRole('button', { name: 'Send a reminder to Isolde Marchbanks for INV-00009' }));
    expect((await within(table).findByRole('alert')).textContent).toMatch(/already reminded of invoice INV-00009 today/);
  });
});
