import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { SignupPage } from '../../src/features/signup/routes/signup';
import { FirstRunChecklist } from '../../src/features/home/components/first-run-checklist';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

/** The message under a field, found from its label. */
function errorOf(label: string): string | null {
  const input = screen.getByLabelText(label);
  const el = document.getElementById(`${input.id}-error`);
  return input.getAttribute('aria-invalid') === 'true' && el ? el.textContent : null;
}

function fill(label: string, value: string) {
  fireEvent.change(screen.getByLabelText(label), { target: { value } });
}

function fillValid() {
  fill('Workshop name', 'Hollowmere Polishing');
  fill('Country', 'FR');
  fill('Tax rate (%)', '20');
  fill('Your name', 'Odile Marchetant');
  fill('E-mail', 'odile@hollowmere.example');
  fill('Password', 'a long sign-up password');
  fill('The same password again', 'a long sign-up password');
}

describe('SignupPage', () => {
  it('names every field that is wrong without calling the server', async () => {
    const net = fakeFetch({});
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<SignupPage />, { route: '/signup' });
    fill('E-mail', 'not an address');
    fill('Password', 'short');
    fill('The same password again', 'other');
    fill('Tax rate (%)', '150');
    fireEvent.click(screen.getByRole('button', { name: 'Sign up the workshop' }));
    await waitFor(() => expect(errorOf('Workshop name')).toMatch(/is required/));
    expect(errorOf('Country')).toMatch(/country/);
    expect(errorOf('Currency')).toMatch(/currency/);
    expect(errorOf('Tax rate (%)')).toMatch(/at most 100/);
    expect(errorOf('Your name')).toMatch(/is required/);
    expect(errorOf('E-mail')).toMatch(/e-mail address/);
    expect(errorOf('Password')).toMatch(/at least 10/);
    expect(errorOf('The same password again')).toMatch(/same password/);
    expect(screen.getByText(/things to put right/)).toBeTruthy();
    expect(net.calls.some((c) => c.url.includes('/api/signup'))).toBe(false);
  });

  it('suggests the currency, tax and measures from the country, sends the form, and says where the link went', async () => {
    let sent: Record<string, unknown> | undefined;
    const net = fakeFetch({
      '/api/auth/csrf': () => json({ csrfToken: 'abc' }),
      '/api/signup': (init) => {
        sent = JSON.parse(String(init?.body));
        return json({ email: 'odile@hollowmere.example', message: 'We have sent a link to odile@hollowmere.example.' }, 201);
      },
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<SignupPage />, { route: '/signup' });
    fillValid();
    expect((screen.getByLabelText('Currency') as HTMLSelectElement).value).toBe('EUR');
    fill('Country', 'US');
    expect((screen.getByLabelText('Currency') as HTMLSelectElement).value).toBe('USD');
    expect((screen.getByLabelText('Name of the tax') as HTMLInputElement).value).toBe('Sales tax');
    expect((screen.getByLabelText('Measures') as HTMLSelectElement).value).toBe('imperial');
    fill('Tax rate (%)', '7,25');
    fireEvent.click(screen.getByRole('button', { name: 'Sign up the workshop' }));
    await screen.findByText('Confirmation link sent');
    expect(sent).toMatchObject({ workshopName: 'Hollowmere Polishing', country: 'US', currency: 'USD', taxPct: 7.25, units: 'imperial', pricesIncludeTax: false, email: 'odile@hollowmere.example' });
    expect(sent).not.toHaveProperty('repeat');
    expect(screen.getByText(/We have sent a link/)).toBeTruthy();
  });

  it("shows the server's word on a field: an address that already has an account", async () => {
    const net = fakeFetch({
      '/api/auth/csrf': () => json({ csrfToken: 'abc' }),
      '/api/signup': () =>
        json(
          { status: 409, code: 'email_taken', title: 'Address already in use', detail: 'The e-mail already has an account here.', field: 'email', errors: [{ field: 'email', message: 'already has an account here: sign in' }] },
          409,
          'application/problem+json',
        ),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<SignupPage />, { route: '/signup' });
    fillValid();
    fireEvent.click(screen.getByRole('button', { name: 'Sign up the workshop' }));
    await waitFor(() => expect(errorOf('E-mail')).toMatch(/already has an account/));
  });
});

describe('FirstRunChecklist', () => {
  const item = (key: string, label: string, done: boolean) => ({ key, label, detail: `${label} detail`, done, link: '/settings' });

  it('lists what is left with links, and nothing once all is done', async () => {
    const net = fakeFetch({
      '/api/workshop/checklist': () => json({ items: [item('prices', 'Enter what you pay for materials', false), item('labourRates', 'Set your labour rates', true)], allDone: false, dismissed: false }),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<FirstRunChecklist />);
    expect(await screen.findByRole('link', { name: 'Enter what you pay for materials' })).toBeTruthy();
    expect(screen.queryByRole('link', { name: 'Set your labour rates' })).toBeNull();
    expect(screen.getByText('One thing left', { exact: false })).toBeTruthy();

    vi.stubGlobal('fetch', fakeFetch({ '/api/workshop/checklist': () => json({ items: [item('prices', 'Prices', true)], allDone: true, dismissed: false }) }).fn);
    const done = renderWithApp(<FirstRunChecklist />);
    await waitFor(() => expect(done.queryClient.getQueryData(['workshop-checklist'])).toBeTruthy());
    expect(done.container.querySelector('[data-testid="first-run-checklist"]')).toBeNull();
  });
});
