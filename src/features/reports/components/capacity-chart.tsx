/** Use of the drying room and of polishers' hours by week, in percent of what was there, with 100 % marked. */
import { CartesianGrid, Legend, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { CapacityWeek } from '@shared/schemas/reports';
import { weekLabel } from './labels';

export default function CapacityChart({ weeks, today }: { weeks: CapacityWeek[]; today: string }) {
  const data = weeks.map((w) => ({ label: weekLabel(w.week), room: w.roomPct ?? 0, polishers: w.polisherPct ?? 0, past: w.past }));
  const current = weeks.find((w) => !w.past);
  return (
    <figure className="h-72 w-full" aria-label="Chart of drying-room and polisher use by week, in percent">
      <ResponsiveContainer width="100%" height="100%">
        <LineChart data={data} margin={{ top: 12, right: 12, bottom: 4, left: 0 }}>
          <CartesianGrid stroke="#eee1c6" strokeDasharray="3 3" vertical={false} />
          <XAxis dataKey="label" stroke="#7f5339" fontSize={11} />
          <YAxis stroke="#7f5339" fontSize={11} width={44} tickFormatter={(v: number) => `${v} %`} />
          <Tooltip formatter={(v, name) => [`${Number(v).toFixed(1)} %`, name]} />
          <Legend wrapperStyle={{ fontSize: 12 }} />
          <ReferenceLine y={100} stroke="#9b3a1f" strokeDasharray="4 4" label={{ value: 'full', fontSize: 10, fill: '#9b3a1f', position: 'insideTopRight' }} />
          {current && <ReferenceLine x={weekLabel(current.week)} stroke="#bf7720" label={{ value: `week of ${today}`, fontSize: 10, fill: '#7d4418', position: 'insideTopLeft' }} />}
          <Line type="monotone" dataKey="room" name="Drying room" stroke="#513323" strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} />
          <Line type="monotone" dataKey="polishers" name="Polishers' hours" stroke="#bf7720" strokeWidth={2} strokeDasharray="6 3" dot={{ r: 3 }} isAnimationActive={false} />
        </LineChart>
      </ResponsiveContainer>
    </figure>
  );
}
