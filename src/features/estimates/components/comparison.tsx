import { ArrowRight, Minus, Plus } from 'lucide-react';
import type { ReactNode } from 'react';
import type { FigureChange, RevisionComparison } from '@shared/compare';
import type { UnitSystem } from '@shared/units';
import { formatDelta, formatMoney, formatMoneyDelta } from '@/lib/format-figures';
import { formatArea, formatMass, formatQuantity, formatVolume } from '../lib/measures';

function Section({ title, children, id, empty }: { title: string; children: ReactNode; id: string; empty?: boolean }) {
  return (
    <section aria-labelledby={id} className="min-w-0 rounded-xl border border-parchment-200 bg-white shadow-card">
      <h2 id={id} className="border-b border-parchment-200 px-4 py-2.5 text-base font-semibold text-walnut-800">
        {title}
      </h2>
      {empty ? <p className="px-4 py-3 text-sm text-walnut-500">No change.</p> : <div className="overflow-x-auto">{children}</div>}
    </section>
  );
}

/** A figure in the display units. */
function figureText(f: Pick<FigureChange, 'key' | 'unit'>, value: number, units: UnitSystem): string {
  switch (f.key) {
    case 'areaM2':
      return formatArea(value, units);
    case 'flakesG':
      return formatMass(value, units);
    case 'spiritL':
      return formatVolume(value, units);
    case 'labourHours':
      return `${value.toFixed(1)} h`;
    default:
      return `${value} ${f.unit}`;
  }
}

function deltaText(f: FigureChange, units: UnitSystem): string {
  if (f.delta === 0) return 'no change';
  const sign = f.delta > 0 ? '+' : '−';
  if (['areaM2', 'flakesG', 'spiritL'].includes(f.key)) return `${sign}${figureText(f, Math.abs(f.delta), units)}`;
  return formatDelta(f.delta, f.unit);
}

function Change({ text, delta }: { text: string; delta: number }) {
  if (delta === 0) return <span className="text-walnut-400">{text}</span>;
  const up = delta > 0;
  return (
    <span className={`inline-flex items-center gap-0.5 font-semibold ${up ? 'text-brick-700' : 'text-moss-700'}`}>
      {up ? <Plus className="h-3 w-3" aria-hidden /> : <Minus className="h-3 w-3" aria-hidden />}
      <span className="sr-only">{up ? 'up' : 'down'} </span>
      {text.replace(/^[+−]/, '')}
    </span>
  );
}

const th = 'px-3 py-2 font-semibold';
const td = 'px-3 py-1.5';
const num = 'num px-3 py-1.5 text-right whitespace-nowrap';

/** A revision's own wording of a price line (its hours and rate), shown above its own amount. */
function OwnLine({ label, line }: { label: string | null; line: string }) {
  if (!label || label === line) return null;
  return <span className="block whitespace-normal text-xs font-normal text-walnut-500">{label}</span>;
}

const KIND_WORD = { added: 'Added', removed: 'Removed', changed: 'Changed', same: 'Same' } as const;

/** Two revisions side by side: inputs that changed, then hours, materials and price, each with its change. */

/** The head of a before/after table: what is compared, the two revisions and the change. */
function CompareHead({ first, before, after }: { first: string; before: string; after: string }) {
  return (
    <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
      <tr>
        <th className={th}>{first}</th>
        <th className={`${th} text-right`}>{before}</th>
        <th className={`${th} text-right`}>{after}</th>
        <th className={`${th} text-right`}>Change</th>
      </tr>
    </thead>
  );
}

export function Comparison({ diff, units }: { diff: RevisionComparison; units: UnitSystem }) {
  const currency = diff.currency;
  const stages = diff.stages.filter((s) => s.kind !== 'same');
  const materials = diff.materials.filter((m) => m.kind !== 'same');
  const before = `Revision ${diff.from}`;
  const after = `Revision ${diff.to}`;
  return (
    <div className="space-y-5" data-testid="comparison">
      {diff.same && <p className="rounded-lg border border-walnut-200 bg-parchment-50 px-4 py-3 text-sm text-walnut-700">These two revisions are the same: nothing in the inputs or the figures differs.</p>}
      <Section id="cmp-inputs" title="What was changed in the inputs" empty={diff.inputs.length === 0}>
        <table className="min-w-full text-sm">
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              <th className={th}>Input</th>
              <th className={th}>{before}</th>
              <th className={th} aria-hidden />
              <th className={th}>{after}</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {diff.inputs.map((c) => (
              <tr key={c.path} data-testid={`input-change-${c.path}`}>
                <td className={td}>
                  <span className="font-medium text-walnut-900">{c.label}</span>
                  <span className="ml-2 rounded border border-walnut-200 px-1 text-xs text-walnut-600">{KIND_WORD[c.kind]}</span>
                </td>
                <td className={`${td} text-walnut-600 ${c.before === null ? 'italic' : 'line-through decoration-brick-600/50'}`}>{c.before ?? 'not set'}</td>
                <td className="px-1 text-walnut-400">
                  <ArrowRight className="h-3.5 w-3.5" aria-hidden />
                </td>
                <td className={`${td} font-medium ${c.after === null ? 'italic text-walnut-500' : 'text-walnut-900'}`}>{c.after ?? 'removed'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="cmp-figures" title="Figures">
        <table className="min-w-full text-sm">
          <CompareHead first="Figure" before={before} after={after} />
          <tbody className="divide-y divide-parchment-200">
            {diff.totals.map((f) => (
              <tr key={f.key} data-testid={`figure-${f.key}`}>
                <td className={td}>{f.label}</td>
                <td className={num}>{figureText(f, f.before, units)}</td>
                <td className={num}>{figureText(f, f.after, units)}</td>
                <td className={num}>
                  <Change text={deltaText(f, units)} delta={f.delta} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="cmp-hours" title="Hours per stage" empty={stages.length === 0}>
        <table className="min-w-full text-sm">
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              <th className={th}>Stage</th>
              <th className={`${th} text-right`}>Sessions</th>
              <th className={`${th} text-right`}>Coats</th>
              <th className={`${th} text-right`}>{before}</th>
              <th className={`${th} text-right`}>{after}</th>
              <th className={`${th} text-right`}>Change</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {stages.map((s) => (
              <tr key={s.key}>
                <td className={td}>
                  {s.name}
                  {s.nameBefore && <span className="block text-xs text-walnut-500">was “{s.nameBefore}”</span>}
                  {s.kind !== 'changed' && <span className="ml-2 rounded border border-walnut-200 px-1 text-xs text-walnut-600">{KIND_WORD[s.kind]}</span>}
                </td>
                <td className={num}>{s.sessions.before} → {s.sessions.after}</td>
                <td className={num}>{s.coats.before} → {s.coats.after}</td>
                <td className={num}>{s.hours.before.toFixed(1)} h</td>
                <td className={num}>{s.hours.after.toFixed(1)} h</td>
                <td className={num}>
                  <Change text={formatDelta(s.hours.delta, 'h')} delta={s.hours.delta} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="cmp-materials" title="Materials" empty={materials.length === 0}>
        <table className="min-w-full text-sm">
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              <th className={th}>Material</th>
              <th className={`${th} text-right`}>{before}</th>
              <th className={`${th} text-right`}>{after}</th>
              <th className={`${th} text-right`}>Change</th>
              <th className={`${th} text-right`}>Charge change</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {materials.map((m) => (
              <tr key={m.key} data-testid={`material-change-${m.key}`}>
                <td className={td}>
                  {m.name}
                  {m.kind !== 'changed' && <span className="ml-2 rounded border border-walnut-200 px-1 text-xs text-walnut-600">{KIND_WORD[m.kind]}</span>}
                </td>
                <td className={num}>{m.need.before === null ? '—' : formatQuantity(m.need.before, m.unit, units)}</td>
                <td className={num}>{m.need.after === null ? '—' : formatQuantity(m.need.after, m.unit, units)}</td>
                <td className={num}>
                  <Change text={`${m.need.delta > 0 ? '+' : '−'}${formatQuantity(Math.abs(m.need.delta), m.unit, units)}`} delta={m.need.delta} />
                </td>
                <td className={num}>
                  <Change text={formatMoneyDelta(m.charge.delta, currency)} delta={Number(m.charge.delta)} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="cmp-price" title="Price">
        <table className="min-w-full text-sm">
          <CompareHead first="Line" before={before} after={after} />
          <tbody className="divide-y divide-parchment-200">
            {diff.price.map((p) => (
              <tr key={p.key} className={p.key === 'total' ? 'bg-parchment-50 font-semibold' : ''} data-testid={`price-change-${p.key}`}>
                <td className={td}>{p.label}</td>
                <td className={num}>
                  <OwnLine label={p.labelBefore} line={p.label} />
                  {p.before === null ? '—' : formatMoney(p.before, currency)}
                </td>
                <td className={num}>
                  <OwnLine label={p.labelAfter} line={p.label} />
                  {p.after === null ? '—' : formatMoney(p.after, currency)}
                </td>
                <td className={num}>
                  <Change text={formatMoneyDelta(p.delta, currency)} delta={Number(p.delta)} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>
    </div>
  );
}
