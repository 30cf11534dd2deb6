import { useState, type FormEvent } from 'react';
import { ResendConfirmationSchema } from '@shared/schemas/signup';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { TextField } from '@/components/field';
import { useResendConfirmation } from '@/lib/confirmation';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';

/** Asks for a new confirmation link; says the same whatever the address. */
export function ResendLink({ email: initial = '', label = 'Send me a new link' }: { email?: string; label?: string }) {
  const resend = useResendConfirmation();
  const [email, setEmail] = useState(initial);
  const [error, setError] = useState<string>();

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = ResendConfirmationSchema.safeParse({ email });
    if (!parsed.success) {
      setError(zodFieldErrors(parsed.error).email);
      return;
    }
    setError(undefined);
    resend.mutate(parsed.data, { onError: (err) => setError(serverFieldErrors(err).email) });
  };

  if (resend.isSuccess) {
    return (
      <Alert tone="info" title="Look in your inbox">
        {resend.data.message}
      </Alert>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-3" aria-label="Ask for a new confirmation link">
      {resend.isError && !error && (
        <Alert tone="error" title="Not sent">
          {resend.error.message}
        </Alert>
      )}
      <TextField label="E-mail you signed up with" type="email" name="email" autoComplete="email" value={email} onChange={(e) => setEmail(e.target.value)} error={error} />
      <Button type="submit" variant="secondary" busy={resend.isPending}>
        {label}
      </Button>
    </form>
  );
}
