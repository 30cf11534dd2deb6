/**
 * Estimated against actual hands-on hours per stage kind, as paired bars. Loaded lazily (recharts is large).
 * The two series differ in fill and outline as well as colour, and each bar carries its figure.
 */
import { Bar, BarChart, CartesianGrid, LabelList, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { STAGE_KIND_LABELS, type ActualsKindRow } from '@shared/schemas/planning';

export default function ActualsChart({ kinds }: { kinds: ActualsKindRow[] }) {
  const data = kinds.map((k) => ({ name: STAGE_KIND_LABELS[k.kind], estimated: k.estimatedHours, actual: k.actualHours }));
  return (
    <figure className="h-80 w-full" aria-label="Chart of estimated against actual hours by stage kind">
      <svg width="0" height="0" aria-hidden className="absolute">
        <defs>
          <pattern id="actual-hatch" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <rect width="6" height="6" fill="#e9b651" />
            <line x1="0" y1="0" x2="0" y2="6" stroke="#9d5b19" strokeWidth="2" />
          </pattern>
        </defs>
      </svg>
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ top: 20, right: 16, bottom: 8, left: 8 }} barGap={2}>
          <CartesianGrid stroke="#eee1c6" strokeDasharray="3 3" vertical={false} />
          <XAxis dataKey="name" stroke="#7f5339" fontSize={12} interval={0} />
          <YAxis stroke="#7f5339" fontSize={12} width={56} tickFormatter={(v: number) => `${v} h`} />
          <Tooltip formatter={(v, name) => [`${Number(v).toFixed(2)} h`, name === 'estimated' ? 'Estimated' : 'Actual']} />
          <Legend formatter={(v: string) => (v === 'estimated' ? 'Estimated hours' : 'Actual hours (hatched)')} />
          <Bar dataKey="estimated" fill="#513323" radius={[3, 3, 0, 0]}>
            <LabelList dataKey="estimated" position="top" fontSize={10} fill="#513323" formatter={(v) => `${Math.round(Number(v))}`} />
          </Bar>
          <Bar dataKey="actual" fill="url(#actual-hatch)" stroke="#9d5b19" radius={[3, 3, 0, 0]}>
            <LabelList dataKey="actual" position="top" fontSize={10} fill="#7d4418" formatter={(v) => `${Math.round(Number(v))}`} />
          </Bar>
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
