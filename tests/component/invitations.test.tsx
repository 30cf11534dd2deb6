/**
 * The owner's "Invite someone" form and the invited person's page: both validate in the browser first and name what is
 * wrong, then show the server's word for a field (an address that already has an account); accepting lands signed in.
 */
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { InviteForm } from '../../src/features/users/components/invite-form';
import { InvitePage } from '../../src/features/invite/routes/invite';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const TOKEN = 'k'.repeat(43);
const problem = (status: number, code: string, detail: string, field?: string) =>
  json({ status, code, title: 'Problem', detail, ...(field ? { field, errors: [{ field, message: 'already has an account' }] } : {}) }, status, 'application/problem+json');

const invitation = (over: Record<string, unknown> = {}) => ({
  id: 7,
  email: 'new.polisher@example.com',
  role: 'workshop',
  state: 'pending',
  expiresAt: '2026-12-09T10:00:00.000Z',
  invitedBy: 'Owner',
  sendCount: 1,
  lastSentAt: '2026-12-02T10:00:00.000Z',
  acceptedAt: null,
  revokedAt: null,
  createdAt: '2026-12-02T10:00:00.000Z',
  delivered: true,
  ...over,
});

describe('InviteForm', () => {
  it('names a missing or malformed address without calling the server', async () => {
    const net = fakeFetch({});
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<InviteForm />);
    fireEvent.click(screen.getByRole('button', { name: /Send invitation/ }));
    expect(await screen.findByText('is required')).toBeTruthy();
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: 'not an address' } });
    fireEvent.click(screen.getByRole('button', { name: /Send invitation/ }));
    expect(await screen.findByText('must be an e-mail address')).toBeTruthy();
    expect(net.calls.some((c) => c.url.includes('/api/invitations'))).toBe(false);
  });

  it('sends the address and role, then says it went', async () => {
    const net = fakeFetch({
      '/api/auth/csrf': () => json({ csrfToken: 'tok' }),
      '/api/invitations': () => json(invitation(), 201),
    });
    vi.stubGlobal('fetch', net.fn);
    renderWithApp(<InviteForm />);
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: ' New.Polisher@Example.com ' } });
    fireEvent.change(screen.getByLabelText('Role'), { target: { value: 'workshop' } });
    expect(screen.getByText(/Workshop planner: Jobs from accepted quotes/)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: /Send invitation/ }));
    expect(await screen.findByText(/new.polisher@example.com has a link to join/)).toBeTruthy();
    const post = net.calls.find((c) => c.url === '/api/invitations' && c.init?.method === 'POST')!;
    expect(JSON.parse(String(post.init!.body))).toEqual({ email: 'new.polisher@example.com', role: 'workshop' });
    expect((screen.getByLabelText('E-mail') as HTMLInputElement).value).toBe('');
  });

  it("shows the server's message under the field when the address already has an account", async () => {
    vi.stubGlobal(
      'fetch',
      fakeFetch({
        '/api/auth/csrf': () => json({ csrfToken: 'tok' }),
        '/api/invitations': () => problem(409, 'email_has_account', 'taken@example.com already has an account.', 'email'),
      }).fn,
    );
    renderWithApp(<InviteForm />);
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: 'taken@example.com' } });
    fireEvent.click(screen.getByRole('button', { name: /Send invitation/ }));
    expect(await screen.findByText('already has an account')).toBeTruthy();
    expect(screen.getByLabelText('E-mail').getAttribute('aria-invalid')).toBe('true');
  });

  it('warns when the invitation was saved but the e-mail did not go', async () => {
    vi.stubGlobal(
      'fetch',
      fakeFetch({ '/api/auth/csrf': () => json({ csrfToken: 'tok' }), '/api/invitations': () => json(invitation({ delivered: false }), 201) }).fn,
    );
    renderWithApp(<InviteForm />);
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: 'new.polisher@example.com' } });
    fireEvent.click(screen.getByRole('button', { name: /Send invitation/ }));
    expect(await screen.findByText(/Use Resend below to try again/)).toBeTruthy();
  });
});

function renderInvite(token = TOKEN) {
  return renderWithApp(
    <Routes>
      <Route path="/invite/:token" element={<InvitePage />} />
      <Route path="/" element={<p>Home page</p>} />
    </Routes>,
    { route: `/invite/${token}` },
  );
}

const pending = () => json({ workshopName: 'Hollowmere Polishing', email: 'new.polisher@example.com', role: 'workshop', state: 'pending', expiresAt: '2026-12-09T10:00:00.000Z' });

describe('InvitePage', () => {
  it('shows the workshop, the role and the address; names what is wrong before sending', async () => {
    const net = fakeFetch({ [`/api/public/invitations/${TOKEN}`]: pending });
    vi.stubGlobal('fetch', net.fn);
    renderInvite();
    expect(await screen.findByRole('heading', { name: 'Join Hollowmere Polishing' })).toBeTruthy();
    expect(screen.getByText('Workshop planner')).toBeTruthy();
    expect(screen.getByText('new.polisher@example.com')).toBeTruthy();
    expect(screen.getByText(/works until 9 December 2026/)).toBeTruthy();
    fireEvent.change(screen.getByLabelText('Choose a password'), { target: { value: 'short' } });
    fireEvent.click(screen.getByRole('button', { name: /Accept and sign in/ }));
    expect(await screen.findByText('is required')).toBeTruthy();
    expect(screen.getByText('must be at least 10 characters')).toBeTruthy();
    fireEvent.change(screen.getByLabelText('Your name'), { target: { value: 'Noor Lathe' } });
    fireEvent.change(screen.getByLabelText('Choose a password'), { target: { value: 'a long enough password' } });
    fireEvent.change(screen.getByLabelText('The same password again'), { target: { value: 'a different password' } });
    fireEvent.click(screen.getByRole('button', { name: /Accept and sign in/ }));
    expect(await screen.findByText('must be the same password again')).toBeTruthy();
    expect(net.calls.some((c) => c.url.endsWith('/accept'))).toBe(false);
  });

  it('accepts with the name and password and lands signed in on the home page', async () => {
    const net = fakeFetch({
      [`/api/public/invitations/${TOKEN}/accept`]: () => json({ user: { id: 9, email: 'new.polisher@example.com', name: 'Noor Lathe', role: 'workshop' }, csrfToken: 'fresh' }, 201),
      [`/api/public/invitations/${TOKEN}`]: pending,
      '/api/auth/csrf': () => json({ csrfToken: 'tok' }),
      '/api/auth/session': () => json({ user: { id: 9, email: 'new.polisher@example.com', name: 'Noor Lathe', role: 'workshop' } }),
    });
    vi.stubGlobal('fetch', net.fn);
    renderInvite();
    fireEvent.change(await screen.findByLabelText('Your name'), { target: { value: ' Noor Lathe ' } });
    fireEvent.change(screen.getByLabelText('Choose a password'), { target: { value: 'a long enough password' } });
    fireEvent.change(screen.getByLabelText('The same password again'), { target: { value: 'a long enough password' } });
    fireEvent.click(screen.getByRole('button', { name: /Accept and sign in/ }));
    expect(await screen.findByText('Home page')).toBeTruthy();
    const post = net.calls.find((c) => c.url.endsWith('/accept'))!;
    expect(JSON.parse(String(post.init!.body))).toEqual({ name: 'Noor Lathe', password: 'a long enough password' });
  });

  it('says plainly when the link has run out, and when it is unknown', async () => {
    vi.stubGlobal('fetch', fakeFetch({ [`/api/public/invitations/${TOKEN}`]: () => json({ workshopName: 'Hollowmere Polishing', email: 'x@example.com', role: 'sales', state: 'expired', expiresAt: '2026-11-30T10:00:00.000Z' }) }).fn);
    const first = renderInvite();
    expect(await screen.findByText('This invitation has run out')).toBeTruthy();
    expect(screen.getByText(/Ask the owner of Hollowmere Polishing to send it again/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: /Accept/ })).toBeNull();
    first.unmount();

    vi.stubGlobal('fetch', fakeFetch({ '/api/public/invitations/': () => problem(404, 'invitation_not_found', 'This invitation link is not one we know. Ask the workshop owner to send you a new one.') }).fn);
    renderInvite('z'.repeat(43));
    await waitFor(() => expect(screen.getByText(/not one we know/)).toBeTruthy());
  });
});
