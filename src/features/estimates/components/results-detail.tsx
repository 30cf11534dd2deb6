import { lazy, memo, startTransition, Suspense, useEffect, useState, type ReactNode } from 'react';
import { cutUnit, type Catalog } from '@shared/schemas/catalog';
import type { EstimateResult } from '@shared/schemas/calc';
import type { UnitSystem } from '@shared/units';
import { Spinner } from '@/components/spinner';
import { COMPLEXITY_LABELS, SHAPE_LABELS } from '../lib/draft';
import { formatDays, formatHours, formatMoney, formatWhen } from '@/lib/format-figures';
import { formatArea, formatMass, formatPack, formatQuantity, formatVolume } from '../lib/measures';
import type { ShapeKind } from '@shared/schemas/calc';

const CalendarChart = lazy(() => import('./calendar-chart'));

function Section({ title, children, aside, id }: { title: string; children: ReactNode; aside?: ReactNode; id: string }) {
  return (
    <section aria-labelledby={id} className="rounded-xl border border-parchment-200 bg-white shadow-card">
      <header className="flex flex-wrap items-baseline justify-between gap-2 border-b border-parchment-200 px-4 py-2.5">
        <h2 id={id} className="text-base font-semibold text-walnut-800">
          {title}
        </h2>
        {aside && <div className="text-xs text-walnut-500">{aside}</div>}
      </header>
      <div className="overflow-x-auto">{children}</div>
    </section>
  );
}

const th = 'px-3 py-2 font-semibold';
const td = 'px-3 py-1.5';
const tdNum = 'num px-3 py-1.5 text-right whitespace-nowrap';

type PartResultRow = EstimateResult['parts'][number];

function PartAreaRowView({ part: p, units, wood }: { part: PartResultRow; units: UnitSystem; wood: string }) {
  return (
    <tr data-testid={`part-area-${p.id}`}>
      <td className={`${td} font-medium text-walnut-900`}>{p.name}</td>
      <td className={td}>
        {SHAPE_LABELS[p.shape as ShapeKind] ?? p.shape}
        {p.complexity !== 'flat' && <span className="text-walnut-500">, {COMPLEXITY_LABELS[p.complexity].toLowerCase()}</span>}
      </td>
      <td className={td}>
        {wood}
        {p.veneered ? ' veneer' : ''}
        {!p.show && <span className="text-walnut-500"> (hidden face)</span>}
      </td>
      <td className={tdNum}>
        {p.count} × {p.faces}
      </td>
      <td className={tdNum}>{formatArea(p.faceAreaM2, units)}</td>
      <td className={tdNum}>{p.edgeAreaM2 > 0 ? formatArea(p.edgeAreaM2, units) : '—'}</td>
      <td className={`${tdNum} font-semibold`}>{formatArea(p.areaM2, units)}</td>
    </tr>
  );
}

/** Every estimate is a new object, but most of its parts are the same as before a keystroke: compare them by value. */
function samePart(a: PartResultRow, b: PartResultRow): boolean {
  if (a === b) return true;
  for (const k of Object.keys(a) as Array<keyof PartResultRow>) if (a[k] !== b[k]) return false;
  return true;
}

const PartAreaRow = memo(PartAreaRowView, (a, b) => a.units === b.units && a.wood === b.wood && samePart(a.part, b.part));

/** The full detail of an estimate: areas, stages, materials and packs, labour, calendar, price. */
function ResultsDetailView({ result, units, catalog, stale = false }: { result: EstimateResult; units: UnitSystem; catalog?: Catalog; stale?: boolean }) {
  const currency = result.price.currency;
  // Revisions saved before the volume and gallon settings were US throughout.
  const vol = result.display.volumes ?? 'us';
  const gallon = result.display.gallon ?? 'us';
  const speciesName = new Map((catalog?.species ?? []).map((s) => [s.key, s.name]));
  const materialName = new Map<string, { name: string; unit: string }>([
    ...(catalog?.materials ?? []).map((m): [string, { name: string; unit: string }] => [m.key, { name: m.name, unit: m.unit }]),
    ...result.materials.map((m): [string, { name: string; unit: string }] => [m.key, { name: m.name, unit: m.unit }]),
  ]);
  const stageNames = Object.fromEntries(result.stages.map((s) => [s.key, s.name]));
  const maxHours = Math.max(0.01, ...result.stages.map((s) => s.labourHours));
  return (
    <div className={`space-y-5 ${stale ? 'opacity-60' : ''}`} data-testid="results-detail">
      <Section id="parts-heading" title="Surface area per part" aside={`Total ${formatArea(result.totals.areaM2, units)}`}>
        <table className="min-w-full text-sm">
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              <th className={th}>Part</th>
              <th className={th}>Shape</th>
              <th className={th}>Wood</th>
              <th className={`${th} text-right`}>Pieces × faces</th>
              <th className={`${th} text-right`}>One face</th>
              <th className={`${th} text-right`}>Edges</th>
              <th className={`${th} text-right`}>Area</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {result.parts.map((p) => (
              <PartAreaRow key={p.id} part={p} units={units} wood={speciesName.get(p.species) ?? p.species} />
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="stages-heading" title="Stages: coats, shellac, spirit and labour" aside={`${result.totals.coats} coats · ${formatMass(result.totals.flakesG, units)} flakes · ${formatVolume(result.totals.spiritL, units, vol)} spirit`}>
        <table className="min-w-full text-sm">
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              <th className={th}>Stage</th>
              <th className={`${th} text-right`}>Sessions × coats</th>
              <th className={`${th} text-right`}>Cut</th>
              <th className={`${th} text-right`}>Area</th>
              <th className={`${th} text-right`}>Flakes</th>
              <th className={`${th} text-right`}>Spirit</th>
              <th className={th}>Other materials</th>
              <th className={`${th} text-right`}>Rest</th>
              <th className={th}>Labour</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {result.stages.map((s) => (
              <tr key={s.key} data-testid={`stage-${s.key}`}>
                <td className={`${td} font-medium text-walnut-900`}>{s.name}</td>
                <td className={tdNum}>
                  {s.sessions} × {s.coatsPerSession}
                  {s.coats > 0 && <span className="block text-xs text-walnut-500">{s.coats} coats</span>}
                </td>
                <td className={tdNum}>{s.cutLb > 0 ? <>{s.cutLb} {cutUnit(s.cutBasis ?? gallon)}<span className="block text-xs text-walnut-500">{Math.round(s.cutGPerL)} g/L</span></> : '—'}</td>
                <td className={tdNum}>{formatArea(s.areaM2, units)}</td>
                <td className={tdNum}>{s.flakesG > 0 ? formatMass(s.flakesG, units) : '—'}</td>
                <td className={tdNum}>{s.spiritL > 0 ? formatVolume(s.spiritL, units, vol) : '—'}</td>
                <td className={`${td} text-xs text-walnut-700`}>
                  {s.materials.length === 0
                    ? '—'
                    : s.materials.map((m) => `${materialName.get(m.material)?.name ?? m.material} ${formatQuantity(m.quantity, m.unit, units, vol)}`).join('; ')}
                </td>
                <td className={tdNum}>{s.restHours} h</td>
                <td className={`${td} min-w-40`}>
                  <div className="flex items-center gap-2">
                    <div className="h-2 flex-1 rounded-full bg-parchment-200" aria-hidden>
                      <div className="h-2 rounded-full bg-amber-500" style={{ width: `${(100 * s.labourHours) / maxHours}%` }} />
                    </div>
                    <span className="num w-16 text-right">{formatHours(s.labourHours)}</span>
                  </div>
                </td>
              </tr>
            ))}
          </tbody>
          <tfoot className="border-t-2 border-parchment-300 bg-parchment-50 font-semibold">
            <tr>
              <td className={td}>All stages</td>
              <td className={tdNum}>{result.totals.coats} coats</td>
              <td />
              <td />
              <td className={tdNum}>{formatMass(result.totals.flakesG, units)}</td>
              <td className={tdNum}>{formatVolume(result.totals.spiritL, units, vol)}</td>
              <td />
              <td />
              <td className={`${td} text-right`}>
                <span className="num">{formatHours(result.labour.hours)}</span>
                <span className="block text-xs font-normal text-walnut-500">
                  at {formatMoney(result.labour.perHour, currency)}/h = {formatMoney(result.labour.cost, currency)}
                </span>
              </td>
            </tr>
          </tfoot>
        </table>
      </Section>

      <Section id="materials-heading" title="Materials to buy" aside="Cheapest packs that cover the need">
        <table className="min-w-full text-sm">
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              <th className={th}>Material</th>
              <th className={`${th} text-right`}>Needed</th>
              <th className={th}>Packs</th>
              <th className={`${th} text-right`}>Left over</th>
              <th className={`${th} text-right`}>Charged</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {result.materials.map((m) => (
              <tr key={m.key} data-testid={`material-${m.key}`}>
                <td className={td}>
                  <span className="font-medium text-walnut-900">{m.name}</span>
                  {m.supplier && <span className="block text-xs text-walnut-500">{m.supplier}</span>}
                </td>
                <td className={tdNum}>{formatQuantity(m.need, m.unit, units, vol)}</td>
                <td className={`${td} text-sm`}>
                  {m.packs.map((p) => (
                    <span key={p.size} className="num mr-2 inline-block whitespace-nowrap rounded border border-parchment-300 bg-parchment-50 px-1.5 py-0.5 text-xs">
                      {formatPack(p.size, p.count, m.unit, units, p.label, vol)} @ {formatMoney(p.price, currency)}
                    </span>
                  ))}
                </td>
                <td className={tdNum}>{formatQuantity(m.leftover, m.unit, units, vol)}</td>
                <td className={tdNum}>{formatMoney(m.charge, currency)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section
        id="calendar-heading"
        title="Calendar of sessions and rests"
        aside={`${formatDays(result.calendar.calendarDays)}, ${formatWhen(result.calendar.start)} to ${formatWhen(result.calendar.end)} · drying room ${formatDays(result.calendar.dryingRoom.days)}`}
      >
        <div className="px-3 py-3">
          {result.calendar.sessions.length === 0 ? (
            <p className="text-sm text-walnut-500">No sessions to schedule.</p>
          ) : (
            <Suspense fallback={<Spinner label="Drawing the calendar…" />}>
              <CalendarChart calendar={result.calendar} stageNames={stageNames} />
            </Suspense>
          )}
          {result.calendar.restFactor !== 1 && (
            <p className="mt-2 text-xs text-walnut-500">
              Rests stretched × {result.calendar.restFactor} for the workshop's temperature and humidity.
            </p>
          )}
        </div>
      </Section>

      <Section id="price-heading" title="Price" aside={`in ${currency}`}>
        <table className="min-w-full text-sm">
          <tbody className="divide-y divide-parchment-200">
            {result.price.lines.map((l) => (
              <tr key={l.code} data-testid={`price-${l.code}`}>
                <td className={td}>{l.label}</td>
                <td className={tdNum}>{formatMoney(l.amount, currency)}</td>
              </tr>
            ))}
          </tbody>
          <tfoot className="border-t-2 border-parchment-300">
            <tr className="bg-parchment-50">
              <td className={`${td} font-semibold`}>Total</td>
              <td className={`${tdNum} text-base font-semibold`}>{formatMoney(result.price.total, currency)}</td>
            </tr>
            <tr>
              <td className={`${td} text-walnut-600`}>Net before tax</td>
              <td className={tdNum}>{formatMoney(result.price.net, currency)}</td>
            </tr>
            <tr>
              <td className={`${td} text-walnut-600`}>Deposit on acceptance</td>
              <td className={tdNum}>{formatMoney(result.price.deposit, currency)}</td>
            </tr>
            <tr>
              <td className={`${td} text-walnut-600`}>Balance</td>
              <td className={tdNum}>{formatMoney(result.price.balance, currency)}</td>
            </tr>
          </tfoot>
        </table>
      </Section>
    </div>
  );
}

/** Memoised: the editor re-renders on every keystroke, the detail only when the figures change. */
export const ResultsDetail = memo(ResultsDetailView);

/** How long the figures must stay the same before the detail below them is drawn again: a pause in the typing. */
export const DETAIL_PAUSE_MS = 250;

/**
 * The detail as the live editor shows it: the tables and the calendar chart (the heaviest part of the page to draw)
 * follow the figures once the typing pauses, in a transition that a new keystroke interrupts, so a keystroke's new
 * totals never wait for them.
 */
export const DeferredResultsDetail = memo(function DeferredResultsDetail(props: { result: EstimateResult; units: UnitSystem; catalog?: Catalog; stale?: boolean }) {
  const [shown, setShown] = useState(props.result);
  useEffect(() => {
    if (shown === props.result) return;
    const timer = setTimeout(() => startTransition(() => setShown(props.result)), DETAIL_PAUSE_MS);
    return () => clearTimeout(timer);
  }, [props.result, shown]);
  return <ResultsDetail {...props} result={shown} />;
});
