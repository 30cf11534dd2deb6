/**
 * Money by month: invoiced (less credit notes) beside what was kept of what was received (less refunds). The bars'
 * heights are drawn from the amounts; the table beside the chart gives them to the penny.
 */
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { MoneyMonth } from '@shared/schemas/reports';
import { formatMoney } from '@/lib/format';
import { monthLabel } from './labels';

export default function MoneyChart({ months, currency }: { months: MoneyMonth[]; currency: string }) {
  // Plotted only: heights on a chart, never summed or shown as figures.
  const data = months.map((m) => ({ label: monthLabel(m.month), invoiced: Number(m.invoiced) - Number(m.credited), kept: Number(m.net) }));
  return (
    <figure className="h-72 w-full" aria-label="Chart of money invoiced and received by month">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ top: 12, right: 8, bottom: 4, left: 8 }} barGap={2}>
          <CartesianGrid stroke="#eee1c6" strokeDasharray="3 3" vertical={false} />
          <XAxis dataKey="label" stroke="#7f5339" fontSize={11} />
          <YAxis stroke="#7f5339" fontSize={11} width={64} tickFormatter={(v: number) => formatMoney(String(Math.round(v)), currency).replace(/\.00$/, '')} />
          <Tooltip formatter={(v, name) => [formatMoney(Number(v).toFixed(2), currency), name]} />
          <Legend wrapperStyle={{ fontSize: 12 }} />
          <Bar dataKey="invoiced" name="Invoiced, less credit notes" fill="#513323" radius={[2, 2, 0, 0]} isAnimationActive={false} />
          <Bar dataKey="kept" name="Received, less refunds" fill="#4f6b3a" radius={[2, 2, 0, 0]} isAnimationActive={false} />
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
