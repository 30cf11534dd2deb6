/**
 * The page an invitation's link opens: which workshop invites, in which role, for which address; the person chooses
 * their name and a password and lands signed in, on the pages of their role.
 */
import { UserPlus } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { ROLE_DUTIES, ROLE_LABELS } from '@shared/schemas/auth';
import { AcceptInvitationSchema, InvitationTokenSchema, type PublicInvitation } from '@shared/schemas/invitations';
import { formatDate } from '@shared/format';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { TextField } from '@/components/field';
import { Logo } from '@/components/logo';
import { Spinner } from '@/components/spinner';
import { paths } from '@/config/paths';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useAcceptInvitation, usePublicInvitation } from '../api/invitation';

const CLOSED: Record<Exclude<PublicInvitation['state'], 'pending'>, { title: string; text: (i: PublicInvitation) => string }> = {
  accepted: { title: 'This invitation has been accepted', text: (i) => `An account for ${i.email} was made with it. Sign in with the password chosen then.` },
  expired: { title: 'This invitation has run out', text: (i) => `The link worked until ${formatDate(i.expiresAt, { month: 'long' })}. Ask the owner of ${i.workshopName} to send it again.` },
  revoked: { title: 'This invitation was withdrawn', text: (i) => `${i.workshopName} withdrew it. Ask the owner if you should have one.` },
};

export function InvitePage() {
  const { token = '' } = useParams();
  const wellFormed = InvitationTokenSchema.safeParse(token).success;
  const invitation = usePublicInvitation(token);
  const accept = useAcceptInvitation(token);
  const navigate = useNavigate();
  const [form, setForm] = useState({ name: '', password: '', repeat: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const inv = invitation.data;
  /** Changes a field and drops what was said about it (the rest stays until the next try). */
  const edit = (field: keyof typeof form, value: string) => {
    setForm({ ...form, [field]: value });
    setErrors(({ [field]: _dropped, ...rest }) => rest);
  };

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = AcceptInvitationSchema.safeParse({ name: form.name, password: form.password });
    const found = parsed.success ? {} : zodFieldErrors(parsed.error);
    if (form.password && form.repeat !== form.password) found.repeat = 'must be the same password again';
    if (!parsed.success || Object.keys(found).length) return setErrors(found);
    setErrors({});
    accept.mutate(parsed.data, {
      onSuccess: () => navigate(paths.home, { replace: true }),
      onError: (err) => setErrors(serverFieldErrors(err)),
    });
  };

  return (
    <div className="flex min-h-screen items-center justify-center bg-parchment-50 px-4 py-10 sm:px-6">
      <div className="w-full max-w-md space-y-5">
        <div className="flex items-center gap-2">
          <Logo />
          <span className="font-serif text-xl font-semibold">Shellwright</span>
        </div>
        {!wellFormed ? (
          <Alert tone="error" title="This link cannot be opened">This is not a link we sent. Check that the whole address from the e-mail was copied.</Alert>
        ) : invitation.isPending ? (
          <Spinner label="Opening your invitation…" />
        ) : invitation.isError ? (
          <Alert tone="error" title="This link cannot be opened">{invitation.error.message}</Alert>
        ) : inv && inv.state !== 'pending' ? (
          <>
            <h1 className="text-3xl font-semibold text-walnut-900">{inv.workshopName}</h1>
            <Alert tone={inv.state === 'accepted' ? 'info' : 'error'} title={CLOSED[inv.state].title}>
              {CLOSED[inv.state].text(inv)}{' '}
              <Link to={paths.signIn} className="font-semibold underline">Go to sign-in</Link>.
            </Alert>
          </>
        ) : inv ? (
          <>
            <div>
              <p className="text-sm font-semibold uppercase tracking-wide text-amber-700">You are invited</p>
              <h1 className="mt-1 text-3xl font-semibold text-walnut-900">Join {inv.workshopName}</h1>
              <p className="mt-2 text-walnut-700">
                As <strong>{ROLE_LABELS[inv.role]}</strong>: {ROLE_DUTIES[inv.role]}
              </p>
              <p className="mt-2 text-sm text-walnut-600">
                You will sign in as <strong>{inv.email}</strong>. This link works until {formatDate(inv.expiresAt, { month: 'long' })}.
              </p>
            </div>
            <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Accept the invitation">
              {accept.isError && !Object.keys(serverFieldErrors(accept.error)).length && (
                <Alert tone="error" title="Not accepted">{accept.error.message}</Alert>
              )}
              <TextField label="Your name" name="name" autoComplete="name" hint="As your colleagues will see it." value={form.name} onChange={(e) => edit('name', e.target.value)} error={errors.name} />
              <input type="email" name="email" autoComplete="username" value={inv.email} readOnly hidden />
              <TextField
                label="Choose a password"
                type="password"
                name="new-password"
                autoComplete="new-password"
                hint="At least 10 characters. A few words you will remember make a good one."
                value={form.password}
                onChange={(e) => edit('password', e.target.value)}
                error={errors.password}
              />
              <TextField label="The same password again" type="password" name="repeat-password" autoComplete="new-password" value={form.repeat} onChange={(e) => edit('repeat', e.target.value)} error={errors.repeat} />
              <Button type="submit" className="w-full" busy={accept.isPending}>
                <UserPlus className="h-4 w-4" aria-hidden /> Accept and sign in
              </Button>
            </form>
          </>
        ) : null}
      </div>
    </div>
  );
}

export const Component = InvitePage;
