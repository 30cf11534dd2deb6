import { useState, type FormEvent } from 'react';
import { CreateUserSchema, ROLE_LABELS, ROLES, type Role } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { SelectField, TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useCreateUser } from '../api/users';

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

export function AddUserDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const create = useCreateUser();
  const [form, setForm] = useState({ name: '', email: '', role: 'estimator' as Role, password: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});

  const close = () => {
    setForm({ name: '', email: '', role: 'estimator', password: '' });
    setErrors({});
    create.reset();
    onClose();
  };

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = CreateUserSchema.safeParse(form);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    create.mutate(parsed.data, { onSuccess: close, onError: (err) => setErrors(serverFieldErrors(err)) });
  };

  return (
    <Dialog title="Add a user" open={open} onClose={close}>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        {create.isError && <Alert tone="error" title="Not saved">{create.error.message}</Alert>}
        <TextField label="Name" value={form.name} onChange={(e) => setForm({ ...form, name: e.target.value })} error={errors.name} />
        <TextField label="E-mail" type="email" value={form.email} onChange={(e) => setForm({ ...form, email: e.target.value })} error={errors.email} />
        <SelectField label="Role" options={roleOptions} value={form.role} onChange={(e) => setForm({ ...form, role: e.target.value as Role })} error={errors.role} />
        <TextField
          label="First password"
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters. Give it to them in person; they can ask you to reset it."
          value={form.password}
          onChange={(e) => setForm({ ...form, password: e.target.value })}
          error={errors.password}
        />
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={create.isPending}>Add user</Button>
        </div>
      </form>
    </Dialog>
  );
}
