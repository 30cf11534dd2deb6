import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { SignInPage } from '../../src/features/auth/routes/sign-in';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const signedOut = () => json({ user: null });

describe('SignInPage', () => {
  it('names the empty fields without calling the server', async () => {
    const net = fakeFetch({ '/api/auth/session': signedOut });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<SignInPage />, { route: '/signin' });
    fireEvent.click(await screen.findByRole('button', { name: 'Sign in' }));
    expect(await screen.findAllByText('is required')).toHaveLength(2);
    expect(net.calls.some((c) => c.url.includes('/login'))).toBe(false);
  });

  it("shows the server's message when the password is wrong", async () => {
    const net = fakeFetch({
      '/api/auth/session': signedOut,
      '/api/auth/csrf': () => json({ csrfToken: 'abc' }),
      '/api/auth/login': () =>
        json({ status: 401, code: 'invalid_credentials', title: 'Sign-in failed', detail: 'That e-mail and password do not match an active account.' }, 401, 'application/problem+json'),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<SignInPage />, { route: '/signin' });
    fireEvent.change(await screen.findByLabelText('E-mail'), { target: { value: 'owner@example.com' } });
    fireEvent.change(screen.getByLabelText('Password'), { target: { value: 'wrong' } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await waitFor(() => expect(screen.getByText(/do not match an active account/)).toBeTruthy());
    const login = net.calls.find((c) => c.url.includes('/login'))!;
    expect(new Headers(login.init?.headers).get('x-csrf-token')).toBe('abc');
  });
});
