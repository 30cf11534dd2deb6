import { ChevronDown, ChevronRight } from 'lucide-react';
import { Fragment, memo, useCallback, useEffect, useRef, useState } from 'react';
import { APPLIES_TO, cutUnit, type Catalog } from '@shared/schemas/catalog';
import type { StageResult } from '@shared/schemas/calc';
import { APPLIES_TO_LABELS, messageAt, STAGE_NUMBER_LABELS, type StageDraft, type StageNumber } from '../lib/draft';
import { formatHours } from '@/lib/format-figures';
import { CellInput, MiniSelect } from './fields';

const MAIN: StageNumber[] = ['sessions', 'coatsPerSession', 'cutLb', 'restHours', 'labourMinPerM2PerCoat'];
const MORE: StageNumber[] = ['setupMinPerSession', 'polishMlPerM2PerCoat', 'spiritMlPerM2PerSession'];
const OPEN = <ChevronDown className="h-3.5 w-3.5" aria-hidden />;
const CLOSED = <ChevronRight className="h-3.5 w-3.5" aria-hidden />;

interface StagesEditorProps {
  stages: StageDraft[];
  onChange: (stages: StageDraft[]) => void;
  errors: Record<string, string>;
  results: readonly StageResult[];
  catalog: Catalog;
}

/**
 * A stage's "use" box and main numbers, drawn again only when that stage, its messages or its place change: a
 * keystroke elsewhere in the estimate (a dimension, a part) leaves the stages' inputs alone (their callbacks are
 * stable and read the latest list).
 */
const StageUseCell = memo(function StageUseCell({ index, name, enabled, onToggle }: { index: number; name: string; enabled: boolean; onToggle: (i: number, enabled: boolean) => void }) {
  return (
    <td className="px-2 py-1.5 align-top">
      <input type="checkbox" className="mt-2 h-4 w-4 accent-amber-600" checked={enabled} onChange={(e) => onToggle(index, e.target.checked)} aria-label={`Use ${name}`} />
    </td>
  );
});

const StageNumberCell = memo(function StageNumberCell({ index, k, name, value, disabled, error, onValue }: { index: number; k: StageNumber; name: string; value: string; disabled: boolean; error: string | undefined; onValue: (i: number, k: StageNumber, v: string) => void }) {
  return (
    <td className="w-20 px-2 py-1.5 align-top">
      <CellInput label={`${STAGE_NUMBER_LABELS[k].label} of ${name}`} value={value} onValue={(v) => onValue(index, k, v)} inputMode="decimal" disabled={disabled} error={error} />
    </td>
  );
});

/** The stages this estimate uses, copied from the finishing system and edited here only. */
export function StagesEditor({ stages, onChange, errors, results, catalog }: StagesEditorProps) {
  // The cut's gallon is a workshop setting, named beside every cut.
  const unitOf = (k: StageNumber): string => (k === 'cutLb' ? cutUnit(catalog.shellac.gallon) : STAGE_NUMBER_LABELS[k].unit);
  const [open, setOpen] = useState<string | null>(null);
  const set = (i: number, patch: Partial<StageDraft>) => onChange(stages.map((s, k) => (k === i ? { ...s, ...patch } : s)));
  // The cells' callbacks stay the same between renders and read the latest stages.
  const latest = useRef({ stages, onChange });
  useEffect(() => {
    latest.current = { stages, onChange };
  });
  const onToggle = useCallback((i: number, enabled: boolean) => {
    const { stages: list, onChange: change } = latest.current;
    change(list.map((s, k) => (k === i ? { ...s, enabled } : s)));
  }, []);
  const onValue = useCallback((i: number, key: StageNumber, v: string) => {
    const { stages: list, onChange: change } = latest.current;
    change(list.map((s, k) => (k === i ? { ...s, values: { ...s.values, [key]: v } } : s)));
  }, []);
  const byKey = new Map(results.map((r) => [r.key, r]));
  return (
    <div className="overflow-x-auto rounded-lg border border-parchment-200">
      <table className="min-w-full text-sm">
        <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
          <tr>
            <th className="px-2 py-2">Use</th>
            <th className="px-2 py-2">Stage</th>
            {MAIN.map((k) => (
              <th key={k} className="px-2 py-2" title={STAGE_NUMBER_LABELS[k].label}>
                {STAGE_NUMBER_LABELS[k].short}
                {unitOf(k) && <span className="block font-normal normal-case">{unitOf(k)}</span>}
              </th>
            ))}
            <th className="px-2 py-2 text-right">Labour</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {stages.map((s, i) => {
            const r = byKey.get(s.key);
            const expanded = open === s.key;
            return (
              <Fragment key={s.key}>
                <tr className={s.enabled ? '' : 'bg-parchment-50 text-walnut-400'} data-testid={`stage-row-${s.key}`}>
                  <StageUseCell index={i} name={s.base.name} enabled={s.enabled} onToggle={onToggle} />
                  <td className="min-w-44 px-2 py-1.5 align-top">
                    <button type="button" className="mt-1 inline-flex items-center gap-1 text-left font-medium text-walnut-900 hover:text-amber-700" onClick={() => setOpen(expanded ? null : s.key)} aria-expanded={expanded}>
                      {expanded ? OPEN : CLOSED}
                      {s.base.name}
                    </button>
                    {!s.enabled && <span className="block pl-5 text-xs">not used</span>}
                  </td>
                  {MAIN.map((k) => (
                    <StageNumberCell key={k} index={i} k={k} name={s.base.name} value={s.values[k]} disabled={!s.enabled} error={messageAt(errors, `stages.${i}.${k}`)} onValue={onValue} />
                  ))}
                  <td className="num whitespace-nowrap px-2 py-1.5 pt-3 text-right align-top font-medium">{r && s.enabled ? formatHours(r.labourHours) : '—'}</td>
                </tr>
                {expanded && (
                  <tr className="bg-parchment-50">
                    <td />
                    <td colSpan={MAIN.length + 2} className="px-2 py-2">
                      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
                        {MORE.map((k) => (
                          <CellInput
                            key={k}
                            showLabel
                            label={`${STAGE_NUMBER_LABELS[k].label} (${STAGE_NUMBER_LABELS[k].unit})`}
                            value={s.values[k]}
                            onValue={(v) => set(i, { values: { ...s.values, [k]: v } })}
                            inputMode="decimal"
                            error={messageAt(errors, `stages.${i}.${k}`)}
                          />
                        ))}
                        <MiniSelect showLabel label="Applies to" value={s.appliesTo} options={APPLIES_TO.map((a) => ({ value: a, label: APPLIES_TO_LABELS[a] }))} onChange={(v) => set(i, { appliesTo: v })} />
                      </div>
                      {r && (
                        <p className="num mt-2 text-xs text-walnut-600">
                          This estimate: {r.coats > 0 ? `${r.coats} coats, ` : ''}
                          {formatHours(r.handsOnHoursPerSession)} hands-on per session.
                        </p>
                      )}
                    </td>
                  </tr>
                )}
              </Fragment>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
