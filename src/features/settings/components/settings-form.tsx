import { Building2, CalendarDays, Check, CircleDollarSign, FileText, Flame, Plus, Sparkles, Thermometer, Trash2, Wrench } from 'lucide-react';
import { useState, type FormEvent, type ReactNode } from 'react';
import { COMPLEXITIES, type Material as CatalogMaterial } from '@shared/schemas/catalog';
import { LENGTH_UNITS } from '@shared/units';
import { DEFAULT_TIME_ZONE, timeZoneOptions } from '@shared/time';
import { WEEKDAYS, type Workshop } from '@shared/schemas/workshop';
import { WorkshopUpdateSchema, type WorkshopUpdateInput } from '@shared/schemas/workshop-admin';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card } from '@/components/card';
import { SelectField, TextField } from '@/components/field';
import { plainMessage, serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';

type Form = WorkshopUpdateInput & { email: string; phone: string; address: string };
type Path = (string | number)[];

const DAY_NAMES: Record<(typeof WEEKDAYS)[number], string> = { mon: 'Monday', tue: 'Tuesday', wed: 'Wednesday', thu: 'Thursday', fri: 'Friday', sat: 'Saturday', sun: 'Sunday' };

function getAt(obj: unknown, path: Path): unknown {
  return path.reduce<unknown>((o, k) => (o as Record<string | number, unknown>)?.[k], obj);
}

function setAt<T>(obj: T, path: Path, value: unknown): T {
  const copy = structuredClone(obj);
  let o = copy as Record<string | number, unknown>;
  for (const k of path.slice(0, -1)) o = o[k] as Record<string | number, unknown>;
  o[path.at(-1)!] = value;
  return copy;
}

/** Moves to the first field marked invalid once the messages are on screen. */
function focusFirstInvalid(): void {
  setTimeout(() => document.querySelector<HTMLElement>('form[aria-label="Workshop settings"] [aria-invalid="true"]')?.focus(), 0);
}

/** Zod's words for an empty number box are not the workshop's. */
function plain(errors: Record<string, string>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(errors)) out[k] = plainMessage(v);
  return out;
}

export function toForm(w: Workshop): Form {
  return { name: w.name, email: w.email ?? '', phone: w.phone ?? '', address: w.address ?? '', settings: { ...structuredClone(w.settings), timeZone: w.settings.timeZone ?? DEFAULT_TIME_ZONE } };
}

function Section({ icon, title, intro, children }: { icon: ReactNode; title: string; intro?: string; children: ReactNode }) {
  return (
    <Card title={<span className="inline-flex items-center gap-2">{icon} {title}</span>}>
      {intro && <p className="mb-4 text-sm text-walnut-600">{intro}</p>}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">{children}</div>
    </Card>
  );
}

export function SettingsForm({
  workshop,
  materials,
  rateOptions,
  saving,
  onSave,
}: {
  workshop: Workshop;
  materials: Pick<CatalogMaterial, 'key' | 'name' | 'kind'>[];
  rateOptions: { value: string; label: string }[];
  saving: boolean;
  onSave: (input: WorkshopUpdateInput) => Promise<unknown>;
}) {
  const [form, setForm] = useState<Form>(() => toForm(workshop));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [status, setStatus] = useState<{ tone: 'error' | 'info'; text: string } | null>(null);
  const [newClosed, setNewClosed] = useState('');
  const s = form.settings;
  const currency = s.pricing.currency;

  const set = (path: Path, value: unknown) => {
    setForm((f) => setAt(f, path, value));
    setStatus(null);
  };
  const err = (path: Path) => errors[path.join('.')];

  const num = (path: Path, label: string, unit: string, opts: { step?: string; hint?: string; scale?: number } = {}) => {
    const raw = getAt(form, path) as number;
    const scale = opts.scale ?? 1;
    const shown = Number.isNaN(raw) ? '' : String(Math.round(raw * scale * 1e6) / 1e6);
    return (
      <TextField
        key={path.join('.')}
        label={`${label} (${unit})`}
        type="number"
        step={opts.step ?? 'any'}
        inputMode="decimal"
        value={shown}
        hint={opts.hint}
        onChange={(e) => set(path, e.target.value === '' ? Number.NaN : Number(e.target.value.replace(',', '.')) / scale)}
        error={err(path)}
        className="num"
      />
    );
  };
  const text = (path: Path, label: string, hint?: string) => (
    <TextField key={path.join('.')} label={label} value={String(getAt(form, path) ?? '')} hint={hint} onChange={(e) => set(path, e.target.value)} error={err(path)} />
  );
  const select = (path: Path, label: string, options: { value: string; label: string }[], hint?: string) => (
    <SelectField key={path.join('.')} label={label} options={options} hint={hint} value={String(getAt(form, path))} onChange={(e) => set(path, e.target.value)} error={err(path)} />
  );

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    const body = { ...form, email: form.email || null, phone: form.phone || null, address: form.address || null };
    const parsed = WorkshopUpdateSchema.safeParse(body);
    if (!parsed.success) {
      const found = plain(zodFieldErrors(parsed.error));
      setErrors(found);
      setStatus({ tone: 'error', text: `${Object.keys(found).length} field${Object.keys(found).length > 1 ? 's need' : ' needs'} attention: ${Object.keys(found).length > 1 ? 'they are' : 'it is'} marked ▲ above.` });
      focusFirstInvalid();
      return;
    }
    setErrors({});
    try {
      await onSave(body);
      setStatus({ tone: 'info', text: 'Settings saved. New estimates use them at once.' });
    } catch (error) {
      const found = plain(serverFieldErrors(error));
      setErrors(found);
      setStatus({ tone: 'error', text: error instanceof Error ? error.message : 'Not saved' });
      focusFirstInvalid();
    }
  };

  const week = s.calendar.workingWeek;
  const closed = s.calendar.closedDates ?? [];
  const dayIndex = (day: string) => week.findIndex((d) => d.day === day);
  const toggleDay = (day: (typeof WEEKDAYS)[number], open: boolean) => {
    const next = open ? [...week, { day, open: '08:00', close: '17:00' }] : week.filter((d) => d.day !== day);
    next.sort((a, b) => WEEKDAYS.indexOf(a.day) - WEEKDAYS.indexOf(b.day));
    set(['settings', 'calendar', 'workingWeek'], next);
  };
  const materialOptions = (kind: string) =>
    materials.filter((m) => m.kind === kind || m.key === s.shellac.flakesMaterial || m.key === s.shellac.spiritMaterial).map((m) => ({ value: m.key, label: m.name }));

  return (
    <form id="settings-form" onSubmit={submit} noValidate className="space-y-6" aria-label="Workshop settings">
      <Section icon={<Building2 className="h-4 w-4 text-amber-600" aria-hidden />} title="The workshop" intro="How the workshop appears on quotes and e-mails.">
        {text(['name'], 'Workshop name')}
        {text(['email'], 'E-mail')}
        {text(['phone'], 'Telephone')}
        <div className="sm:col-span-2 lg:col-span-3">
          <label htmlFor="ws-address" className="block text-sm font-medium text-walnut-800">Address</label>
          <textarea id="ws-address" rows={3} value={form.address} onChange={(e) => set(['address'], e.target.value)} aria-invalid={err(['address']) ? true : undefined} className="mt-1 block w-full rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm" />
          {err(['address']) && <p className="text-sm text-brick-700" role="alert"><span aria-hidden>▲</span> {err(['address'])}</p>}
        </div>
      </Section>

      <Section icon={<CircleDollarSign className="h-4 w-4 text-amber-600" aria-hidden />} title="Prices, tax and discounts" intro="How a quote is built from cost: materials marked up, labour at the polisher's rate, overhead and margin on top, then tax and rounding.">
        {text(['settings', 'pricing', 'currency'], 'Currency', 'Three letters, e.g. GBP or EUR')}
        {select(['settings', 'pricing', 'polisherRate'], 'Polishing charged at', rateOptions)}
        {num(['settings', 'pricing', 'markupPct'], 'Markup on materials', '%')}
        {num(['settings', 'pricing', 'overheadPct'], 'Overhead', '%')}
        {num(['settings', 'pricing', 'marginPct'], 'Margin', '%')}
        {num(['settings', 'pricing', 'maxDiscountPct'], 'Largest discount sales may give', '%')}
        {text(['settings', 'pricing', 'taxLabel'], 'Tax name', 'As printed, e.g. VAT')}
        {num(['settings', 'pricing', 'taxPct'], 'Tax rate', '%')}
        <SelectField
          label="Customers see prices"
          options={[
            { value: 'true', label: `with ${s.pricing.taxLabel || 'tax'} included` },
            { value: 'false', label: `before ${s.pricing.taxLabel || 'tax'}, added at the foot` },
          ]}
          value={String(s.pricesIncludeTax)}
          onChange={(e) => set(['settings', 'pricesIncludeTax'], e.target.value === 'true')}
          error={err(['settings', 'pricesIncludeTax'])}
        />
        <SelectField
          label={`Round totals to (${currency})`}
          options={['0.01', '0.05', '0.1', '0.5', '1', '5', '10'].map((v) => ({ value: v, label: `${v} ${currency}` }))}
          value={s.pricing.roundTo}
          onChange={(e) => set(['settings', 'pricing', 'roundTo'], e.target.value)}
          error={err(['settings', 'pricing', 'roundTo'])}
        />
        {num(['settings', 'pricing', 'depositPct'], 'Deposit asked on acceptance', '%')}
      </Section>

      <Section icon={<Sparkles className="h-4 w-4 text-amber-600" aria-hidden />} title="Materials and shellac" intro="How materials are charged and which price-list items hold the flakes and the spirit.">
        {select(['settings', 'pricing', 'materialsCharge'], 'Materials charged as', [
          { value: 'whole-packs', label: 'whole packs bought' },
          { value: 'used', label: 'quantity used' },
        ])}
        {num(['settings', 'pricing', 'wastePct'], 'Waste allowance', '%', { hint: 'Polish and spirit lost in mixing, charging the rubber and evaporation' })}
        {select(['settings', 'shellac', 'flakesMaterial'], 'Shellac flakes', materialOptions('shellac'))}
        {select(['settings', 'shellac', 'spiritMaterial'], 'Spirit', materialOptions('spirit'))}
        {num(['settings', 'shellac', 'apparentDensity'], 'Flakes apparent density', 'g/cm³', { hint: 'About 1.2 reproduces the usual dilution chart' })}
        {select(['settings', 'shellac', 'gallon'], 'A pound cut is pounds per', [
          { value: 'us', label: 'US gallon (3.785 L)' },
          { value: 'uk', label: 'imperial gallon (4.546 L)' },
        ], 'Shown beside every cut')}
      </Section>

      <Section icon={<FileText className="h-4 w-4 text-amber-600" aria-hidden />} title="Quotes, paper and units">
        {num(['settings', 'quoteValidityDays'], 'Quotes valid for', 'days', { step: '1' })}
        {select(['settings', 'timeZone'], 'Time zone', timeZoneOptions(form.settings.timeZone).map((z) => ({ value: z, label: z.replace(/_/g, ' ') })), 'What “today” means for quotes, prices and the planning board')}
        {select(['settings', 'paperSize'], 'Paper size', [
          { value: 'A4', label: 'A4 (210 × 297 mm)' },
          { value: 'Letter', label: 'Letter (8.5 × 11 in)' },
        ])}
        {select(['settings', 'units'], 'Measurements shown in', [
          { value: 'metric', label: 'Metric (mm, m², L, g)' },
          { value: 'imperial', label: 'Imperial (in, ft², fl oz, oz)' },
        ])}
        {select(['settings', 'imperialVolumes'], 'Imperial pints and fluid ounces', [
          { value: 'us', label: 'US (pint 473 mL)' },
          { value: 'uk', label: 'imperial (pint 568 mL)' },
        ], 'Used when measurements are shown in imperial')}
        {select(['settings', 'defaultLengthUnit'], 'A bare number means', LENGTH_UNITS.map((u) => ({ value: u, label: u })), 'When a length is typed without a unit')}
      </Section>

      <Card title={<span className="inline-flex items-center gap-2"><CalendarDays className="h-4 w-4 text-amber-600" aria-hidden /> Working calendar</span>}>
        <p className="mb-3 text-sm text-walnut-600">Sessions are laid only inside opening hours; rests run through nights, weekends and closed days.</p>
        {err(['settings', 'calendar', 'workingWeek']) && <Alert tone="error" title={`Working week ${err(['settings', 'calendar', 'workingWeek'])}`} />}
        <div className="overflow-x-auto">
        <table className="w-full max-w-2xl text-sm">
          <caption className="sr-only">Opening hours</caption>
          <thead className="text-left text-xs uppercase tracking-wide text-walnut-500">
            <tr><th scope="col" className="py-1">Day</th><th scope="col" className="py-1">Open</th><th scope="col" className="py-1">From</th><th scope="col" className="py-1">Until</th></tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {WEEKDAYS.map((day) => {
              const i = dayIndex(day);
              const hours = i >= 0 ? week[i] : undefined;
              const fieldErr = i >= 0 ? (err(['settings', 'calendar', 'workingWeek', i, 'close']) ?? err(['settings', 'calendar', 'workingWeek', i, 'open']) ?? err(['settings', 'calendar', 'workingWeek', i, 'day'])) : undefined;
              return (
                <tr key={day}>
                  <th scope="row" className="py-1.5 pr-3 text-left font-medium text-walnut-800">{DAY_NAMES[day]}</th>
                  <td className="py-1.5 pr-3">
                    <label className="inline-flex items-center gap-2">
                      <input type="checkbox" checked={Boolean(hours)} onChange={(e) => toggleDay(day, e.target.checked)} className="h-4 w-4 accent-amber-600" />
                      <span className={hours ? 'text-walnut-800' : 'text-walnut-400'}>{hours ? 'open' : 'closed'}</span>
                    </label>
                  </td>
                  <td className="py-1.5 pr-3">
                    {hours && <input type="time" aria-label={`${DAY_NAMES[day]} opens at`} value={hours.open} onChange={(e) => set(['settings', 'calendar', 'workingWeek', i, 'open'], e.target.value)} className="rounded border border-walnut-200 px-2 py-1" />}
                  </td>
                  <td className="py-1.5">
                    {hours && <input type="time" aria-label={`${DAY_NAMES[day]} closes at`} aria-invalid={fieldErr ? true : undefined} value={hours.close} onChange={(e) => set(['settings', 'calendar', 'workingWeek', i, 'close'], e.target.value)} className={`rounded border px-2 py-1 ${fieldErr ? 'border-brick-600' : 'border-walnut-200'}`} />}
                    {fieldErr && <p className="text-xs text-brick-700" role="alert"><span aria-hidden>▲</span> {fieldErr}</p>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        </div>
        <h3 className="mb-2 mt-5 text-base font-semibold text-walnut-800">Closed dates</h3>
        <div className="flex flex-wrap gap-2">
          {closed.length === 0 && <span className="text-sm text-walnut-500">None</span>}
          {closed.map((d, i) => (
            <span key={`${d}-${i}`} className={`inline-flex items-center gap-1 rounded-full border px-2.5 py-0.5 text-sm ${err(['settings', 'calendar', 'closedDates', i]) ? 'border-brick-600 text-brick-700' : 'border-parchment-300 bg-parchment-50 text-walnut-800'}`}>
              <span className="num">{d}</span>
              <button type="button" onClick={() => set(['settings', 'calendar', 'closedDates'], closed.filter((_, j) => j !== i))} className="rounded p-0.5 hover:bg-walnut-100" aria-label={`Remove closed date ${d}`}>
                <Trash2 className="h-3 w-3" aria-hidden />
              </button>
            </span>
          ))}
        </div>
        <div className="mt-3 flex items-end gap-2">
          <TextField label="Add a closed date" type="date" value={newClosed} onChange={(e) => setNewClosed(e.target.value)} />
          <Button
            variant="secondary"
            disabled={!newClosed}
            onClick={() => {
              if (!closed.includes(newClosed)) set(['settings', 'calendar', 'closedDates'], [...closed, newClosed].sort());
              setNewClosed('');
            }}
          >
            <Plus className="h-4 w-4" aria-hidden /> Add date
          </Button>
        </div>
      </Card>

      <Section icon={<Thermometer className="h-4 w-4 text-amber-600" aria-hidden />} title="Drying room" intro="How many cases rest at once, and the climate the rests are timed for.">
        {select(['settings', 'dryingRoom', 'mode'], 'Capacity counted in', [
          { value: 'bays', label: 'bays (one case each)' },
          { value: 'area', label: 'rack area' },
        ])}
        {num(['settings', 'dryingRoom', 'bays'], 'Bays', 'cases', { step: '1' })}
        {num(['settings', 'dryingRoom', 'rackAreaM2'], 'Rack area', 'm²')}
        {num(['settings', 'dryingRoom', 'temperatureC'], 'Temperature set point', '°C')}
        {num(['settings', 'dryingRoom', 'humidityPct'], 'Relative humidity set point', '% RH', { hint: 'Above about 75 % shellac risks turning milky' })}
      </Section>

      <Section icon={<Flame className="h-4 w-4 text-amber-600" aria-hidden />} title="Finishing room and spirit" intro="For the vapour and fresh-air figures on every estimate. They help plan; local fire codes and the workplace-safety regulator come first.">
        {num(['settings', 'safety', 'room', 'volumeM3'], 'Room volume', 'm³')}
        {num(['settings', 'safety', 'room', 'airChangesPerHour'], 'Air changes', 'per hour')}
        {num(['settings', 'safety', 'mixingFactor'], 'Mixing factor K', '1 ideal – 10 poor')}
        {num(['settings', 'safety', 'spirit', 'ethanol'], 'Ethanol share', '% by volume', { scale: 100 })}
        {num(['settings', 'safety', 'spirit', 'methanol'], 'Methanol share', '% by volume', { scale: 100 })}
        {num(['settings', 'safety', 'spirit', 'isopropanol'], 'Isopropanol share', '% by volume', { scale: 100 })}
        {err(['settings', 'safety', 'spirit']) && (
          <p className="text-sm text-brick-700 sm:col-span-2 lg:col-span-3" role="alert"><span aria-hidden>▲</span> Spirit composition: {err(['settings', 'safety', 'spirit']) === 'shares must add up to 1' ? 'the three shares must add up to 100 %' : err(['settings', 'safety', 'spirit'])}</p>
        )}
      </Section>

      <Card title={<span className="inline-flex items-center gap-2"><Wrench className="h-4 w-4 text-amber-600" aria-hidden /> Estimating factors</span>}>
        <p className="mb-3 text-sm text-walnut-600">How much more labour and material a worked surface takes than a flat one (× multipliers).</p>
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          {COMPLEXITIES.map((c) => (
            <fieldset key={c} className="space-y-2 rounded-lg border border-parchment-200 p-3">
              <legend className="px-1 text-sm font-semibold capitalize text-walnut-800">{c}</legend>
              {num(['settings', 'factors', 'complexity', c, 'labour'], 'Labour', '×')}
              {num(['settings', 'factors', 'complexity', c, 'material'], 'Material', '×')}
            </fieldset>
          ))}
        </div>
        <div className="mt-4 max-w-xs">{num(['settings', 'factors', 'veneerLabour'], 'Veneer care on labour', '×')}</div>
      </Card>

      <div className="flex flex-wrap items-center gap-3 rounded-xl border border-parchment-200 bg-parchment-50 px-5 py-3">
        <Button type="submit" busy={saving}>
          <Check className="h-4 w-4" aria-hidden /> Save settings
        </Button>
        <Button variant="secondary" onClick={() => (setForm(toForm(workshop)), setErrors({}), setStatus(null))}>Undo changes</Button>
        {status && (
          <div className="min-w-0 flex-1">
            <Alert tone={status.tone} title={status.tone === 'error' ? 'Not saved' : 'Saved'}>{status.text}</Alert>
          </div>
        )}
      </div>
    </form>
  );
}
