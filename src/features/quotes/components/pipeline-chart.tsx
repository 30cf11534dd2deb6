import { Bar, BarChart, CartesianGrid, Cell, LabelList, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { QUOTE_STATE_LABELS, type PipelineRow } from '@shared/schemas/quotes';
import { formatMoney } from '@/lib/format';

/** Fills and patterns per state: the bars are labelled with the state's word too, so colour is never the only cue. */
const FILL: Record<PipelineRow['state'], string> = {
  draft: '#d6b9a2',
  quoted: '#9c6d4f',
  viewed: '#d9932f',
  accepted: '#4f6b3a',
  declined: '#a23b24',
  expired: '#bb9172',
  'deposit-paid': '#3f5630',
  withdrawn: '#ebdcd0',
};

function shortMoney(value: number, currency: string): string {
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency, notation: 'compact', maximumFractionDigits: 1 }).format(value);
}

/** Value of the quotes in each state, one bar per state, with the count on the bar. Loaded only when shown. */
export function PipelineChart({ rows, currency }: { rows: PipelineRow[]; currency: string }) {
  const data = rows.map((r) => ({ state: r.state, name: QUOTE_STATE_LABELS[r.state], value: Number(r.value), exact: r.value, count: r.count }));
  return (
    <figure className="h-64 w-full" aria-label="Chart of quote value by state">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ top: 20, right: 12, bottom: 4, left: 8 }}>
          <CartesianGrid stroke="#eee1c6" strokeDasharray="3 3" vertical={false} />
          <XAxis dataKey="name" stroke="#7f5339" fontSize={12} interval={0} tickLine={false} />
          <YAxis stroke="#7f5339" fontSize={12} width={64} tickFormatter={(v: number) => shortMoney(v, currency)} />
          <Tooltip
            cursor={{ fill: '#f7f0e2' }}
            formatter={(_v, _n, item) => {
              const p = item.payload as (typeof data)[number];
              return [`${formatMoney(p.exact, currency)} in ${p.count} ${p.count === 1 ? 'quote' : 'quotes'}`, 'Value'];
            }}
          />
          <Bar dataKey="value" radius={[4, 4, 0, 0]} isAnimationActive={false}>
            {data.map((d) => (
              <Cell key={d.state} fill={FILL[d.state]} stroke="#3a2418" strokeWidth={0.5} />
            ))}
            <LabelList dataKey="count" position="top" fontSize={12} fill="#3a2418" formatter={(v) => `${String(v)} ×`} />
          </Bar>
        </BarChart>
      </ResponsiveContainer>
      <figcaption className="sr-only">Bar heights show each state’s value; the figure above each bar is the number of quotes.</figcaption>
    </figure>
  );
}
