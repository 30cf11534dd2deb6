import { useState, type FormEvent } from 'react';
import { MATERIAL_KINDS, MATERIAL_UNITS } from '@shared/schemas/catalog';
import { CreateMaterialSchema, CreatePackSchema, MATERIAL_KIND_LABELS, MATERIAL_UNIT_LABELS, type MaterialDto, type MaterialKind } from '@shared/schemas/price-list';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { SelectField, TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { todayIso } from '@/lib/format';
import { useAddPack, useCreateMaterial } from '../api/price-list';

const kindOptions = MATERIAL_KINDS.map((k) => ({ value: k, label: MATERIAL_KIND_LABELS[k] }));
const unitOptions = MATERIAL_UNITS.map((u) => ({ value: u, label: MATERIAL_UNIT_LABELS[u] }));

const emptyPack = () => ({ size: '', label: '', supplier: '', supplierCode: '', price: '', effectiveFrom: todayIso() });

function PackFields({ pack, unit, currency, errors, prefix, onChange }: {
  pack: ReturnType<typeof emptyPack>;
  unit: string;
  currency: string;
  errors: Record<string, string>;
  prefix: string;
  onChange: (p: ReturnType<typeof emptyPack>) => void;
}) {
  const e = (f: string) => errors[`${prefix}${f}`];
  return (
    <div className="grid grid-cols-2 gap-3">
      <TextField label={`Pack size (${unit})`} inputMode="decimal" value={pack.size} onChange={(ev) => onChange({ ...pack, size: ev.target.value })} error={e('size')} />
      <TextField label={`Price (${currency}, before tax)`} inputMode="decimal" value={pack.price} onChange={(ev) => onChange({ ...pack, price: ev.target.value })} error={e('price')} hint="12.50 or 12,50" />
      <TextField label="Supplier" value={pack.supplier} onChange={(ev) => onChange({ ...pack, supplier: ev.target.value })} error={e('supplier')} />
      <TextField label="Supplier code" value={pack.supplierCode} onChange={(ev) => onChange({ ...pack, supplierCode: ev.target.value })} error={e('supplierCode')} />
      <TextField label="Pack label (optional)" value={pack.label} onChange={(ev) => onChange({ ...pack, label: ev.target.value })} error={e('label')} />
      <TextField label="Price effective from" type="date" value={pack.effectiveFrom} onChange={(ev) => onChange({ ...pack, effectiveFrom: ev.target.value })} error={e('effectiveFrom')} />
    </div>
  );
}

export function AddMaterialDialog({ open, onClose, currency }: { open: boolean; onClose: () => void; currency: string }) {
  const create = useCreateMaterial();
  const blank = () => ({ name: '', kind: 'shellac' as MaterialKind, unit: 'g' as (typeof MATERIAL_UNITS)[number], notes: '', pack: emptyPack() });
  const [form, setForm] = useState(blank);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const close = () => {
    setForm(blank());
    setErrors({});
    create.reset();
    onClose();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = CreateMaterialSchema.safeParse(form);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    create.mutate({ ...form, pack: { ...form.pack, size: Number(form.pack.size) } }, { onSuccess: close, onError: (err) => setErrors(serverFieldErrors(err)) });
  };
  return (
    <Dialog title="Add a material" open={open} onClose={close}>
      <form onSubmit={submit} noValidate className="space-y-4">
        {create.isError && <Alert tone="error" title="Not saved">{create.error.message}</Alert>}
        <TextField label="Name" value={form.name} onChange={(e) => setForm({ ...form, name: e.target.value })} error={errors.name ?? errors.key} />
        <div className="grid grid-cols-2 gap-3">
          <SelectField label="Kind" options={kindOptions} value={form.kind} onChange={(e) => setForm({ ...form, kind: e.target.value as MaterialKind })} error={errors.kind} />
          <SelectField label="Counted in" options={unitOptions} value={form.unit} onChange={(e) => setForm({ ...form, unit: e.target.value as typeof form.unit })} error={errors.unit} />
        </div>
        <TextField label="Notes (optional)" value={form.notes} onChange={(e) => setForm({ ...form, notes: e.target.value })} error={errors.notes} />
        <fieldset className="rounded-lg border border-parchment-200 bg-parchment-50 p-3">
          <legend className="px-1 text-sm font-semibold text-walnut-800">First pack</legend>
          <PackFields pack={form.pack} unit={form.unit} currency={currency} errors={errors} prefix="pack." onChange={(pack) => setForm({ ...form, pack })} />
        </fieldset>
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={create.isPending}>Add material</Button>
        </div>
      </form>
    </Dialog>
  );
}

export function AddPackDialog({ material, onClose, currency }: { material: MaterialDto | null; onClose: () => void; currency: string }) {
  const add = useAddPack();
  const [pack, setPack] = useState(emptyPack);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const close = () => {
    setPack(emptyPack());
    setErrors({});
    add.reset();
    onClose();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!material) return;
    const parsed = CreatePackSchema.safeParse(pack);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    add.mutate({ materialId: material.id, ...pack, size: Number(pack.size) }, { onSuccess: close, onError: (err) => setErrors(serverFieldErrors(err)) });
  };
  return (
    <Dialog title={`Add a pack of ${material?.name ?? ''}`} open={material !== null} onClose={close}>
      <form onSubmit={submit} noValidate className="space-y-4">
        {add.isError && <Alert tone="error" title="Not saved">{add.error.message}</Alert>}
        <PackFields pack={pack} unit={material?.unit ?? ''} currency={currency} errors={errors} prefix="" onChange={setPack} />
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={close}>Cancel</Button>
          <Button type="submit" busy={add.isPending}>Add pack</Button>
        </div>
      </form>
    </Dialog>
  );
}
