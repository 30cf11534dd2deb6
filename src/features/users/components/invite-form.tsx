import { Send } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { ROLE_DUTIES, ROLE_LABELS, ROLES, type Role } from '@shared/schemas/auth';
import { CreateInvitationSchema, INVITATION_VALID_DAYS } from '@shared/schemas/invitations';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { SelectField, TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useCreateInvitation } from '../api/invitations';

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

/** "Invite someone": an e-mail address and a role; the link goes by e-mail and works for a week. */
export function InviteForm() {
  const create = useCreateInvitation();
  const [form, setForm] = useState({ email: '', role: 'estimator' as Role });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [sent, setSent] = useState<{ email: string; delivered: boolean | null } | null>(null);

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    setSent(null);
    const parsed = CreateInvitationSchema.safeParse(form);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: (inv) => {
        setSent({ email: inv.email, delivered: inv.delivered });
        setForm({ email: '', role: form.role });
      },
      onError: (err) => setErrors(serverFieldErrors(err)),
    });
  };

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Invite someone" className="space-y-3">
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_auto] sm:items-start">
        <TextField label="E-mail" type="email" autoComplete="off" value={form.email} onChange={(e) => setForm({ ...form, email: e.target.value })} error={errors.email} />
        <SelectField label="Role" options={roleOptions} value={form.role} onChange={(e) => setForm({ ...form, role: e.target.value as Role })} error={errors.role} />
        <div className="sm:pt-6">
          <Button type="submit" busy={create.isPending} className="w-full sm:w-auto">
            <Send className="h-4 w-4" aria-hidden /> Send invitation
          </Button>
        </div>
      </div>
      <p className="text-xs text-walnut-500">
        {ROLE_LABELS[form.role]}: {ROLE_DUTIES[form.role]} They get a link by e-mail that works for {INVITATION_VALID_DAYS} days; they choose their own name and password.
      </p>
      {create.isError && !Object.keys(serverFieldErrors(create.error)).length && (
        <Alert tone="error" title="Invitation not sent">{create.error.message}</Alert>
      )}
      {sent &&
        (sent.delivered === false ? (
          <Alert tone="warning" title="Invitation saved, but the e-mail did not go">
            The mail server did not take the message to {sent.email}. Use Resend below to try again.
          </Alert>
        ) : (
          <Alert tone="info" title="Invitation sent">
            {sent.email} has a link to join. It shows below until they accept it.
          </Alert>
        ))}
    </form>
  );
}
