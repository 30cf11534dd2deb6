import { Clock, Coins, Droplets, Layers, Ruler, CalendarRange, Package, TriangleAlert } from 'lucide-react';
import type { ReactNode } from 'react';
import type { EstimateResult } from '@shared/schemas/calc';
import type { UnitSystem } from '@shared/units';
import { formatDays, formatHours, formatMoney, formatDate } from '@/lib/format-figures';
import { formatArea, formatMass, formatVolume } from '../lib/measures';

function Figure({ label, value, icon, testId, hint }: { label: string; value: ReactNode; icon: ReactNode; testId: string; hint?: ReactNode }) {
  return (
    <div className="rounded-lg border border-parchment-200 bg-parchment-50 px-3 py-2.5">
      <dt className="flex items-center gap-1.5 text-xs font-medium uppercase tracking-wide text-walnut-500">
        {icon}
        {label}
      </dt>
      <dd className="num mt-0.5 text-lg font-semibold text-walnut-900" data-testid={testId}>
        {value}
      </dd>
      {hint && <dd className="text-xs text-walnut-500">{hint}</dd>}
    </div>
  );
}

const icon = 'h-3.5 w-3.5 text-amber-600';
// Icons made once: the same element object is not drawn again when the figures change.
const RULER = <Ruler className={icon} aria-hidden />;
const LAYERS = <Layers className={icon} aria-hidden />;
const CLOCK = <Clock className={icon} aria-hidden />;
const PACKAGE = <Package className={icon} aria-hidden />;
const DROPLETS = <Droplets className={icon} aria-hidden />;
const CALENDAR = <CalendarRange className={icon} aria-hidden />;
const COINS = <Coins className="h-3.5 w-3.5" aria-hidden />;
const STALE = <TriangleAlert className="h-3.5 w-3.5" aria-hidden />;

/** The totals of an estimate, each with its unit; marked stale when the inputs have moved on and cannot be priced. */
export function ResultsSummary({ result, units, stale = false, heading = 'Estimate' }: { result: EstimateResult; units: UnitSystem; stale?: boolean; heading?: ReactNode }) {
  const t = result.totals;
  return (
    <section aria-labelledby="totals-heading" aria-busy={stale || undefined} className={`rounded-xl border bg-white shadow-card ${stale ? 'border-dashed border-amber-500' : 'border-parchment-200'}`} data-stale={stale || undefined}>
      <header className="flex items-center justify-between gap-3 border-b border-parchment-200 px-4 py-2.5">
        <h2 id="totals-heading" className="text-base font-semibold text-walnut-800">
          {heading}
        </h2>
        {stale && (
          <span className="inline-flex items-center gap-1 rounded-full border border-amber-500 bg-amber-50 px-2 py-0.5 text-xs font-semibold text-amber-800" data-testid="stale">
            {STALE} Out of date: fix the marked fields
          </span>
        )}
      </header>
      <div className={`px-4 py-3 ${stale ? 'opacity-60' : ''}`}>
        <div className="mb-3 flex items-baseline justify-between gap-3 rounded-lg bg-walnut-900 px-4 py-3 text-parchment-50">
          <span className="text-sm text-parchment-200">Price with tax</span>
          <span className="num font-serif text-3xl font-semibold text-amber-300" data-testid="total-price">
            {formatMoney(t.price, t.currency)}
          </span>
        </div>
        <dl className="grid grid-cols-2 gap-2 sm:grid-cols-3">
          <Figure label="Surface" icon={RULER} value={formatArea(t.areaM2, units)} testId="total-area" />
          <Figure label="Shellac coats" icon={LAYERS} value={`${t.coats} coats`} testId="total-coats" />
          <Figure label="Labour" icon={CLOCK} value={formatHours(t.labourHours)} testId="total-hours" />
          <Figure label="Flakes" icon={PACKAGE} value={formatMass(t.flakesG, units)} testId="total-flakes" />
          <Figure label="Spirit" icon={DROPLETS} value={formatVolume(t.spiritL, units, result.display.volumes ?? 'us')} testId="total-spirit" />
          <Figure
            label="Calendar"
            icon={CALENDAR}
            value={formatDays(t.calendarDays)}
            testId="total-days"
            hint={result.calendar.sessions.length > 0 ? `${formatDate(result.calendar.start.slice(0, 10))} – ${formatDate(result.calendar.end.slice(0, 10))}` : undefined}
          />
        </dl>
        <p className="mt-3 flex items-center gap-1.5 text-xs text-walnut-500">
          {COINS} Deposit <span className="num font-medium text-walnut-700">{formatMoney(result.price.deposit, t.currency)}</span>
          <span>· balance</span>
          <span className="num font-medium text-walnut-700">{formatMoney(result.price.balance, t.currency)}</span>
        </p>
      </div>
    </section>
  );
}
