/**
 * "Forgot your password?": ask for a link by e-mail, then choose a new password from the link. The first page says
 * the same whether or not the address has an account.
 */
import { useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router-dom';
import { PasswordResetCompleteSchema, PasswordResetRequestSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { TextField } from '@/components/field';
import { Frame } from '@/components/signed-out-frame';
import { paths } from '@/config/paths';
import { api, ApiError } from '@/lib/api';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';

export function ForgotPasswordPage() {
  const [email, setEmail] = useState('');
  const [error, setError] = useState<string>();
  const [sent, setSent] = useState<string>();
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string>();

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    const parsed = PasswordResetRequestSchema.safeParse({ email });
    if (!parsed.success) {
      setError(zodFieldErrors(parsed.error).email);
      return;
    }
    setError(undefined);
    setFailure(undefined);
    setBusy(true);
    try {
      setSent((await api<{ message: string }>('/api/auth/password-reset', { method: 'POST', body: parsed.data })).message);
    } catch (err) {
      const field = serverFieldErrors(err).email;
      if (field) setError(field);
      else setFailure(err instanceof Error ? err.message : 'The request could not be sent.');
    } finally {
      setBusy(false);
    }
  };

  return (
    <Frame title="Set a new password" intro="Give the e-mail address you sign in with: we send a link to choose a new password.">
      {sent ? (
        <Alert tone="info" title="Look in your inbox">
          {sent}
        </Alert>
      ) : (
        <form onSubmit={submit} noValidate className="space-y-5" aria-label="Ask for a password link">
          {failure && <Alert tone="error" title="Not sent">{failure}</Alert>}
          <TextField label="E-mail" type="email" name="email" autoComplete="username" value={email} onChange={(e) => setEmail(e.target.value)} error={error} />
          <Button type="submit" className="w-full" busy={busy}>
            E-mail me a link
          </Button>
        </form>
      )}
    </Frame>
  );
}

export function ChooseNewPasswordPage() {
  const { token = '' } = useParams();
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [failure, setFailure] = useState<string>();
  const [done, setDone] = useState(false);
  const [busy, setBusy] = useState(false);

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    const parsed = PasswordResetCompleteSchema.safeParse({ token, password });
    const found = parsed.success ? {} : zodFieldErrors(parsed.error);
    if (password && repeat !== password) found.repeat = 'must be the same password again';
    if (Object.keys(found).length) {
      setErrors(found);
      if (found.token) setFailure('This link is not one we sent. Ask for a new one.');
      return;
    }
    setErrors({});
    setFailure(undefined);
    setBusy(true);
    try {
      await api('/api/auth/password-reset/complete', { method: 'POST', body: { token, password } });
      setDone(true);
    } catch (err) {
      const fields = serverFieldErrors(err);
      if (fields.password) setErrors({ password: fields.password });
      else setFailure(err instanceof ApiError ? err.message : 'The password could not be set.');
    } finally {
      setBusy(false);
    }
  };

  return (
    <Frame title="Choose a new password" intro="At least 10 characters. A few words you will remember make a good one.">
      {done ? (
        <Alert tone="info" title="Your new password is set">
          Every other sign-in of your account has ended.{' '}
          <Link to={paths.signIn} className="font-semibold underline">
            Sign in with it now
          </Link>
          .
        </Alert>
      ) : (
        <form onSubmit={submit} noValidate className="space-y-5" aria-label="Choose a new password">
          {failure && (
            <Alert tone="error" title="The link does not work">
              {failure} <Link to={paths.forgotPassword} className="font-semibold underline">Ask for a new link</Link>.
            </Alert>
          )}
          <TextField label="New password" type="password" name="new-password" autoComplete="new-password" value={password} onChange={(e) => setPassword(e.target.value)} error={errors.password} />
          <TextField label="The same password again" type="password" name="repeat-password" autoComplete="new-password" value={repeat} onChange={(e) => setRepeat(e.target.value)} error={errors.repeat} />
          <Button type="submit" className="w-full" busy={busy}>
            Set the new password
          </Button>
        </form>
      )}
    </Frame>
  );
}
