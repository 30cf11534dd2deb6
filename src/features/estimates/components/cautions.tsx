import { Flame, Info, ShieldAlert, TriangleAlert, Wind } from 'lucide-react';
import type { ReactNode } from 'react';
import type { Caution, EstimateResult, VentilationResult } from '@shared/schemas/calc';
import type { UnitSystem } from '@shared/units';

const ITEM_ICON = 'mt-0.5 h-4 w-4 shrink-0';
// Icons made once: the same element object is not drawn again when the figures change.
const SEVERITY: Record<Caution['severity'], { word: string; icon: ReactNode; box: string }> = {
  danger: { word: 'Danger', icon: <Flame className={ITEM_ICON} aria-hidden />, box: 'border-brick-600/40 bg-brick-100/70 text-brick-700' },
  warning: { word: 'Warning', icon: <TriangleAlert className={ITEM_ICON} aria-hidden />, box: 'border-amber-500/50 bg-amber-50 text-amber-800' },
  info: { word: 'Note', icon: <Info className={ITEM_ICON} aria-hidden />, box: 'border-walnut-200 bg-parchment-50 text-walnut-700' },
};
const SHIELD = <ShieldAlert className="h-4 w-4 text-brick-700" aria-hidden />;
const CHECK = <TriangleAlert className={ITEM_ICON} aria-hidden />;
/** Made once (a toLocaleString call builds a new formatter each time); the same words. */
const WHOLE = new Intl.NumberFormat('en-GB');

/** The fresh-air figure of the busiest session, in the display units. */
function airFlow(m3h: number, units: UnitSystem): string {
  return units === 'metric' ? `${WHOLE.format(Math.ceil(m3h))} m³/h` : `${WHOLE.format(Math.ceil(m3h / M3H_PER_CFM))} cfm`;
}

const WIND = <Wind className="mt-0.5 h-4 w-4 shrink-0" aria-hidden />;

/** Cubic metres per hour in one cubic foot per minute. */
const M3H_PER_CFM = 1.6990108;

/** One solvent's line of the working: its evaporation against its own limit and the air that takes. */
function componentLine(c: VentilationResult['components'][number], units: UnitSystem): string {
  return `${c.solvent} ${Math.round(c.share * 100)} %: ${(c.evaporationLPerMin * 1000).toFixed(2)} mL/min against its own ${c.limitPpm} ppm limit → ${airFlow(c.requiredFlowM3h, units)}`;
}

/**
 * The ventilation working for staff: the busiest session's evaporation, each solvent against its own limit (the
 * additive mixture rule), the mixing factor, and one verdict. The figure is printed once, in the display units.
 */
function VentilationWorking({ v, units }: { v: VentilationResult; units: UnitSystem }) {
  // Revisions saved before the mixture rule carry no per-solvent working.
  const components = v.components ?? [];
  const short = !v.adequate;
  return (
    <div className={`flex gap-2 rounded-md border px-3 py-2 ${short ? 'border-brick-600/40 bg-brick-100 text-brick-700' : 'border-walnut-200 bg-parchment-50 text-walnut-800'}`} data-testid="ventilation">
      {WIND}
      <div className="space-y-1">
        <p>
          <strong>{short ? 'More fresh air needed' : 'Fresh air covers the busiest session'}:</strong> it evaporates{' '}
          <span className="num">{(v.worstSession.evaporationLPerMin * 1000).toFixed(1)} mL</span> of spirit a minute and needs{' '}
          <span className="num font-semibold">{airFlow(v.requiredFlowM3h, units)}</span>
          {v.governs === 'fire' ? ' to stay below a quarter of the lower explosive limit' : ' to keep every solvent within its exposure limit'}; the
          room supplies <span className="num">{airFlow(v.suppliedFlowM3h, units)}</span> ({v.airChangesPerHour} air changes per hour in{' '}
          <span className="num">{v.roomVolumeM3} m³</span>).{short ? ' Add extraction or work smaller areas at a time.' : ''}
        </p>
        {components.length > 0 && (
          <ul className="text-xs" aria-label="Ventilation working">
            {components.map((c) => (
              <li key={c.solvent} className="num">{componentLine(c, units)}</li>
            ))}
            <li>
              Mixing factor {v.mixingFactor}; solvents added, each against its own limit (mixture rule); exposure index at the room&apos;s supply{' '}
              <span className="num">{(v.exposureIndex ?? 0).toFixed(2)}</span> (1 is the limit).
            </li>
          </ul>
        )}
      </div>
    </div>
  );
}

/** The fire, vapour and oily-rag cautions with the ventilation working: shown with every estimate, on staff screens. */
export function CautionsPanel({ result, units, compact = false }: { result: Pick<EstimateResult, 'cautions' | 'ventilation' | 'warnings'>; units: UnitSystem; compact?: boolean }) {
  const v = result.ventilation;
  // The ventilation warning repeats the box above it: shown once.
  const warnings = result.warnings.filter((w) => w.code !== 'ventilation');
  return (
    <section aria-labelledby="cautions-heading" className="rounded-xl border border-brick-600/30 bg-white shadow-card">
      <header className="flex items-center gap-2 border-b border-brick-600/20 bg-brick-100/50 px-4 py-2.5">
        {SHIELD}
        <h2 id="cautions-heading" className="text-base font-semibold text-brick-700">
          Safety cautions
        </h2>
      </header>
      <div className="space-y-3 px-4 py-3 text-sm">
        <VentilationWorking v={v} units={units} />
        {warnings.length > 0 && (
          <ul className="space-y-1.5" aria-label="Things to check on this job">
            {warnings.map((w) => (
              <li key={w.code + w.text} className="flex gap-2 rounded-md border border-amber-500/50 bg-amber-50 px-3 py-1.5 text-amber-800">
                {CHECK}
                <span>
                  <span className="font-semibold">Check: </span>
                  {w.text}
                </span>
              </li>
            ))}
          </ul>
        )}
        <ul className={compact ? 'space-y-1' : 'space-y-1.5'}>
          {result.cautions.map((c) => {
            const s = SEVERITY[c.severity];
            return (
              <li key={c.code} className={`flex gap-2 rounded-md border px-3 py-1.5 ${s.box}`}>
                {s.icon}
                <span>
                  <span className="font-semibold">{s.word}: </span>
                  {c.text}
                </span>
              </li>
            );
          })}
        </ul>
      </div>
    </section>
  );
}
