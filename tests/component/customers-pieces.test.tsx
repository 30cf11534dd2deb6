import { fireEvent, screen, waitFor } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { CustomersPage } from '../../src/features/customers/routes/customers';
import { CustomerFormDialog } from '../../src/features/customers/components/customer-form-dialog';
import { PiecePage } from '../../src/features/pieces/routes/piece';
import { checkFiles } from '../../src/features/pieces/components/photo-gallery';
import { ME, PIECE, SETTINGS } from './estimates-fixtures';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const customer = { id: 3, name: 'Hester Quillfeather', email: 'hester@example.com', phone: null, address: null, notes: null, pieceCount: 1, estimateCount: 2, archived: false, createdAt: '2026-01-01T00:00:00Z', updatedAt: '2026-01-02T00:00:00Z' };

describe('CustomersPage', () => {
  it('searches, sorts and pages on the server', async () => {
    const net = fakeFetch({
      '/api/auth/session': () => json(ME),
      '/api/customers': () => json({ rows: [customer], total: 10_000, page: 1, pageSize: 25 }),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<CustomersPage />, { route: '/customers' });
    expect(await screen.findByRole('link', { name: 'Hester Quillfeather' })).toBeTruthy();
    expect(screen.getByText('1–25 of 10000')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Next page' }));
    await waitFor(() => expect(net.calls.some((c) => c.url.includes('page=2'))).toBe(true));
    fireEvent.change(screen.getByLabelText(/Search customers/), { target: { value: 'quill' } });
    fireEvent.submit(screen.getByRole('search'));
    await waitFor(() => expect(net.calls.some((c) => c.url.includes('q=quill'))).toBe(true));
    expect(screen.getByRole('button', { name: /Add customer/ })).toBeTruthy();
  });
});

describe('CustomerFormDialog', () => {
  it('checks with the shared schema first, then shows the server’s field message', async () => {
    const net = fakeFetch({
      '/api/auth/csrf': () => json({ csrfToken: 't' }),
      '/api/customers': () => json({ status: 400, code: 'invalid', title: 'Invalid', errors: [{ field: 'email', message: 'is already used by another customer' }] }, 400, 'application/problem+json'),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<CustomerFormDialog open onClose={() => {}} />);
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: 'not an address' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add customer' }));
    expect(await screen.findByText('is required')).toBeTruthy();
    expect(screen.getByText('must be an e-mail address')).toBeTruthy();
    expect(net.calls.length).toBe(0);
    fireEvent.change(screen.getByLabelText('Name'), { target: { value: 'Hester Quillfeather' } });
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: 'hester@example.com' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add customer' }));
    expect(await screen.findByText('is already used by another customer')).toBeTruthy();
  });
});

describe('PiecePage', () => {
  it('reads sizes with units and names a bad one beside its field', async () => {
    const net = fakeFetch({
      '/api/auth/session': () => json(ME),
      '/api/workshop': () => json({ id: 1, name: 'Workshop', email: null, phone: null, address: null, settings: SETTINGS }),
      '/api/pieces/7': () => json(PIECE),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(
      <Routes>
        <Route path="/pieces/:pieceId" element={<PiecePage />} />
      </Routes>,
      { route: '/pieces/7' },
    );
    const length = await screen.findByLabelText('Length');
    expect(screen.getByText('1900 mm · 74.8 in')).toBeTruthy();
    fireEvent.change(length, { target: { value: 'six foot' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save details' }));
    expect((await screen.findByRole('alert')).textContent).toMatch(/Cannot read "six foot" as a length/);
    expect(net.calls.some((c) => c.init?.method === 'PATCH')).toBe(false);
    expect(screen.getByRole('link', { name: /New estimate/ }).getAttribute('href')).toBe('/estimates/new?pieceId=7');
    expect(screen.getByText(/Drop condition photos here/)).toBeTruthy();
  });

  it('leaves out files the server would refuse', () => {
    const ok = new File(['x'], 'lid.jpg', { type: 'image/jpeg' });
    const pdf = new File(['x'], 'notes.pdf', { type: 'application/pdf' });
    const { ok: kept, problems } = checkFiles([ok, pdf], 0);
    expect(kept).toEqual([ok]);
    expect(problems[0]).toMatch(/notes\.pdf: not a JPEG, PNG or WebP/);
    expect(checkFiles([ok], 12).problems[0]).toMatch(/at most 12/);
  });
});
