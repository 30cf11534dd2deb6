import { useState, type FormEvent } from 'react';
import { ResetPasswordSchema, type User } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/field';
import { zodFieldErrors } from '@/lib/form-errors';
import { useResetPassword } from '../api/users';

export function ResetPasswordDialog({ user, onClose }: { user: User | null; onClose: () => void }) {
  const reset = useResetPassword();
  const [password, setPassword] = useState('');
  const [error, setError] = useState<string>();
  const close = () => {
    setPassword('');
    setError(undefined);
    reset.reset();
    onClose();
  };
  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = ResetPasswordSchema.safeParse({ password });
    if (!parsed.success) return setError(zodFieldErrors(parsed.error).password);
    setError(undefined);
    if (user) reset.mutate({ id: user.id, password }, { onSuccess: close });
  };
  return (
    <Dialog title={`Reset password for ${user?.name ?? ''}`} open={user !== null} onClose={close}>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <p className="text-sm text-walnut-600">Their open sessions end at once; they sign in again with the new password.</p>
        {reset.isError && <Alert tone="error" title="Not changed">{reset.error.message}</Alert>}
        <TextField label="New password" type="password" autoComplete="new-password" value={password} onChange={(e) => setPassword(e.target.value)} error={error} hint="At least 10 characters." />
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={reset.isPending}>Set password</Button>
        </div>
      </form>
    </Dialog>
  );
}
