import { useState, type FormEvent } from 'react';
import { CustomerInputSchema, type Customer } from '@shared/schemas/customers';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useCreateCustomer, useUpdateCustomer } from '../api/customers';

interface Form {
  name: string;
  email: string;
  phone: string;
  address: string;
  notes: string;
}

const empty: Form = { name: '', email: '', phone: '', address: '', notes: '' };
const fromCustomer = (c: Customer): Form => ({ name: c.name, email: c.email ?? '', phone: c.phone ?? '', address: c.address ?? '', notes: c.notes ?? '' });

const textarea = 'block w-full rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm text-walnut-900 focus:border-amber-500 focus:outline-none focus:ring-2 focus:ring-amber-200';

/** Adds a customer, or edits one when `customer` is given. Checked with the shared schema, then by the server. */
export function CustomerFormDialog({ open, customer, onClose, onSaved }: { open: boolean; customer?: Customer; onClose: () => void; onSaved?: (c: Customer) => void }) {
  const create = useCreateCustomer();
  const update = useUpdateCustomer();
  const mutation = customer ? update : create;
  const [form, setForm] = useState<Form>(customer ? fromCustomer(customer) : empty);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [lastOpen, setLastOpen] = useState(open);
  if (open !== lastOpen) {
    setLastOpen(open);
    if (open) {
      setForm(customer ? fromCustomer(customer) : empty);
      setErrors({});
    }
  }

  const close = () => {
    create.reset();
    update.reset();
    onClose();
  };

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = CustomerInputSchema.safeParse(form);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    const done = { onSuccess: (c: Customer) => { onSaved?.(c); close(); }, onError: (err: unknown) => setErrors(serverFieldErrors(err)) };
    if (customer) update.mutate({ id: customer.id, ...form }, done);
    else create.mutate(form, done);
  };

  return (
    <Dialog title={customer ? `Edit ${customer.name}` : 'Add a customer'} open={open} onClose={close}>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        {mutation.isError && <Alert tone="error" title="Not saved">{mutation.error.message}</Alert>}
        <TextField label="Name" value={form.name} onChange={(e) => setForm({ ...form, name: e.target.value })} error={errors.name} autoComplete="off" />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="E-mail" type="email" value={form.email} onChange={(e) => setForm({ ...form, email: e.target.value })} error={errors.email} hint="For sending quotes" />
          <TextField label="Telephone" value={form.phone} onChange={(e) => setForm({ ...form, phone: e.target.value })} error={errors.phone} />
        </div>
        <div className="space-y-1">
          <label htmlFor="customer-address" className="block text-sm font-medium text-walnut-800">Address</label>
          <textarea id="customer-address" rows={3} className={textarea} value={form.address} onChange={(e) => setForm({ ...form, address: e.target.value })} />
          {errors.address && <p className="text-sm text-brick-700" role="alert">▲ {errors.address}</p>}
        </div>
        <div className="space-y-1">
          <label htmlFor="customer-notes" className="block text-sm font-medium text-walnut-800">Notes</label>
          <textarea id="customer-notes" rows={3} className={textarea} value={form.notes} onChange={(e) => setForm({ ...form, notes: e.target.value })} placeholder="Access, collection, how they like to be contacted…" />
          {errors.notes && <p className="text-sm text-brick-700" role="alert">▲ {errors.notes}</p>}
        </div>
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={mutation.isPending}>{customer ? 'Save changes' : 'Add customer'}</Button>
        </div>
      </form>
    </Dialog>
  );
}
