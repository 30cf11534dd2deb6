import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ESTIMATE_STATES, ESTIMATE_STATE_LABELS } from '../../shared/schemas/estimates';
import { CompareRevisionsPage } from '../../src/features/estimates/routes/compare';
import { EditEstimatePage } from '../../src/features/estimates/routes/edit-estimate';
import { EstimatePage } from '../../src/app/routes/estimate';
import { EstimatesPage } from '../../src/app/routes/estimates';
import { StateBadge } from '../../src/components/estimate-state-badge';
import { CALC, detail, GRAND_INPUT, ME, revision } from './estimates-fixtures';
import { fakeFetch, json, renderWithApp } from './render';

beforeEach(() => window.localStorage.clear());
afterEach(() => vi.unstubAllGlobals());

const rev1 = revision(1, GRAND_INPUT);
const rev2 = revision(2, { ...GRAND_INPUT, piece: { template: 'grand', dimensions: { length: '200 cm' }, species: 'rosewood', veneered: true } });
const problem = (status: number, code: string, detail: string) => json({ status, code, title: 'Conflict', detail }, status, 'application/problem+json');

describe('StateBadge', () => {
  it('shows every state as a word with an icon, never colour alone', () => {
    for (const state of ESTIMATE_STATES) {
      const { container, unmount } = renderWithApp(<StateBadge state={state} />);
      expect(container.textContent).toBe(ESTIMATE_STATE_LABELS[state]);
      expect(container.querySelector('svg')).toBeTruthy();
      unmount();
    }
  });
});

describe('EstimatePage', () => {
  it("shows the server's figures, the cautions, the revisions and the estimator's actions", async () => {
    const net = fakeFetch({
      '/api/auth/session': () => json(ME),
      '/api/calc/catalog': () => json(CALC),
      '/api/estimates/1': () => json(detail([rev1, rev2])),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(
      <Routes>
        <Route path="/estimates/:estimateId" element={<EstimatePage />} />
      </Routes>,
      { route: '/estimates/1' },
    );
    expect(await screen.findByText('Estimate E-0001')).toBeTruthy();
    expect(screen.getByTestId('total-price').textContent).toMatch(/^£[\d,]+\.\d{2}$/);
    expect(screen.getByRole('heading', { name: 'Safety cautions' })).toBeTruthy();
    expect(screen.getByTestId('revision-1')).toBeTruthy();
    expect(screen.getByTestId('revision-2').textContent).toMatch(/current/);
    expect(screen.getByRole('button', { name: 'Compare 1 and 2' })).toBeTruthy();
    expect(screen.getByRole('button', { name: /Mark as priced/ })).toBeTruthy();
    expect(screen.getByRole('button', { name: /Revise/ })).toBeTruthy();
  });

  it('hides what sales may not do', async () => {
    vi.stubGlobal('fetch', fakeFetch({
      '/api/auth/session': () => json({ user: { ...ME.user, role: 'sales' } }),
      '/api/calc/catalog': () => json(CALC),
      '/api/estimates/1': () => json(detail([rev1])),
    }).fn);
    renderWithApp(
      <Routes>
        <Route path="/estimates/:estimateId" element={<EstimatePage />} />
      </Routes>,
      { route: '/estimates/1' },
    );
    expect(await screen.findByText('Estimate E-0001')).toBeTruthy();
    expect(screen.getByTestId('total-price')).toBeTruthy();
    expect(screen.queryByRole('button', { name: /Revise/ })).toBeNull();
    expect(screen.queryByRole('button', { name: /Mark as priced/ })).toBeNull();
    expect(screen.queryByRole('button', { name: /Duplicate/ })).toBeNull();
  });
});

describe('EditEstimatePage', () => {
  it('keeps the edits when someone else saved first, and saves on top of the latest revision', async () => {
    let current = detail([rev1]);
    const posts: unknown[] = [];
    const net = fakeFetch({
      '/api/auth/session': () => json(ME),
      '/api/auth/csrf': () => json({ csrfToken: 't' }),
      '/api/calc/catalog': () => json(CALC),
      '/api/estimates/1/revisions': (init) => {
        posts.push(JSON.parse(String(init?.body)));
        if (posts.length === 1) return problem(409, 'stale_revision', 'Revision 2 was saved after revision 1.');
        return json(detail([rev1, rev2, revision(3, GRAND_INPUT)]), 201);
      },
      '/api/estimates/1': () => json(current),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(
      <Routes>
        <Route path="/estimates/:estimateId/edit" element={<EditEstimatePage />} />
        <Route path="/estimates/:estimateId" element={<p>estimate page</p>} />
      </Routes>,
      { route: '/estimates/1/edit' },
    );
    const length = await screen.findByLabelText('Length');
    fireEvent.change(length, { target: { value: '205 cm' } });
    fireEvent.click(screen.getByRole('button', { name: /Save as revision 2/ }));
    expect(await screen.findByText('Someone saved this estimate while you were editing')).toBeTruthy();
    expect((screen.getByLabelText('Length') as HTMLInputElement).value).toBe('205 cm');
    expect(posts[0]).toMatchObject({ baseRevision: 1, input: { piece: { dimensions: { length: '205 cm' } } } });

    current = detail([rev1, rev2]);
    fireEvent.click(screen.getByRole('button', { name: /Load the latest revision and keep my changes/ }));
    expect(await screen.findByText('Now based on revision 2')).toBeTruthy();
    expect((screen.getByLabelText('Length') as HTMLInputElement).value).toBe('205 cm');
    fireEvent.click(screen.getByRole('button', { name: /Save as revision 3/ }));
    expect(await screen.findByText('estimate page')).toBeTruthy();
    expect(posts[1]).toMatchObject({ baseRevision: 2, input: { piece: { dimensions: { length: '205 cm' } } } });
  }, 30_000);
});

describe('CompareRevisionsPage', () => {
  it('shows what changed in the inputs, hours, materials and price', async () => {
    vi.stubGlobal('fetch', fakeFetch({
      '/api/auth/session': () => json(ME),
      '/api/calc/catalog': () => json(CALC),
      '/api/estimates/1/revisions/1': () => json(rev1),
      '/api/estimates/1/revisions/2': () => json(rev2),
      '/api/estimates/1': () => json(detail([rev1, rev2])),
    }).fn);
    renderWithApp(
      <Routes>
        <Route path="/estimates/:estimateId/compare" element={<CompareRevisionsPage />} />
      </Routes>,
      { route: '/estimates/1/compare?a=1&b=2' },
    );
    const change = await screen.findByTestId('input-change-piece.dimensions.length');
    expect(change.textContent).toMatch(/190 cm.*200 cm/);
    expect(within(screen.getByTestId('figure-labourHours')).getByText(/^\d+(\.\d)? h$/, { selector: 'span' })).toBeTruthy();
    expect(screen.getByTestId('figure-labourHours').textContent).toMatch(/up/);
    expect(screen.getByTestId('price-change-total').textContent).toMatch(/£/);
    expect(screen.getByRole('heading', { name: 'Safety cautions' })).toBeTruthy();
  });
});

describe('EstimatesPage', () => {
  it('asks the server to search, filter and sort, and shows each row with units', async () => {
    const summary = { ...detail([rev1]), revisions: undefined, current: undefined };
    const net = fakeFetch({
      '/api/auth/session': () => json(ME),
      '/api/estimates': () => json({ rows: [summary], total: 1, page: 1, pageSize: 25 }),
      '/api/customers': () => json({ rows: [], total: 0, page: 1, pageSize: 8 }),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<EstimatesPage />, { route: '/estimates' });
    expect(await screen.findByRole('link', { name: 'E-0001' })).toBeTruthy();
    expect(screen.getByRole('cell', { name: /^\d+(\.\d)? h$/ })).toBeTruthy();
    fireEvent.change(screen.getByLabelText('State'), { target: { value: 'priced' } });
    await waitFor(() => expect(net.calls.some((c) => c.url.includes('state=priced'))).toBe(true));
    fireEvent.click(within(screen.getByRole('columnheader', { name: /Total/ })).getByRole('button'));
    await waitFor(() => expect(net.calls.some((c) => c.url.includes('sort=total') && c.url.includes('dir=asc'))).toBe(true));
    fireEvent.change(screen.getByLabelText('Search'), { target: { value: 'rosewood' } });
    fireEvent.submit(screen.getByRole('search'));
    await waitFor(() => expect(net.calls.some((c) => c.url.includes('q=rosewood'))).toBe(true));
  });
});
