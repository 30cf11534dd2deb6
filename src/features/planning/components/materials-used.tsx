/**
 * The materials a session used, prefilled from the estimate's share for the session and counted in packs (the
 * units they are bought in): the polisher changes the pack or the number; each is taken off stock on hand.
 */
import type { SessionMaterialLine } from '@shared/schemas/stock';

export interface MaterialUseDraft {
  materialId: number;
  packId: number;
  packs: string;
}

export type MaterialUseLine = Omit<SessionMaterialLine, 'packs'> & MaterialUseDraft;

const nf = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });

/** The lines as the form holds them: the prefill with the polisher's changes over it. */
export function draftLines(prefill: readonly SessionMaterialLine[], changes: Record<number, Partial<MaterialUseDraft>>): MaterialUseLine[] {
  return prefill.map((p) => ({ ...p, packs: String(p.packs), ...changes[p.materialId] }));
}

export function MaterialsUsedFields({ lines, errors, onChange }: { lines: MaterialUseLine[]; errors: Record<string, string>; onChange: (materialId: number, patch: Partial<MaterialUseDraft>) => void }) {
  if (lines.length === 0) return null;
  return (
    <fieldset className="space-y-2 rounded-lg border border-parchment-200 p-3">
      <legend className="px-1 text-sm font-medium text-walnut-800">Materials used, in packs</legend>
      <p className="text-xs text-walnut-500">Filled in from the estimate for this session; change what differs. Each comes off the stock on the shelf.</p>
      {lines.map((l, i) => (
        <div key={l.materialId} className="grid grid-cols-1 gap-1 sm:grid-cols-[1fr_auto_auto] sm:items-center sm:gap-2">
          <span className="text-sm text-walnut-900">
            {l.name}
            <span className="block text-xs text-walnut-500">estimate {nf.format(l.estimated)} {l.unit}</span>
          </span>
          <input
            type="number"
            min="0"
            step="any"
            inputMode="decimal"
            aria-label={`Packs of ${l.name} used`}
            aria-invalid={errors[`materials.${i}.packs`] ? true : undefined}
            value={l.packs}
            onChange={(e) => onChange(l.materialId, { packs: e.target.value })}
            className="num w-24 rounded-md border border-walnut-200 px-2 py-1 text-right text-sm"
          />
          <select aria-label={`Pack of ${l.name}`} value={l.packId} onChange={(e) => onChange(l.materialId, { packId: Number(e.target.value) })} className="rounded-md border border-walnut-200 bg-white px-2 py-1 text-sm">
            {l.options.map((o) => (
              <option key={o.packId} value={o.packId}>
                × {o.label}
              </option>
            ))}
          </select>
          {(errors[`materials.${i}.packs`] || errors[`materials.${i}.packId`]) && (
            <p className="text-sm text-brick-700 sm:col-span-3" role="alert">
              <span aria-hidden>▲</span> {l.name}: {errors[`materials.${i}.packs`] ?? errors[`materials.${i}.packId`]}
            </p>
          )}
        </div>
      ))}
    </fieldset>
  );
}
