/** Quotes by month as grouped bars, each series with its own fill. Loaded lazily (recharts is large). */
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { QuoteMonth } from '@shared/schemas/reports';
import { monthLabel } from './labels';

const SERIES = [
  { key: 'sent', name: 'Sent', fill: '#513323' },
  { key: 'opened', name: 'Opened', fill: '#a9825f' },
  { key: 'accepted', name: 'Accepted', fill: '#4f6b3a' },
  { key: 'declined', name: 'Declined', fill: '#9b3a1f' },
  { key: 'expired', name: 'Expired', fill: '#d6b98b' },
] as const;

export default function QuotesChart({ months }: { months: QuoteMonth[] }) {
  const data = months.map((m) => ({ ...m, label: monthLabel(m.month) }));
  return (
    <figure className="h-72 w-full" aria-label="Chart of quotes sent, opened, accepted, declined and expired by month">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ top: 12, right: 8, bottom: 4, left: 0 }} barGap={1}>
          <CartesianGrid stroke="#eee1c6" strokeDasharray="3 3" vertical={false} />
          <XAxis dataKey="label" stroke="#7f5339" fontSize={11} />
          <YAxis stroke="#7f5339" fontSize={11} width={32} allowDecimals={false} />
          <Tooltip />
          <Legend wrapperStyle={{ fontSize: 12 }} />
          {SERIES.map((s) => (
            <Bar key={s.key} dataKey={s.key} name={s.name} fill={s.fill} radius={[2, 2, 0, 0]} isAnimationActive={false} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
