import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { PackDto } from '../../shared/schemas/price-list';
import { AddMaterialDialog } from '../../src/features/price-list/components/material-dialogs';
import { PackPrice } from '../../src/features/price-list/components/price-editor';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const problem = (body: object, status = 400) => json({ type: 'x', title: 'Invalid input', status, ...body }, status, 'application/problem+json');

describe('AddMaterialDialog', () => {
  it('names every empty or malformed field from the shared schema without calling the server', async () => {
    const net = fakeFetch({});
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<AddMaterialDialog open onClose={() => {}} currency="GBP" />);
    fireEvent.change(screen.getByLabelText('Price (GBP, before tax)'), { target: { value: '12.5.0' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add material' }));
    expect(await screen.findByText('is required')).toBeTruthy();
    expect(screen.getByText(/must be an amount like 12.50/)).toBeTruthy();
    expect(screen.getByText('must be more than zero')).toBeTruthy();
    expect(screen.getByLabelText('Name').getAttribute('aria-invalid')).toBe('true');
    expect(net.calls).toHaveLength(0);
  });

  it("sends a decimal comma as typed and shows the server's message on the field it names", async () => {
    const net = fakeFetch({
      '/api/auth/csrf': () => json({ csrfToken: 'tok' }),
      '/api/price-list/materials': () => problem({ code: 'key_taken', detail: 'key is taken', field: 'pack.supplierCode', errors: [{ field: 'pack.supplierCode', message: 'is already used by another pack' }] }),
    });
    vi.stubGlobal('fetch', net.fn);
    const onClose = vi.fn();
    renderWithApp(<AddMaterialDialog open onClose={onClose} currency="EUR" />);
    fireEvent.change(screen.getByLabelText('Name'), { target: { value: 'Garnet shellac' } });
    fireEvent.change(screen.getByLabelText('Pack size (g)'), { target: { value: '250' } });
    fireEvent.change(screen.getByLabelText('Price (EUR, before tax)'), { target: { value: '13,10' } });
    fireEvent.change(screen.getByLabelText('Supplier code'), { target: { value: 'QFS-GARNET' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add material' }));
    expect(await screen.findByText('is already used by another pack')).toBeTruthy();
    const call = net.calls.find((c) => c.url === '/api/price-list/materials')!;
    const body = JSON.parse(String(call.init?.body));
    expect(body).toMatchObject({ name: 'Garnet shellac', kind: 'shellac', unit: 'g', pack: { size: 250, price: '13,10', supplierCode: 'QFS-GARNET' } });
    expect(new Headers(call.init?.headers).get('x-csrf-token')).toBe('tok');
    expect(onClose).not.toHaveBeenCalled();
  });
});

describe('PackPrice (in-place new price)', () => {
  const pack: PackDto = {
    id: 7, size: '250', label: '', supplier: 'Quillby Finishing Supplies', supplierCode: 'PUMICE-250', archived: false,
    price: '5.60', priceFrom: '2026-09-01', previousPrice: '5.15', changePct: '8.7', nextPrice: null, nextFrom: null,
  };

  it('shows the price with its currency and the change with an arrow word, and saves a new price from a date', async () => {
    const net = fakeFetch({
      '/api/auth/csrf': () => json({ csrfToken: 'tok' }),
      '/api/price-list/packs/7/prices': () => json({ material: {}, catalogVersion: { from: 'a', to: 'b', changed: true } }, 201),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<PackPrice pack={pack} unit="g" currency="GBP" canEdit materialName="Pumice" />);
    expect(screen.getByTestId('price-PUMICE-250').textContent).toBe('£5.60');
    expect(screen.getByText('up')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'New price for Pumice, 250 g' }));
    fireEvent.change(screen.getByRole('textbox', { name: 'New price for Pumice, 250 g' }), { target: { value: 'abc' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save price for Pumice, 250 g' }));
    expect(await screen.findByText(/Price must be an amount/)).toBeTruthy();
    fireEvent.change(screen.getByRole('textbox', { name: 'New price for Pumice, 250 g' }), { target: { value: '6,10' } });
    fireEvent.change(screen.getByLabelText('Price effective from, Pumice, 250 g'), { target: { value: '2027-01-04' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save price for Pumice, 250 g' }));
    await waitFor(() => expect(net.calls.some((c) => c.url === '/api/price-list/packs/7/prices')).toBe(true));
    const call = net.calls.find((c) => c.url === '/api/price-list/packs/7/prices')!;
    expect(JSON.parse(String(call.init?.body))).toEqual({ price: '6.10', effectiveFrom: '2027-01-04' });
  });

  it('offers no editing to a reader', () => {
    vi.stubGlobal('fetch', fakeFetch({}).fn);
    renderWithApp(<PackPrice pack={pack} unit="g" currency="GBP" canEdit={false} materialName="Pumice" />);
    expect(screen.queryByRole('button')).toBeNull();
  });
});
