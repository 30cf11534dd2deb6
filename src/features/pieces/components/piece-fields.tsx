import { PIECE_KIND_LABELS, PIECE_KINDS, PieceInputSchema, type Piece, type PieceInput, type PieceKind } from '@shared/schemas/customers';
import { parseLength, formatLength, UnitParseError, type LengthUnit } from '@shared/units';
import { SelectField, TextField } from '@/components/field';
import { zodFieldErrors } from '@/lib/form-errors';

/** Sizes worth recording for each kind of piece; the estimator's templates read them. */
export const PIECE_DIMENSIONS: Record<PieceKind, { name: string; label: string; hint: string }[]> = {
  grand: [
    { name: 'length', label: 'Length', hint: 'Keyboard to tail, e.g. 6 ft 3 in' },
    { name: 'width', label: 'Width', hint: 'Across the keyboard end' },
    { name: 'rimHeight', label: 'Rim height', hint: 'Depth of the rim' },
  ],
  upright: [
    { name: 'height', label: 'Height', hint: 'Floor to top' },
    { name: 'width', label: 'Width', hint: 'Cheek to cheek' },
    { name: 'depth', label: 'Depth', hint: 'Front to back' },
  ],
  square: [
    { name: 'length', label: 'Length', hint: 'Longest side of the case' },
    { name: 'width', label: 'Width', hint: 'Front to back' },
    { name: 'height', label: 'Height', hint: 'Floor to lid' },
  ],
  furniture: [
    { name: 'length', label: 'Length', hint: 'Tables and chests' },
    { name: 'width', label: 'Width', hint: 'Tables and cabinets' },
    { name: 'height', label: 'Height', hint: 'Floor to top' },
    { name: 'depth', label: 'Depth', hint: 'Cabinets and chests' },
  ],
};

export interface PieceForm {
  kind: PieceKind;
  description: string;
  maker: string;
  year: string;
  serial: string;
  dimensions: Record<string, string>;
  conditionNotes: string;
}

export const emptyPieceForm = (kind: PieceKind = 'grand'): PieceForm => ({ kind, description: '', maker: '', year: '', serial: '', dimensions: {}, conditionNotes: '' });

export function pieceFormFrom(p: Piece): PieceForm {
  return { kind: p.kind, description: p.description, maker: p.maker ?? '', year: p.yearText ?? (p.year === null ? '' : String(p.year)), serial: p.serial ?? '', dimensions: { ...p.dimensions }, conditionNotes: p.conditionNotes ?? '' };
}

/**
 * Checks the form with the shared schema, and each size as a length with units; returns the request body or the
 * messages by field.
 */
export function checkPieceForm(form: PieceForm, customerId: number, unit: LengthUnit): { input: PieceInput } | { errors: Record<string, string> } {
  const dimensions: Record<string, string> = {};
  const errors: Record<string, string> = {};
  for (const d of PIECE_DIMENSIONS[form.kind]) {
    const v = (form.dimensions[d.name] ?? '').trim();
    if (v === '') continue;
    try {
      parseLength(v, unit);
      dimensions[d.name] = v;
    } catch (e) {
      errors[`dimensions.${d.name}`] = e instanceof UnitParseError ? e.message : String(e);
    }
  }
  // The year as written: "1890", "c. 1830", "about 1900" or "1890s"; the server keeps a sortable best guess beside it.
  const year = form.year.trim() === '' ? null : form.year.trim();
  const parsed = PieceInputSchema.safeParse({
    customerId,
    kind: form.kind,
    description: form.description,
    maker: form.maker,
    year,
    serial: form.serial,
    dimensions,
    conditionNotes: form.conditionNotes,
  });
  if (!parsed.success) Object.assign(errors, zodFieldErrors(parsed.error));
  if (Object.keys(errors).length > 0 || !parsed.success) return { errors };
  return { input: { customerId, kind: form.kind, description: form.description, maker: form.maker, year, serial: form.serial, dimensions, conditionNotes: form.conditionNotes } };
}

function readAs(value: string, unit: LengthUnit): string | undefined {
  if (value.trim() === '') return undefined;
  try {
    const mm = parseLength(value, unit);
    return `${formatLength(mm, 'metric')} · ${formatLength(mm, 'imperial')}`;
  } catch {
    return undefined;
  }
}

const textarea = 'block w-full rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm text-walnut-900 focus:border-amber-500 focus:outline-none focus:ring-2 focus:ring-amber-200';

/** The fields of a piece: what it is, who made it, its sizes with units, and its condition. */
export function PieceFields({ form, onChange, errors, unit, disabled = false }: { form: PieceForm; onChange: (f: PieceForm) => void; errors: Record<string, string>; unit: LengthUnit; disabled?: boolean }) {
  return (
    <fieldset disabled={disabled} className="space-y-4">
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField label="Kind" options={PIECE_KINDS.map((k) => ({ value: k, label: PIECE_KIND_LABELS[k] }))} value={form.kind} onChange={(e) => onChange({ ...form, kind: e.target.value as PieceKind })} error={errors.kind} />
        <TextField label="Description" value={form.description} onChange={(e) => onChange({ ...form, description: e.target.value })} error={errors.description} placeholder="e.g. Rosewood grand, 1890s" />
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <TextField label="Maker" value={form.maker} onChange={(e) => onChange({ ...form, maker: e.target.value })} error={errors.maker} />
        <TextField label="Year" hint="1890, c. 1830, about 1900 or 1890s" value={form.year} onChange={(e) => onChange({ ...form, year: e.target.value })} error={errors.year} />
        <TextField label="Serial number" value={form.serial} onChange={(e) => onChange({ ...form, serial: e.target.value })} error={errors.serial} />
      </div>
      <div>
        <p className="text-sm font-medium text-walnut-800">Sizes</p>
        <p className="text-xs text-walnut-500">With their units: “190 cm”, “6 ft 3 in”, “1900 mm”. A bare number is in {unit}.</p>
        <div className="mt-2 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          {PIECE_DIMENSIONS[form.kind].map((d) => (
            <TextField
              key={d.name}
              label={d.label}
              autoComplete="off"
              value={form.dimensions[d.name] ?? ''}
              onChange={(e) => onChange({ ...form, dimensions: { ...form.dimensions, [d.name]: e.target.value } })}
              error={errors[`dimensions.${d.name}`]}
              hint={readAs(form.dimensions[d.name] ?? '', unit) ?? d.hint}
            />
          ))}
        </div>
      </div>
      <div className="space-y-1">
        <label htmlFor="condition-notes" className="block text-sm font-medium text-walnut-800">Condition notes</label>
        <textarea
          id="condition-notes"
          rows={5}
          className={textarea}
          value={form.conditionNotes}
          onChange={(e) => onChange({ ...form, conditionNotes: e.target.value })}
          placeholder="State of the old finish, ring marks, lifting veneer, repairs before polishing…"
        />
        {errors.conditionNotes && <p className="text-sm text-brick-700" role="alert">▲ {errors.conditionNotes}</p>}
      </div>
    </fieldset>
  );
}
