import { Hammer, LayoutList, ListRestart, Save, Thermometer, TriangleAlert, Wand2 } from 'lucide-react';
import { memo, useCallback, useMemo, useState, type FormEvent, type ReactNode } from 'react';
import { estimate } from '@shared/calc';
import { TEMPLATE_KEYS, TEMPLATE_DIMENSIONS, type EstimateInput, type EstimateResult, type TemplateKey } from '@shared/schemas/calc';
import type { PieceKind } from '@shared/schemas/customers';
import { UnitParseError } from '@shared/units';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { ApiError } from '@/lib/api';
import { BrowserDraftKeeper, clearBrowserDraft, useBrowserDraft, useOnline } from '@/lib/browser-draft';
import type { CalcCatalog } from '@/lib/catalog';
import type { Catalog, Species } from '@shared/schemas/catalog';
import type { LengthUnit, UnitSystem } from '@shared/units';
import { useDisplayUnits } from '../lib/display-units';
import {
  buildInput, defaultDimension, describePath, DIMENSION_LABELS, errorsByPath, messageAt, partsFromTemplate, systemStages, TEMPLATE_LABELS,
  TEMPLATES_FOR_KIND, type EstimateDraft, type PartDraft, type StageDraft,
} from '../lib/draft';
import { formatArea } from '../lib/measures';
import { CautionsPanel } from './cautions';
import { CellInput, CheckField, LengthInput, MiniSelect } from './fields';
import { PartsTable } from './parts-table';
import { DeferredResultsDetail } from './results-detail';
import { ResultsSummary } from './results-summary';
import { StagesEditor } from './stages-editor';
import { UnitsToggle } from './units-toggle';

export interface SavePayload {
  input: EstimateInput;
  title: string;
  note: string;
}

export interface EstimateEditorProps {
  calc: CalcCatalog;
  pieceKind: PieceKind;
  initial: EstimateDraft;
  saveLabel: string;
  saving?: boolean;
  saveError?: unknown;
  /** Shown above the save button (a conflict with someone else's save, for instance). */
  notice?: ReactNode;
  onSave: (payload: SavePayload) => void;
  onCancel?: () => void;
  /** Local date the engine uses when no start date is given (tests pin it). */
  today?: string;
  /**
   * Where this browser keeps what is typed until it is saved (one key per new estimate of a piece, or per revision
   * being edited): offered again on return after a dropped connection or a closed tab. The page clears it on save.
   */
  draftKey?: string;
}

type Outcome = { ok: true; result: EstimateResult } | { ok: false; errors: Record<string, string> };

/**
 * The live figures and cautions beside the form redraw only when the figures (or the units) change: a keystroke is
 * drawn first with the figures it had, and the engine's new figures follow on the deferred draft.
 */
const LiveSummary = memo(ResultsSummary);
const LiveCautions = memo(CautionsPanel);
/** The form's sections redraw only when their own fields, messages or figures change (their callbacks are stable). */
const MemoPartsTable = memo(PartsTable);
const MemoStagesEditor = memo(StagesEditor);

// Icons made once: an element that is the same object as last time is not drawn again.
const HAMMER = <Hammer className="h-4 w-4 text-amber-600" aria-hidden />;
const WAND = <Wand2 className="h-4 w-4 text-amber-600" aria-hidden />;
const THERMOMETER = <Thermometer className="h-4 w-4 text-amber-600" aria-hidden />;
const SAVE = <Save className="h-4 w-4" aria-hidden />;
const NO_STAGE_RESULTS: never[] = [];

type Patch = (p: Partial<EstimateDraft>) => void;

const Panel = memo(function Panel({ title, icon, children, actions }: { title: string; icon: ReactNode; children: ReactNode; actions?: ReactNode }) {
  return (
    <section className="rounded-xl border border-parchment-200 bg-white shadow-card">
      <header className="flex flex-wrap items-center justify-between gap-3 border-b border-parchment-200 px-5 py-3">
        <h2 className="flex items-center gap-2 text-lg font-semibold text-walnut-800">
          {icon}
          {title}
        </h2>
        {actions}
      </header>
      <div className="px-5 py-4">{children}</div>
    </section>
  );
});

/** Server field names carry the request's "input." prefix; the editor's paths start inside the input. */
function serverErrors(error: unknown): Record<string, string> {
  if (!(error instanceof ApiError)) return {};
  const out: Record<string, string> = {};
  for (const e of error.errors.length > 0 ? error.errors : error.field ? [{ field: error.field, message: error.message }] : []) {
    out[e.field.replace(/^input\./, '')] ??= e.message;
  }
  return out;
}

/** The piece's section, from a template or as a parts table: its button switches between the two. */
function PiecePanel({ action, children }: { action: ReactNode; children: ReactNode }) {
  return (
    <Panel title="The piece" icon={HAMMER} actions={action}>
      {children}
    </Panel>
  );
}

/** The piece from a template: the template, its sizes, the wood, and what it makes. */
const TemplatePiece = memo(function TemplatePiece({
  template, dimensions, lengthUnit, species, veneered, units, templates, speciesOptions, catalogSpecies, errors, partCount, areaM2, patch,
}: {
  template: TemplateKey;
  dimensions: Record<string, string>;
  lengthUnit: LengthUnit;
  species: string;
  veneered: boolean;
  units: UnitSystem;
  templates: TemplateKey[];
  speciesOptions: { value: string; label: string }[];
  catalogSpecies: readonly Species[];
  errors: Record<string, string>;
  partCount: number | undefined;
  areaM2: number | undefined;
  patch: Patch;
}) {
  const [templateError, setTemplateError] = useState<string>();
  const wood = catalogSpecies.find((s) => s.key === species);
  const editParts = () => {
    try {
      const parts = partsFromTemplate({ template, dimensions, species, veneered }, lengthUnit);
      setTemplateError(undefined);
      patch({ mode: 'parts', parts });
    } catch (error) {
      setTemplateError(error instanceof UnitParseError ? error.message : String(error));
    }
  };
  return (
    <PiecePanel
      action={
        <Button size="sm" variant="secondary" onClick={editParts}>
          <LayoutList className="h-3.5 w-3.5" aria-hidden /> Edit the parts table
        </Button>
      }
    >
      <div className="space-y-4">
        <p className="text-sm text-walnut-600">
          Pick a template and type its sizes with their units — <span className="font-medium">190 cm</span>, <span className="font-medium">6 ft 3 in</span>,{' '}
          <span className="font-medium">1900 mm</span>. A bare number is in {lengthUnit}. Leave a size empty to use the template's usual one.
        </p>
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <MiniSelect<TemplateKey>
            showLabel
            label="Template"
            value={template}
            options={templates.map((t) => ({ value: t, label: TEMPLATE_LABELS[t] }))}
            onChange={(next) => {
              const dims: Record<string, string> = {};
              for (const name of TEMPLATE_DIMENSIONS[next]) dims[name] = dimensions[name] ?? '';
              patch({ template: next, dimensions: dims });
            }}
          />
          {TEMPLATE_DIMENSIONS[template].map((name) => (
            <LengthInput
              key={name}
              showLabel
              unit={lengthUnit}
              label={DIMENSION_LABELS[name] ?? name}
              value={dimensions[name] ?? ''}
              placeholder={defaultDimension(template, name, units)}
              onValue={(v) => {
                setTemplateError(undefined);
                patch({ dimensions: { ...dimensions, [name]: v } });
              }}
              error={messageAt(errors, `piece.dimensions.${name}`)}
            />
          ))}
        </div>
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <MiniSelect showLabel label="Wood" value={species} options={speciesOptions} onChange={(next) => patch({ species: next })} error={messageAt(errors, 'piece.species')} hint={wood ? (wood.needsGrainFill ? 'Open pores: grain filled' : wood.pores === 'ebonised' ? 'Ebonised: no grain filling' : 'Closed pores: no grain filling') : undefined} />
          <div className="pt-5">
            <CheckField label="Veneered" hint="Careful stripping and cutting back" checked={veneered} onChange={(next) => patch({ veneered: next })} />
          </div>
          <div className="pt-5 text-sm text-walnut-600 lg:col-span-2">
            {partCount !== undefined && areaM2 !== undefined && (
              <p>
                The {TEMPLATE_LABELS[template].toLowerCase()} template makes <span className="font-semibold text-walnut-800">{partCount} parts</span>,{' '}
                <span className="num font-semibold text-walnut-800" data-testid="piece-area">
                  {formatArea(areaM2, units)}
                </span>{' '}
                to polish. Edit the parts table to change any of them.
              </p>
            )}
          </div>
        </div>
        {templateError && <Alert tone="error" title="The parts table cannot be made yet">{templateError}</Alert>}
      </div>
    </PiecePanel>
  );
});

/** The piece as a parts table, edited freely. */
const PartsPiece = memo(function PartsPiece({ parts, errors, lengthUnit, units, species, areas, patch }: {
  parts: PartDraft[];
  errors: Record<string, string>;
  lengthUnit: LengthUnit;
  units: UnitSystem;
  species: readonly Species[];
  areas: readonly (EstimateResult['parts'][number] | undefined)[];
  patch: Patch;
}) {
  const onParts = useCallback((next: PartDraft[]) => patch({ parts: next }), [patch]);
  const backToTemplate = () => {
    if (window.confirm('Go back to the template? Your edits to the parts table will be lost.')) patch({ mode: 'template' });
  };
  return (
    <PiecePanel
      action={
        <Button size="sm" variant="ghost" onClick={backToTemplate}>
          <ListRestart className="h-3.5 w-3.5" aria-hidden /> Back to the template
        </Button>
      }
    >
      <MemoPartsTable parts={parts} onChange={onParts} errors={errors} unit={lengthUnit} units={units} species={species} areas={areas} />
    </PiecePanel>
  );
});

/** The finishing system and this estimate's own copy of its stages. */
const SystemPanel = memo(function SystemPanel({ system, stages, errors, results, catalog, patch }: {
  system: string;
  stages: StageDraft[];
  errors: Record<string, string>;
  results: EstimateResult['stages'];
  catalog: Catalog;
  patch: Patch;
}) {
  const onStages = useCallback((next: StageDraft[]) => patch({ stages: next }), [patch]);
  const chosen = catalog.systems.find((s) => s.key === system);
  return (
    <Panel title="Finishing system and stages" icon={WAND}>
      <div className="mb-4 grid gap-4 sm:grid-cols-[18rem_1fr]">
        <MiniSelect
          showLabel
          label="Finishing system"
          value={system}
          options={catalog.systems.map((s) => ({ value: s.key, label: s.name }))}
          onChange={(key) => patch({ system: key, stages: systemStages(catalog, key) })}
          error={messageAt(errors, 'system')}
        />
        <p className="self-end text-sm text-walnut-600">
          {chosen?.description} This estimate keeps its own copy of the stages: change them here without touching the workshop's system.
        </p>
      </div>
      <MemoStagesEditor stages={stages} onChange={onStages} errors={errors} results={results} catalog={catalog} />
    </Panel>
  );
});

/** The job: climate, start, discount, title and the revision's note. */
const JobPanel = memo(function JobPanel({ temperatureC, humidityPct, startDate, discountPct, title, note, errors, titleError, noteError, maxDiscountPct, patch }: Pick<
  EstimateDraft,
  'temperatureC' | 'humidityPct' | 'startDate' | 'discountPct' | 'title' | 'note'
> & {
  errors: Record<string, string>;
  titleError: string | undefined;
  noteError: string | undefined;
  maxDiscountPct: number;
  patch: Patch;
}) {
  return (
    <Panel title="The job" icon={THERMOMETER}>
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <CellInput showLabel label="Workshop temperature" suffix="°C" inputMode="decimal" value={temperatureC} onValue={(v) => patch({ temperatureC: v })} error={messageAt(errors, 'climate.temperatureC')} hint="Cold slows drying" />
        <CellInput showLabel label="Relative humidity" suffix="% RH" inputMode="decimal" value={humidityPct} onValue={(v) => patch({ humidityPct: v })} error={messageAt(errors, 'climate.humidityPct')} hint="Above 75 % shellac may bloom" />
        <CellInput showLabel label="Start date" type="date" value={startDate} onValue={(v) => patch({ startDate: v })} error={messageAt(errors, 'startDate')} />
        <CellInput showLabel label="Discount" suffix="%" inputMode="decimal" value={discountPct} onValue={(v) => patch({ discountPct: v })} error={messageAt(errors, 'discountPct')} hint={`Workshop cap ${maxDiscountPct} %`} />
      </div>
      <div className="mt-4 grid gap-4 sm:grid-cols-2">
        <CellInput showLabel label="Title" value={title} onValue={(v) => patch({ title: v })} maxLength={160} error={titleError} />
        <CellInput showLabel label="Note for this revision" placeholder="What changed, and why" value={note} onValue={(v) => patch({ note: v })} maxLength={1000} error={noteError} />
      </div>
    </Panel>
  );
});

/**
 * The estimate editor: the piece (template or parts table), the finishing system and its stages, the job's
 * climate, start and discount; the shared engine prices it on every change, as the finisher types.
 */
export function EstimateEditor({ calc, pieceKind, initial, saveLabel, saving = false, saveError, notice, onSave, onCancel, today, draftKey }: EstimateEditorProps) {
  const { catalog, settings } = calc;
  const [draft, setDraft] = useState<EstimateDraft>(initial);
  const kept = useBrowserDraft(draftKey, initial);
  const online = useOnline();
  const [units, setUnits] = useDisplayUnits(settings.units);
  const [submitted, setSubmitted] = useState(false);
  const patch = useCallback<Patch>((p) => setDraft((d) => ({ ...d, ...p })), []);

  // The engine runs in the keystroke's own render, so the live figures change with the field typed in (it takes
  // about a millisecond: unchanged parts keep their engine objects). The detail below trails, once typing pauses.
  const input = useMemo(() => buildInput(draft), [draft]);
  const outcome = useMemo<Outcome>(() => {
    try {
      return { ok: true, result: estimate(input, catalog, today ? { today } : {}) };
    } catch (error) {
      return { ok: false, errors: errorsByPath(error) };
    }
  }, [input, catalog, today]);
  // The last good figures, kept while a field is wrong. Updated during render (React's pattern for state derived
  // from the previous render): an effect would commit, then render the whole editor a second time on every change.
  const [lastGood, setLastGood] = useState<EstimateResult | null>(outcome.ok ? outcome.result : null);
  if (outcome.ok && outcome.result !== lastGood) setLastGood(outcome.result);

  const fromServer = useMemo(() => serverErrors(saveError), [saveError]);
  // The same object while the messages are the same, so the sections given them need not redraw.
  const errorsText = JSON.stringify({ ...fromServer, ...(outcome.ok ? {} : outcome.errors) });
  const errors = useMemo(() => JSON.parse(errorsText) as Record<string, string>, [errorsText]);
  const result = outcome.ok ? outcome.result : lastGood;
  const stale = !outcome.ok;

  const knownPaths = (path: string): boolean =>
    /^piece\.(dimensions\.\w+|species|parts(\.\d+\.(name|count|species|thickness|shape(\.\w+)?|shape\.points.*|cutOuts\.\d+\.\w+))?)$/.test(path) ||
    /^stages\.\d+\.\w+$/.test(path) ||
    /^(climate\.(temperatureC|humidityPct)|startDate|discountPct|system)$/.test(path);
  const elsewhere = Object.entries(errors).filter(([path]) => !knownPaths(path));

  const templates = useMemo(() => [...TEMPLATES_FOR_KIND[pieceKind], ...TEMPLATE_KEYS.filter((t) => !TEMPLATES_FOR_KIND[pieceKind].includes(t))], [pieceKind]);
  const speciesOptions = useMemo(() => catalog.species.map((s) => ({ value: s.key, label: s.name })), [catalog]);
  // Areas by row: the figures' own parts, or none while the table cannot be priced.
  const areas = useMemo(() => (outcome.ok ? outcome.result.parts : draft.parts.map(() => undefined)), [outcome, draft.parts]);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    setSubmitted(true);
    if (!outcome.ok) return;
    onSave({ input: buildInput(draft), title: draft.title.trim(), note: draft.note.trim() });
  };

  return (
    <form onSubmit={submit} noValidate className="space-y-6" aria-label="Estimate">
      <BrowserDraftKeeper draftKey={draftKey} value={draft} initial={initial} />
      {kept.found && (
        <Alert tone="warning" title="Unsaved work on this device">
          <p>
            What you typed here on {new Date(kept.found.savedAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })} was never saved to the workshop. Restore it to carry on, or
            discard it to start from the figures below.
          </p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button
              size="sm"
              variant="accent"
              onClick={() => {
                setDraft(kept.found!.value);
                kept.dismiss();
              }}
            >
              Restore my unsaved work
            </Button>
            <Button
              size="sm"
              variant="ghost"
              onClick={() => {
                if (draftKey) clearBrowserDraft(draftKey);
                kept.dismiss();
              }}
            >
              Discard it
            </Button>
          </div>
        </Alert>
      )}
      {!online && (
        <Alert tone="warning" title="No connection">
          What you type is kept on this device and offered again if the page is closed. Save once the connection is back.
        </Alert>
      )}
      {calc.warnings.length > 0 && (
        <Alert tone="warning" title="The price list needs attention">
          <ul className="list-disc pl-4">
            {calc.warnings.map((w) => (
              <li key={w.code + w.text}>{w.text}</li>
            ))}
          </ul>
        </Alert>
      )}
      <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,1fr)_26rem]">
        <div className="min-w-0 space-y-6">
          {draft.mode === 'template' ? (
            <TemplatePiece
              template={draft.template}
              dimensions={draft.dimensions}
              lengthUnit={draft.lengthUnit}
              species={draft.species}
              veneered={draft.veneered}
              units={units}
              templates={templates}
              speciesOptions={speciesOptions}
              catalogSpecies={catalog.species}
              errors={errors}
              partCount={result?.parts.length}
              areaM2={result?.totals.areaM2}
              patch={patch}
            />
          ) : (
            <PartsPiece parts={draft.parts} errors={errors} lengthUnit={draft.lengthUnit} units={units} species={catalog.species} areas={areas} patch={patch} />
          )}

          <SystemPanel system={draft.system} stages={draft.stages} errors={errors} results={result?.stages ?? NO_STAGE_RESULTS} catalog={catalog} patch={patch} />

          <JobPanel
            temperatureC={draft.temperatureC}
            humidityPct={draft.humidityPct}
            startDate={draft.startDate}
            discountPct={draft.discountPct}
            title={draft.title}
            note={draft.note}
            errors={errors}
            titleError={fromServer.title}
            noteError={fromServer.note}
            maxDiscountPct={catalog.pricing.maxDiscountPct}
            patch={patch}
          />

          <div className="sticky bottom-0 z-10 -mx-2 space-y-3 rounded-t-xl border-t border-parchment-200 bg-parchment-50/95 px-2 py-3 backdrop-blur">
            {notice}
            {saveError !== undefined && saveError !== null && !(saveError instanceof ApiError && saveError.code === 'stale_revision') && (
              <Alert tone="error" title="Not saved">
                {saveError instanceof Error ? saveError.message : String(saveError)}
              </Alert>
            )}
            {submitted && !outcome.ok && (
              <Alert tone="error" title="Not saved yet">
                Fix the fields marked ▲ first; the figures beside them are from the last good version.
              </Alert>
            )}
            <div className="flex flex-wrap items-center justify-end gap-2">
              <p className="mr-auto text-xs text-walnut-500">The server prices the estimate again when you save; what you see is what it will save.</p>
              {onCancel && (
                <Button variant="secondary" onClick={onCancel}>
                  Cancel
                </Button>
              )}
              <Button type="submit" variant="accent" busy={saving}>
                {SAVE} {saveLabel}
              </Button>
            </div>
          </div>
        </div>

        <aside className="space-y-4 xl:sticky xl:top-4" aria-label="Live estimate">
          <div className="flex items-center justify-between gap-2">
            <p className="text-sm font-semibold text-walnut-700">Live figures</p>
            <UnitsToggle value={units} onChange={setUnits} />
          </div>
          {elsewhere.length > 0 && (
            <div role="alert" className="rounded-lg border border-brick-600/40 bg-brick-100 px-3 py-2 text-sm text-brick-700">
              <p className="flex items-center gap-1.5 font-semibold">
                <TriangleAlert className="h-4 w-4" aria-hidden /> To fix
              </p>
              <ul className="mt-1 list-disc pl-5">
                {elsewhere.map(([path, message]) => (
                  <li key={path}>
                    {describePath(path, draft)}: {message}
                  </li>
                ))}
              </ul>
            </div>
          )}
          {result ? (
            <>
              <LiveSummary result={result} units={units} stale={stale} heading="This estimate" />
              <LiveCautions result={result} units={units} compact />
            </>
          ) : (
            <Alert tone="warning" title="Nothing to price yet">
              Fix the fields marked ▲ and the figures appear here.
            </Alert>
          )}
        </aside>
      </div>
      {result && <DeferredResultsDetail result={result} units={units} catalog={catalog} stale={stale} />}
    </form>
  );
}
