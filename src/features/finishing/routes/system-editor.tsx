import { ArrowDown, ArrowLeft, ArrowUp, Check, ChevronDown, ChevronRight, CircleCheck, CircleSlash, Plus, Trash2 } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router-dom';
import { APPLIES_TO, cutUnit, gallonName, STAGE_KINDS, type GallonBasis, type Stage } from '@shared/schemas/catalog';
import { SystemUpdateSchema, type FinishingSystemDto } from '@shared/schemas/finishing-admin';
import type { MaterialDto } from '@shared/schemas/price-list';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { SelectField, TextField } from '@/components/field';
import { Spinner } from '@/components/spinner';
import { paths } from '@/config/paths';
import { useMe } from '@/lib/me';
import { useWorkshop } from '@/lib/workshop';
import { useMaterials } from '@/lib/materials';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { plainMessage } from '@/lib/form-errors';
import { useSaveSystem, useSystem } from '../api/finishing';

const APPLIES_LABELS: Record<(typeof APPLIES_TO)[number], string> = { all: 'every part', 'open-pored': 'open-pored woods only', 'show-faces': 'show faces only' };

type NumKey = 'sessions' | 'coatsPerSession' | 'cutLb' | 'polishMlPerM2PerCoat' | 'spiritMlPerM2PerSession' | 'labourMinPerM2PerCoat' | 'setupMinPerSession' | 'restHours';
// The cut's unit is the workshop's gallon (a setting), filled in where the stage is drawn.
const NUMBERS: { key: NumKey; label: string; unit: string; step?: string }[] = [
  { key: 'sessions', label: 'Sessions', unit: 'count', step: '1' },
  { key: 'coatsPerSession', label: 'Coats per session', unit: 'count', step: '1' },
  { key: 'cutLb', label: 'Shellac cut', unit: 'cut' },
  { key: 'polishMlPerM2PerCoat', label: 'Polish per coat', unit: 'mL/m²' },
  { key: 'spiritMlPerM2PerSession', label: 'Extra spirit per session', unit: 'mL/m²' },
  { key: 'labourMinPerM2PerCoat', label: 'Labour per coat', unit: 'min/m²' },
  { key: 'setupMinPerSession', label: 'Set-up per session', unit: 'min' },
  { key: 'restHours', label: 'Rest after each session', unit: 'h at 20 °C' },
];

function plain(errors: Record<string, string>): Record<string, string> {
  return Object.fromEntries(Object.entries(errors).map(([k, v]) => [k, plainMessage(v)]));
}

function StageCard({
  stage,
  index,
  count,
  readOnly,
  errors,
  materials,
  gallon,
  onChange,
  onMove,
  onRemove,
}: {
  stage: Stage;
  index: number;
  count: number;
  readOnly: boolean;
  errors: Record<string, string>;
  materials: MaterialDto[];
  gallon: GallonBasis | undefined;
  onChange: (s: Stage) => void;
  onMove: (delta: -1 | 1) => void;
  onRemove: () => void;
}) {
  const prefix = `stages.${index}.`;
  const stageErrors = Object.keys(errors).filter((k) => k.startsWith(prefix));
  const [open, setOpen] = useState(false);
  const expanded = open || stageErrors.length > 0;
  const e = (f: string) => errors[prefix + f];
  const materialOptions = [{ value: '', label: 'Choose a material' }, ...materials.map((m) => ({ value: m.key, label: `${m.name} (${m.unit})` }))];
  const unitOf = (key: string) => materials.find((m) => m.key === key)?.unit ?? 'unit';
  return (
    <li className={`rounded-lg border ${stageErrors.length ? 'border-brick-600/50' : 'border-parchment-200'} ${stage.enabled ? 'bg-white' : 'bg-parchment-50'}`}>
      <div className="flex flex-wrap items-center gap-3 px-4 py-2.5">
        <span className="num w-6 text-right font-semibold text-walnut-400">{index + 1}</span>
        <button type="button" onClick={() => setOpen(!expanded)} className="inline-flex items-center gap-1.5 text-left font-medium text-walnut-900" aria-expanded={expanded}>
          {expanded ? <ChevronDown className="h-4 w-4" aria-hidden /> : <ChevronRight className="h-4 w-4" aria-hidden />}
          {stage.name}
        </button>
        <span className="rounded bg-parchment-100 px-1.5 py-0.5 font-mono text-xs text-walnut-600">{stage.kind}</span>
        <span className="num text-sm text-walnut-600">
          {stage.sessions} session{stage.sessions === 1 ? '' : 's'} × {stage.coatsPerSession} coat{stage.coatsPerSession === 1 ? '' : 's'}
          {stage.cutLb > 0 && ` · ${stage.cutLb} lb cut per ${gallonName(gallon)}`} · rest {stage.restHours} h
        </span>
        {stage.enabled ? (
          <span className="inline-flex items-center gap-1 rounded-full bg-moss-100 px-2 py-0.5 text-xs text-moss-700"><CircleCheck className="h-3 w-3" aria-hidden /> In use</span>
        ) : (
          <span className="inline-flex items-center gap-1 rounded-full bg-walnut-100 px-2 py-0.5 text-xs text-walnut-600"><CircleSlash className="h-3 w-3" aria-hidden /> Switched off</span>
        )}
        {stageErrors.length > 0 && <span className="text-xs font-medium text-brick-700">▲ {stageErrors.length} to fix</span>}
        {!readOnly && (
          <div className="ml-auto flex items-center gap-1">
            <label className="mr-2 inline-flex items-center gap-1.5 text-sm text-walnut-700">
              <input type="checkbox" checked={stage.enabled} onChange={(ev) => onChange({ ...stage, enabled: ev.target.checked })} className="h-4 w-4 accent-amber-600" />
              Use this stage
            </label>
            <button type="button" disabled={index === 0} onClick={() => onMove(-1)} className="rounded p-1 text-walnut-600 hover:bg-walnut-50 disabled:opacity-30" aria-label={`Move ${stage.name} up`}>
              <ArrowUp className="h-4 w-4" aria-hidden />
            </button>
            <button type="button" disabled={index === count - 1} onClick={() => onMove(1)} className="rounded p-1 text-walnut-600 hover:bg-walnut-50 disabled:opacity-30" aria-label={`Move ${stage.name} down`}>
              <ArrowDown className="h-4 w-4" aria-hidden />
            </button>
            <button type="button" disabled={count === 1} onClick={() => window.confirm(`Remove the stage "${stage.name}"?`) && onRemove()} className="rounded p-1 text-brick-700 hover:bg-brick-100 disabled:opacity-30" aria-label={`Remove ${stage.name}`}>
              <Trash2 className="h-4 w-4" aria-hidden />
            </button>
          </div>
        )}
      </div>
      {expanded && (
        <fieldset disabled={readOnly} className="space-y-4 border-t border-parchment-200 px-4 py-4">
          <legend className="sr-only">Parameters of {stage.name}</legend>
          <div className="grid gap-3 sm:grid-cols-3">
            <TextField label="Name" value={stage.name} onChange={(ev) => onChange({ ...stage, name: ev.target.value })} error={e('name')} />
            <TextField label="Key" value={stage.key} onChange={(ev) => onChange({ ...stage, key: ev.target.value })} error={e('key')} className="font-mono" />
            <SelectField label="Kind of stage" options={STAGE_KINDS.map((k) => ({ value: k, label: k }))} value={stage.kind} onChange={(ev) => onChange({ ...stage, kind: ev.target.value as Stage['kind'] })} error={e('kind')} />
          </div>
          <div className="grid gap-3 sm:grid-cols-4">
            {NUMBERS.map((n) => (
              <TextField
                key={n.key}
                label={`${n.label} (${n.key === 'cutLb' ? cutUnit(gallon) : n.unit})`}
                type="number"
                step={n.step ?? 'any'}
                value={Number.isNaN(stage[n.key]) ? '' : String(stage[n.key])}
                onChange={(ev) => onChange({ ...stage, [n.key]: ev.target.value === '' ? Number.NaN : Number(ev.target.value) })}
                error={e(n.key)}
                className="num"
              />
            ))}
          </div>
          <div className="grid gap-3 sm:grid-cols-3">
            <SelectField label="Works on" options={APPLIES_TO.map((a) => ({ value: a, label: APPLIES_LABELS[a] }))} value={stage.appliesTo} onChange={(ev) => onChange({ ...stage, appliesTo: ev.target.value as Stage['appliesTo'] })} error={e('appliesTo')} />
            <label className="inline-flex items-center gap-2 pt-6 text-sm text-walnut-800">
              <input type="checkbox" checked={stage.firstCoats} onChange={(ev) => onChange({ ...stage, firstCoats: ev.target.checked })} className="h-4 w-4 accent-amber-600" />
              First coats on bare wood (species absorbency applies)
            </label>
            <label className="inline-flex items-center gap-2 pt-6 text-sm text-walnut-800">
              <input type="checkbox" checked={stage.veneerCare} onChange={(ev) => onChange({ ...stage, veneerCare: ev.target.checked })} className="h-4 w-4 accent-amber-600" />
              Veneer care (veneer labour factor applies)
            </label>
          </div>
          <div>
            <h4 className="mb-2 text-sm font-semibold text-walnut-800">Other materials, per m² per session</h4>
            {stage.materials.length === 0 && <p className="text-sm text-walnut-500">None besides polish and spirit.</p>}
            <ul className="space-y-2">
              {stage.materials.map((use, mi) => (
                <li key={mi} className="grid items-start gap-2 sm:grid-cols-[1fr_12rem_auto]">
                  <SelectField
                    label={`Material ${mi + 1}`}
                    options={materialOptions.some((o) => o.value === use.material) ? materialOptions : [...materialOptions, { value: use.material, label: use.material }]}
                    value={use.material}
                    onChange={(ev) => onChange({ ...stage, materials: stage.materials.map((m, j) => (j === mi ? { ...m, material: ev.target.value } : m)) })}
                    error={e(`materials.${mi}.material`)}
                  />
                  <TextField
                    label={`Quantity (${unitOf(use.material)}/m²)`}
                    type="number"
                    step="any"
                    value={Number.isNaN(use.perM2) ? '' : String(use.perM2)}
                    onChange={(ev) => onChange({ ...stage, materials: stage.materials.map((m, j) => (j === mi ? { ...m, perM2: ev.target.value === '' ? Number.NaN : Number(ev.target.value) } : m)) })}
                    error={e(`materials.${mi}.perM2`)}
                    className="num"
                  />
                  {!readOnly && (
                    <button type="button" onClick={() => onChange({ ...stage, materials: stage.materials.filter((_, j) => j !== mi) })} className="mt-6 rounded p-2 text-brick-700 hover:bg-brick-100" aria-label={`Remove material ${mi + 1}`}>
                      <Trash2 className="h-4 w-4" aria-hidden />
                    </button>
                  )}
                </li>
              ))}
            </ul>
            {!readOnly && (
              <Button size="sm" variant="ghost" className="mt-2" onClick={() => onChange({ ...stage, materials: [...stage.materials, { material: '', perM2: 0 }] })}>
                <Plus className="h-3.5 w-3.5" aria-hidden /> Add a material
              </Button>
            )}
          </div>
        </fieldset>
      )}
    </li>
  );
}

function Editor({ system, readOnly }: { system: FinishingSystemDto; readOnly: boolean }) {
  const save = useSaveSystem();
  const materials = useMaterials({ pageSize: 100, sort: 'name' });
  const gallon = useWorkshop().data?.settings.shellac.gallon;
  const [form, setForm] = useState({ name: system.name, description: system.description, stages: structuredClone(system.stages) });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [status, setStatus] = useState<{ tone: 'error' | 'info'; text: string } | null>(null);
  const setStage = (i: number, s: Stage) => (setForm({ ...form, stages: form.stages.map((x, j) => (j === i ? s : x)) }), setStatus(null));
  const move = (i: number, delta: -1 | 1) => {
    const stages = [...form.stages];
    const [s] = stages.splice(i, 1);
    stages.splice(i + delta, 0, s!);
    setForm({ ...form, stages });
    setErrors({});
    setStatus(null);
  };
  const submit = (ev: FormEvent) => {
    ev.preventDefault();
    const parsed = SystemUpdateSchema.safeParse(form);
    if (!parsed.success) {
      const found = plain(zodFieldErrors(parsed.error));
      setErrors(found);
      return setStatus({ tone: 'error', text: `${Object.keys(found).length} value${Object.keys(found).length > 1 ? 's need' : ' needs'} attention; the stages concerned are open below.` });
    }
    setErrors({});
    save.mutate(
      { id: system.id, ...form },
      {
        onSuccess: () => setStatus({ tone: 'info', text: 'Saved. New estimates use these stages; existing estimates keep the stages they were priced with.' }),
        onError: (err) => (setErrors(plain(serverFieldErrors(err))), setStatus({ tone: 'error', text: err.message })),
      },
    );
  };
  const addStage = () => {
    let n = form.stages.length + 1;
    while (form.stages.some((s) => s.key === `stage-${n}`)) n++;
    setForm({
      ...form,
      stages: [
        ...form.stages,
        { key: `stage-${n}`, kind: 'body', name: 'New stage', enabled: true, sessions: 1, coatsPerSession: 1, cutLb: 0, polishMlPerM2PerCoat: 0, spiritMlPerM2PerSession: 0, materials: [], labourMinPerM2PerCoat: 0, setupMinPerSession: 0, restHours: 12, appliesTo: 'all', firstCoats: false, veneerCare: false },
      ],
    });
  };
  const coats = form.stages.filter((s) => s.enabled).reduce((n, s) => n + (s.sessions || 0) * (s.coatsPerSession || 0), 0);
  return (
    <form onSubmit={submit} noValidate className="space-y-6">
      <Card>
        <fieldset disabled={readOnly} className="grid gap-4 sm:grid-cols-[1fr_2fr]">
          <TextField label="Name" value={form.name} onChange={(e) => setForm({ ...form, name: e.target.value })} error={errors.name} />
          <TextField label="Description" value={form.description} onChange={(e) => setForm({ ...form, description: e.target.value })} error={errors.description} />
        </fieldset>
      </Card>
      <Card title="Stages, in order" actions={<span className="num text-sm text-walnut-500">{form.stages.filter((s) => s.enabled).length} in use · {coats} coats in all</span>}>
        {errors.stages && <div className="mb-3"><Alert tone="error" title={`Stages ${errors.stages}`} /></div>}
        <ol className="space-y-2">
          {form.stages.map((s, i) => (
            <StageCard
              key={`${i}-${s.key}`}
              stage={s}
              index={i}
              count={form.stages.length}
              readOnly={readOnly}
              errors={errors}
              materials={materials.data?.rows ?? []}
              gallon={gallon}
              onChange={(next) => setStage(i, next)}
              onMove={(d) => move(i, d)}
              onRemove={() => setForm({ ...form, stages: form.stages.filter((_, j) => j !== i) })}
            />
          ))}
        </ol>
        {!readOnly && (
          <Button variant="secondary" size="sm" className="mt-3" onClick={addStage}>
            <Plus className="h-3.5 w-3.5" aria-hidden /> Add a stage
          </Button>
        )}
      </Card>
      {!readOnly && (
        <div className="flex flex-wrap items-center gap-3 rounded-xl border border-parchment-200 bg-parchment-50 px-5 py-3">
          <Button type="submit" busy={save.isPending}>
            <Check className="h-4 w-4" aria-hidden /> Save system
          </Button>
          {status && <div className="min-w-0 flex-1"><Alert tone={status.tone} title={status.tone === 'error' ? 'Not saved' : 'Saved'}>{status.text}</Alert></div>}
        </div>
      )}
    </form>
  );
}

export function SystemEditorPage() {
  const { systemId } = useParams();
  const id = Number(systemId);
  const me = useMe();
  const system = useSystem(id);
  if (system.isPending) return <Spinner label="Loading the system…" />;
  if (system.isError) return <Alert tone="error" title="The system could not be loaded">{system.error.message}</Alert>;
  const readOnly = !can(me.data?.role, 'editFinishing');
  return (
    <>
      <Link to={paths.finishingSystems} className="mb-3 inline-flex items-center gap-1 text-sm text-walnut-600 hover:text-walnut-900">
        <ArrowLeft className="h-4 w-4" aria-hidden /> Finishing systems
      </Link>
      <PageHeader
        title={system.data.name}
        description={
          readOnly
            ? 'Read only: the owner keeps the finishing systems.'
            : `${system.data.preset ? 'A preset system. ' : ''}Open a stage to change its figures; move stages with the arrows and switch a stage off to keep it without using it.${system.data.archived ? ' This system is archived.' : ''}`
        }
      />
      <Editor key={system.data.id} system={system.data} readOnly={readOnly} />
    </>
  );
}

export const Component = SystemEditorPage;
