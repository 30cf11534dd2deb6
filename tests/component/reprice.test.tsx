import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { RepriceCandidates, RepriceRow } from '../../src/features/reprice/api/reprice';
import { RepriceNotice } from '../../src/features/reprice/components/reprice-notice';
import { totalChange } from '../../src/features/reprice/lib/change';
import { RepricePage } from '../../src/features/reprice/routes/reprice';
import { fakeFetch, json, renderWithApp, queriesSettled } from './render';

afterEach(() => vi.unstubAllGlobals());

const row = (id: number, number: string, customer: string, oldTotal: string, newTotal: string, state: RepriceRow['state'] = 'draft'): RepriceRow => ({
  id, number, title: `Repolish for ${customer}`, customer, state, catalogVersion: 'pl-0ld0ld0ld0ld', priceList: 'prices of 2 Nov 2026', oldTotal, newTotal, currency: 'GBP',
});

const ROWS: RepriceRow[] = [
  row(11, 'E-2027-0002', 'Halcyon Brightwater', '1840.00', '1912.35', 'priced'),
  row(12, 'E-2027-0005', 'Ottoline Fernsby', '655.50', '640.10'),
  row(13, 'E-2027-0007', 'Peregrine Ashcombe', '420.00', '420.00'),
];

/** The reprice endpoint: GET lists what is still on an older list, POST reprices and removes those rows. */
function repriceServer({ fail = false }: { fail?: boolean } = {}) {
  let rows = [...ROWS];
  const net = fakeFetch({
    '/api/auth/csrf': () => json({ csrfToken: 'tok' }),
    '/api/estimates/reprice': (init) => {
      if (init?.method !== 'POST') return json({ catalogVersion: 'pl-t0day0t0day', priceList: "today's prices (in use since 2 Dec 2026)", rows } satisfies RepriceCandidates);
      if (fail) return json({ type: 'x', title: 'Conflict', status: 409, code: 'estimate_closed', detail: 'Estimate E-2027-0005 is quoted: it can no longer be revised.' }, 409, 'application/problem+json');
      const { ids } = JSON.parse(String(init.body)) as { ids: number[] };
      const done = rows.filter((r) => ids.includes(r.id));
      rows = rows.filter((r) => !ids.includes(r.id));
      return json({ repriced: done.map((r) => ({ id: r.id, number: r.number, total: r.newTotal, revision: 2 })) });
    },
  });
  vi.stubGlobal('fetch', net.fn);
  return net;
}

const posts = (net: ReturnType<typeof fakeFetch>) => net.calls.filter((c) => c.url === '/api/estimates/reprice' && c.init?.method === 'POST');

describe('totalChange', () => {
  it('works in decimals, with a direction and a percent of the old total', () => {
    expect(totalChange('1840.00', '1912.35')).toEqual({ amount: '72.35', pct: '3.9', direction: 'up' });
    expect(totalChange('655.50', '640.10')).toEqual({ amount: '-15.40', pct: '-2.3', direction: 'down' });
    expect(totalChange('420.00', '420.004')).toEqual({ amount: '0.00', pct: '0.0', direction: 'same' });
    expect(totalChange('0', '12.00')).toEqual({ amount: '12.00', pct: null, direction: 'up' });
  });
});

describe('RepricePage', () => {
  it('lists the estimates on an older price list with old and new totals and the change in words', async () => {
    repriceServer();
    renderWithApp(<RepricePage />);
    const table = await screen.findByRole('table', { name: 'Open estimates on an older price list' });
    const first = within(table).getByRole('row', { name: /E-2027-0002/ });
    expect(within(first).getByTestId('old-total').textContent).toBe('£1,840.00');
    expect(within(first).getByTestId('new-total').textContent).toBe('£1,912.35');
    expect(first.textContent).toMatch(/up\+£72\.35\+3\.9 %/);
    expect(within(table).getByRole('row', { name: /E-2027-0005/ }).textContent).toMatch(/down−£15\.40−2\.3 %/);
    expect(within(table).getByRole('row', { name: /E-2027-0007/ }).textContent).toMatch(/no change/);
    expect(screen.getByText(/3 open estimates use older prices/)).toBeTruthy();
    expect(within(first).getByRole('link', { name: 'E-2027-0002' }).getAttribute('href')).toBe('/estimates/11');
  });

  it('selects some or all, asks for confirmation, reprices the chosen ones and sums up the result', async () => {
    const net = repriceServer();
    renderWithApp(<RepricePage />);
    const button = await screen.findByRole('button', { name: /^Reprice selected/ });
    expect((button as HTMLButtonElement).disabled).toBe(true);

    const all = screen.getByRole('checkbox', { name: 'Select every estimate' }) as HTMLInputElement;
    fireEvent.click(all);
    expect(screen.getByRole('button', { name: 'Reprice selected (3)' })).toBeTruthy();
    fireEvent.click(screen.getByRole('checkbox', { name: 'Select E-2027-0007, Peregrine Ashcombe' }));
    expect(all.checked).toBe(false);
    expect(all.indeterminate).toBe(true);
    expect(screen.getByText(/2 estimates selected/).parentElement!.textContent).toMatch(/£2,495\.50.*£2,552\.45.*up\+£56\.95\+2\.3 %/);

    // Cancel changes nothing.
    fireEvent.click(screen.getByRole('button', { name: 'Reprice selected (2)' }));
    let dialog = screen.getByRole('dialog', { name: 'Reprice 2 estimates?' });
    expect(within(dialog).getByText(/revisions already saved stay exactly as they are/)).toBeTruthy();
    fireEvent.click(within(dialog).getByRole('button', { name: 'Cancel' }));
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(posts(net)).toHaveLength(0);

    fireEvent.click(screen.getByRole('button', { name: 'Reprice selected (2)' }));
    dialog = screen.getByRole('dialog', { name: 'Reprice 2 estimates?' });
    expect(within(dialog).getAllByRole('listitem').map((li) => li.textContent)).toEqual([
      'E-2027-0002 · Halcyon Brightwater£1,840.00£1,912.35',
      'E-2027-0005 · Ottoline Fernsby£655.50£640.10',
    ]);
    fireEvent.click(within(dialog).getByRole('button', { name: 'Reprice 2 estimates' }));

    const result = await screen.findByRole('heading', { name: '2 estimates repriced' });
    await waitFor(() => expect(document.activeElement).toBe(result));
    expect(screen.queryByRole('dialog')).toBeNull();
    const call = posts(net)[0]!;
    expect(JSON.parse(String(call.init?.body))).toEqual({ ids: [11, 12] });
    expect(new Headers(call.init?.headers).get('x-csrf-token')).toBe('tok');

    const done = screen.getByRole('list', { name: 'Repriced estimates' });
    const item = within(done).getByTestId('repriced-E-2027-0002');
    expect(item.textContent).toMatch(/Revision 2 saved.*£1,840\.00.*£1,912\.35/);
    expect(within(item).getByRole('link', { name: 'Open E-2027-0002' }).getAttribute('href')).toBe('/estimates/11');
    expect(within(item).getByRole('link', { name: /Compare 1 and 2/ }).getAttribute('href')).toBe('/estimates/11/compare?a=1&b=2');

    // The list is asked again: only the estimate left alone remains, and nothing stays selected.
    await waitFor(() => expect(screen.queryByRole('row', { name: /E-2027-0002/ })).toBeNull());
    expect(screen.getByRole('row', { name: /E-2027-0007/ })).toBeTruthy();
    expect((screen.getByRole('button', { name: /^Reprice selected/ }) as HTMLButtonElement).disabled).toBe(true);
  });

  it("shows the server's reason when repricing stops, and reloads the list", async () => {
    const net = repriceServer({ fail: true });
    renderWithApp(<RepricePage />);
    fireEvent.click(await screen.findByRole('checkbox', { name: 'Select E-2027-0005, Ottoline Fernsby' }));
    fireEvent.click(screen.getByRole('button', { name: 'Reprice selected (1)' }));
    fireEvent.click(within(screen.getByRole('dialog', { name: 'Reprice 1 estimate?' })).getByRole('button', { name: 'Reprice 1 estimate' }));
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toMatch(/Repricing stopped.*E-2027-0005 is quoted/);
    await waitFor(() => expect(net.calls.filter((c) => c.url === '/api/estimates/reprice' && c.init?.method !== 'POST').length).toBeGreaterThan(1));
  });

  it('says so when every open estimate is on today’s prices', async () => {
    vi.stubGlobal('fetch', fakeFetch({ '/api/estimates/reprice': () => json({ catalogVersion: 'pl-t0day0t0day', priceList: "today's prices", rows: [] }) }).fn);
    renderWithApp(<RepricePage />);
    expect(await screen.findByText(/Every open estimate uses today's prices/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: /^Reprice selected/ })).toBeNull();
  });
});

describe('RepriceNotice', () => {
  it('counts the open estimates on older prices and links to repricing', async () => {
    repriceServer();
    renderWithApp(<RepriceNotice />);
    const status = await screen.findByRole('status');
    expect(status.textContent).toMatch(/3 open estimates use older prices — review repricing/);
    expect(within(status).getByRole('link', { name: 'review repricing' }).getAttribute('href')).toBe('/price-list/reprice');
  });

  it('shows nothing when no open estimate is out of date', async () => {
    const net = fakeFetch({ '/api/estimates/reprice': () => json({ catalogVersion: 'pl-t0day0t0day', priceList: "today's prices", rows: [] }) });
    vi.stubGlobal('fetch', net.fn);
    const { container, queryClient } = renderWithApp(<RepriceNotice />);
    // Not a wait for time to pass: the answer has arrived and been rendered, and the notice is still empty.
    await waitFor(() => expect(queriesSettled(queryClient)).toBe(true));
    expect(net.calls).toHaveLength(1);
    expect(container.textContent).toBe('');
  });
});
