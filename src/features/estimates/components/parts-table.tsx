import { Copy, Plus, Scissors, Trash2 } from 'lucide-react';
import { defaultRangeExtractor, useWindowVirtualizer, type Range } from '@tanstack/react-virtual';
import { memo, useCallback, useEffect, useId, useLayoutEffect, useMemo, useRef, useState, type FocusEvent, type ReactNode } from 'react';
import { COMPLEXITIES, type Species } from '@shared/schemas/catalog';
import type { PartResult, ShapeKind } from '@shared/schemas/calc';
import type { LengthUnit, UnitSystem } from '@shared/units';
import { Button } from '@/components/button';
import {
  blankPart, COMPLEXITY_LABELS, CUT_OUT_KINDS, duplicatePart, messageAt, rowKey, setShapeKind, SHAPE_FIELDS, SHAPE_LABELS,
  type CutOutDraft, type CutOutKind, type PartDraft,
} from '../lib/draft';
import { formatArea } from '../lib/measures';
import { CellInput, CheckField, FieldMessage, LengthInput, MiniSelect } from './fields';

const SHAPES = (Object.keys(SHAPE_LABELS) as ShapeKind[]).map((k) => ({ value: k, label: SHAPE_LABELS[k] }));

interface PartsTableProps {
  parts: PartDraft[];
  onChange: (parts: PartDraft[]) => void;
  errors: Record<string, string>;
  unit: LengthUnit;
  units: UnitSystem;
  species: readonly Species[];
  /** Area results by row, when the estimate could be worked out. */
  areas: readonly (PartResult | undefined)[];
}

function PointsField({ part, index, onPoints, errors }: { part: PartDraft; index: number; onPoints: (v: string) => void; errors: Record<string, string> }) {
  const id = useId();
  const error = messageAt(errors, `piece.parts.${index}.shape.points`, { under: true }) ?? messageAt(errors, `piece.parts.${index}.shape`);
  const count = part.shape.points.split('\n').filter((l) => l.trim() !== '').length;
  return (
    <div className="col-span-full">
      <label htmlFor={id} className="mb-0.5 block text-xs font-medium text-walnut-700">
        Outline points of {part.name} — one “x, y” a line, going round the outline ({count} points)
      </label>
      <textarea
        id={id}
        rows={4}
        value={part.shape.points}
        onChange={(e) => onPoints(e.target.value)}
        spellCheck={false}
        aria-invalid={error ? true : undefined}
        className={`num block w-full rounded-md border bg-white px-2 py-1.5 font-mono text-xs ${error ? 'border-brick-600' : 'border-walnut-200'}`}
      />
      <FieldMessage id={id} error={error} />
    </div>
  );
}

function CutOuts({ part, index, onCutOuts, errors, unit }: { part: PartDraft; index: number; onCutOuts: (c: CutOutDraft[]) => void; errors: Record<string, string>; unit: LengthUnit }) {
  const set = (j: number, patch: Partial<CutOutDraft>) => onCutOuts(part.cutOuts.map((c, k) => (k === j ? { ...c, ...patch } : c)));
  return (
    <div className="col-span-full rounded-md border border-dashed border-walnut-200 bg-parchment-50 px-3 py-2">
      <div className="flex items-center justify-between">
        <p className="text-xs font-semibold text-walnut-700">
          <Scissors className="mr-1 inline h-3.5 w-3.5" aria-hidden />
          Cut-outs of {part.name} (openings taken off each face)
        </p>
        <Button size="sm" variant="ghost" onClick={() => onCutOuts([...part.cutOuts, { key: rowKey('cut'), kind: 'rectangle', dims: { length: '', width: '' }, points: '', count: '1' }])}>
          <Plus className="h-3.5 w-3.5" aria-hidden /> Add cut-out
        </Button>
      </div>
      {part.cutOuts.map((c, j) => (
        <div key={c.key} className="mt-1.5 grid grid-cols-[9rem_repeat(3,minmax(0,1fr))_auto] items-start gap-2">
          <MiniSelect<CutOutKind>
            label={`Cut-out ${j + 1} shape`}
            value={c.kind}
            options={CUT_OUT_KINDS.map((k) => ({ value: k, label: SHAPE_LABELS[k] }))}
            onChange={(kind) => {
              const dims: Record<string, string> = {};
              for (const f of SHAPE_FIELDS[kind]) dims[f.name] = c.dims[f.name] ?? '';
              set(j, { kind, dims });
            }}
          />
          {SHAPE_FIELDS[c.kind].map((f) => (
            <LengthInput
              key={f.name}
              unit={unit}
              label={`Cut-out ${j + 1} ${f.label.toLowerCase()}`}
              placeholder={f.label}
              value={c.dims[f.name] ?? ''}
              onValue={(v) => set(j, { dims: { ...c.dims, [f.name]: v } })}
              error={messageAt(errors, `piece.parts.${index}.cutOuts.${j}.${f.name}`)}
            />
          ))}
          {c.kind === 'polygon' && (
            <label className="col-span-3 block text-xs text-walnut-700">
              <span className="sr-only">{`Cut-out ${j + 1} outline points`}</span>
              <textarea
                aria-label={`Cut-out ${j + 1} outline points`}
                rows={3}
                value={c.points}
                placeholder={'x, y one pair a line'}
                onChange={(e) => set(j, { points: e.target.value })}
                spellCheck={false}
                className="num block w-full rounded-md border border-walnut-200 bg-white px-2 py-1 font-mono text-xs"
              />
              {messageAt(errors, `piece.parts.${index}.cutOuts.${j}.points`, { under: true }) && (
                <span className="text-brick-700">{messageAt(errors, `piece.parts.${index}.cutOuts.${j}.points`, { under: true })}</span>
              )}
            </label>
          )}
          {c.kind !== 'polygon' && SHAPE_FIELDS[c.kind].length < 2 && <span />}
          <CellInput label={`Cut-out ${j + 1} count`} value={c.count} onValue={(v) => set(j, { count: v })} suffix="each" inputMode="numeric" error={messageAt(errors, `piece.parts.${index}.cutOuts.${j}.count`)} />
          <Button size="sm" variant="ghost" aria-label={`Remove cut-out ${j + 1}`} onClick={() => onCutOuts(part.cutOuts.filter((_, k) => k !== j))}>
            <Trash2 className="h-3.5 w-3.5" aria-hidden />
          </Button>
        </div>
      ))}
    </div>
  );
}

interface PartRowProps {
  part: PartDraft;
  index: number;
  /** Messages under this row's path, keyed by the rest of the path. */
  errors: Record<string, string>;
  areaM2: number | undefined;
  canRemove: boolean;
  unit: LengthUnit;
  units: UnitSystem;
  speciesOptions: { value: string; label: string }[];
  onSet: (index: number, patch: Partial<PartDraft>) => void;
  onDuplicate: (index: number) => void;
  onRemove: (index: number) => void;
  /** In a long table drawn in part: the row's offset in the list, the list's length, and the ref that measures it. */
  top?: number;
  setSize?: number;
  measureRef?: (el: HTMLLIElement | null) => void;
}

function PartRowView({ part: p, index: i, errors, areaM2, canRemove, unit, units, speciesOptions, onSet, onDuplicate, onRemove, top, setSize, measureRef }: PartRowProps) {
  const at = `piece.parts.${i}`;
  const set = (patch: Partial<PartDraft>) => onSet(i, patch);
  return (
    <li
      ref={measureRef}
      data-index={i}
      aria-setsize={setSize}
      aria-posinset={setSize === undefined ? undefined : i + 1}
      style={top === undefined ? undefined : { position: 'absolute', top: 0, left: 0, width: '100%', transform: `translateY(${top}px)` }}
      className="rounded-lg border border-parchment-200 bg-white px-3 py-2.5 shadow-sm"
      aria-label={`Part ${i + 1}: ${p.name}`}
      data-testid={`part-row-${i}`}
    >
      <div className="flex flex-wrap items-start gap-2">
        <span className="num mt-1.5 w-6 text-right text-xs font-semibold text-walnut-400">{i + 1}</span>
        <CellInput className="min-w-48 flex-1" label={`Name of part ${i + 1}`} value={p.name} onValue={(v) => set({ name: v })} error={messageAt(errors, `${at}.name`)} />
        <div className="num mt-1 min-w-24 rounded bg-parchment-100 px-2 py-1 text-right text-sm font-semibold text-walnut-800" aria-label={`Area of ${p.name}`} data-testid={`row-area-${i}`}>
          {areaM2 === undefined ? '—' : formatArea(areaM2, units)}
        </div>
        <Button size="sm" variant="ghost" aria-label={`Duplicate ${p.name}`} onClick={() => onDuplicate(i)}>
          <Copy className="h-3.5 w-3.5" aria-hidden />
        </Button>
        <Button size="sm" variant="ghost" aria-label={`Remove ${p.name}`} disabled={!canRemove} onClick={() => onRemove(i)}>
          <Trash2 className="h-3.5 w-3.5" aria-hidden />
        </Button>
      </div>
      <div className="mt-2 grid grid-cols-2 gap-2 pl-8 sm:grid-cols-[repeat(auto-fill,minmax(9.5rem,1fr))]">
        <MiniSelect<ShapeKind> showLabel label="Shape" value={p.shape.kind} options={SHAPES} onChange={(kind) => set({ shape: setShapeKind(p.shape, kind) })} />
        {SHAPE_FIELDS[p.shape.kind].map((f) => (
          <LengthInput
            key={f.name}
            showLabel
            unit={unit}
            label={f.label}
            aria-label={`${f.label} of ${p.name}`}
            value={p.shape.dims[f.name] ?? ''}
            onValue={(v) => set({ shape: { ...p.shape, dims: { ...p.shape.dims, [f.name]: v } } })}
            error={messageAt(errors, `${at}.shape.${f.name}`)}
            hint={false}
          />
        ))}
        <CellInput showLabel label="Count" aria-label={`Count of ${p.name}`} value={p.count} onValue={(v) => set({ count: v })} inputMode="numeric" error={messageAt(errors, `${at}.count`)} />
        <MiniSelect<'1' | '2'>
          showLabel
          label="Faces"
          value={String(p.faces) as '1' | '2'}
          options={[
            { value: '1', label: 'One side' },
            { value: '2', label: 'Both sides' },
          ]}
          onChange={(v) => set({ faces: v === '2' ? 2 : 1 })}
        />
        {p.shape.kind === 'polygon' && <PointsField part={p} index={i} errors={errors} onPoints={(points) => set({ shape: { ...p.shape, points } })} />}
      </div>
      <div className="mt-2 grid grid-cols-2 items-start gap-2 pl-8 sm:grid-cols-[repeat(auto-fill,minmax(9.5rem,1fr))]">
        <MiniSelect showLabel label="Wood" value={p.species} options={speciesOptions} onChange={(v) => set({ species: v })} error={messageAt(errors, `${at}.species`)} />
        <MiniSelect showLabel label="Complexity" value={p.complexity} options={COMPLEXITIES.map((c) => ({ value: c, label: COMPLEXITY_LABELS[c] }))} onChange={(v) => set({ complexity: v })} />
        <div className="flex flex-col gap-1 pt-4">
          <CheckField label="Veneered" checked={p.veneered} onChange={(v) => set({ veneered: v })} />
          <CheckField label="Show face" checked={p.show} onChange={(v) => set({ show: v })} />
        </div>
        <div className="pt-4">
          <CheckField label="Edges finished" checked={p.edges} onChange={(v) => set({ edges: v })} />
        </div>
        {p.edges && (
          <LengthInput showLabel unit={unit} label="Thickness" aria-label={`Thickness of ${p.name}`} value={p.thickness} onValue={(v) => set({ thickness: v })} placeholder="20 mm" error={messageAt(errors, `${at}.thickness`)} />
        )}
      </div>
      {(p.cutOuts.length > 0 || ['rectangle', 'polygon', 'ellipse', 'circle'].includes(p.shape.kind)) && (
        <div className="mt-2 pl-8">
          <CutOuts part={p} index={i} errors={errors} unit={unit} onCutOuts={(cutOuts) => set({ cutOuts })} />
        </div>
      )}
    </li>
  );
}

/** A row re-renders only when its own part, messages or area change: typing in one row leaves the others alone. */
const PartRow = memo(
  PartRowView,
  (a, b) =>
    a.part === b.part &&
    a.index === b.index &&
    a.areaM2 === b.areaM2 &&
    a.canRemove === b.canRemove &&
    a.unit === b.unit &&
    a.units === b.units &&
    a.speciesOptions === b.speciesOptions &&
    a.top === b.top &&
    a.setSize === b.setSize &&
    a.measureRef === b.measureRef &&
    JSON.stringify(a.errors) === JSON.stringify(b.errors),
);

/** The messages that belong to one row. */
function rowErrors(errors: Record<string, string>, index: number): Record<string, string> {
  const prefix = `piece.parts.${index}.`;
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(errors)) if (k.startsWith(prefix)) out[k] = v;
  return out;
}

/**
 * A parts table this long is drawn in part: only the rows in view (and a few either side) are in the page, placed
 * where the whole list would put them, so a keystroke's frame lays out and paints a screenful of rows, not hundreds.
 * Shorter tables are drawn whole.
 */
const DRAWN_WHOLE_UP_TO = 40;
/** Space between rows, px (the whole table's `space-y-3`). */
const ROW_GAP = 12;

function VirtualRows({ count, keyAt, row }: { count: number; keyAt: (i: number) => string; row: (i: number, place: { top: number; setSize: number; measureRef: (el: HTMLLIElement | null) => void }) => ReactNode }) {
  const list = useRef<HTMLOListElement>(null);
  // The list's top in the page (the window scrolls, not the list); it moves when something above it grows.
  const [scrollMargin, setScrollMargin] = useState(0);
  useLayoutEffect(() => {
    const el = list.current;
    if (!el) return;
    const measure = () => setScrollMargin(Math.round(el.getBoundingClientRect().top + window.scrollY));
    measure();
    if (typeof ResizeObserver === 'undefined') return;
    const observer = new ResizeObserver(measure);
    observer.observe(document.body);
    return () => observer.disconnect();
  }, []);
  // The row holding the focus stays in the page while it is scrolled out of view, so typing and Tab carry on there.
  const [focused, setFocused] = useState<number | null>(null);
  const onFocus = (e: FocusEvent<HTMLOListElement>) => {
    const at = (e.target as HTMLElement).closest<HTMLElement>('li[data-index]')?.dataset.index;
    if (at !== undefined) setFocused(Number(at));
  };
  const rangeExtractor = useCallback(
    (range: Range) => {
      const shown = defaultRangeExtractor(range);
      return focused === null || focused >= range.count || shown.includes(focused) ? shown : [...shown, focused].sort((a, b) => a - b);
    },
    [focused],
  );
  const virtualizer = useWindowVirtualizer({ count, estimateSize: () => 210, overscan: 3, gap: ROW_GAP, scrollMargin, getItemKey: keyAt, rangeExtractor });
  return (
    <ol ref={list} className="relative" style={{ height: virtualizer.getTotalSize() }} onFocus={onFocus}>
      {virtualizer.getVirtualItems().map((item) => row(item.index, { top: item.start - scrollMargin, setSize: count, measureRef: virtualizer.measureElement }))}
    </ol>
  );
}

/** The parts list, edited freely: shape and sizes, faces, edges, count, cut-outs, wood and complexity. */
export function PartsTable({ parts, onChange, errors, unit, units, species, areas }: PartsTableProps) {
  // Row callbacks stay the same between renders (so rows can skip re-rendering) and read the latest list.
  const latest = useRef({ parts, onChange });
  useEffect(() => {
    latest.current = { parts, onChange };
  });
  const onSet = useCallback((i: number, patch: Partial<PartDraft>) => {
    const { parts: list, onChange: change } = latest.current;
    change(list.map((p, k) => (k === i ? { ...p, ...patch } : p)));
  }, []);
  const onDuplicate = useCallback((i: number) => {
    const { parts: list, onChange: change } = latest.current;
    change([...list.slice(0, i + 1), duplicatePart(list[i]!, list.map((x) => x.id)), ...list.slice(i + 1)]);
  }, []);
  const onRemove = useCallback((i: number) => {
    const { parts: list, onChange: change } = latest.current;
    change(list.filter((_, k) => k !== i));
  }, []);
  const speciesOptions = useMemo(() => species.map((s) => ({ value: s.key, label: `${s.name}${s.needsGrainFill ? ' (open pores)' : ''}` })), [species]);
  const totalError = messageAt(errors, 'piece.parts');
  const row = (i: number, place?: { top: number; setSize: number; measureRef: (el: HTMLLIElement | null) => void }) => {
    const p = parts[i]!;
    return (
      <PartRow
        key={p.key}
        part={p}
        index={i}
        errors={rowErrors(errors, i)}
        areaM2={areas[i]?.areaM2}
        canRemove={parts.length > 1}
        unit={unit}
        units={units}
        speciesOptions={speciesOptions}
        onSet={onSet}
        onDuplicate={onDuplicate}
        onRemove={onRemove}
        {...place}
      />
    );
  };
  return (
    <div className="space-y-3">
      {totalError && <FieldMessage id="parts-list" error={`Parts: ${totalError}`} />}
      {parts.length < DRAWN_WHOLE_UP_TO ? <ol className="space-y-3">{parts.map((_, i) => row(i))}</ol> : <VirtualRows count={parts.length} keyAt={(i) => parts[i]!.key} row={row} />}
      <Button variant="secondary" onClick={() => onChange([...parts, blankPart(parts[parts.length - 1]?.species ?? species[0]?.key ?? '')])}>
        <Plus className="h-4 w-4" aria-hidden /> Add a part
      </Button>
    </div>
  );
}
