import type { UnitSystem } from '@shared/units';

/** Metric or imperial display, for this user on this browser. */
export function UnitsToggle({ value, onChange }: { value: UnitSystem; onChange: (u: UnitSystem) => void }) {
  return (
    <div role="group" aria-label="Display units" className="inline-flex overflow-hidden rounded-md border border-walnut-200 bg-white text-xs font-medium">
      {(['metric', 'imperial'] as const).map((u) => (
        <button
          key={u}
          type="button"
          aria-pressed={value === u}
          onClick={() => onChange(u)}
          className={`px-2.5 py-1 ${value === u ? 'bg-walnut-800 text-parchment-50' : 'text-walnut-700 hover:bg-parchment-100'}`}
        >
          {u === 'metric' ? 'Metric (m², L, g)' : 'Imperial (ft², pt, oz)'}
        </button>
      ))}
    </div>
  );
}
