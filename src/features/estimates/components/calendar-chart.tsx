/**
 * The coat calendar as a chart: one row per session, hands-on time then the rest before the next session may
 * start. Loaded lazily (recharts is large).
 */
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { CalendarResult } from '@shared/schemas/calc';
import { formatDateTime } from '@/lib/format-figures';

const DAY_MS = 86_400_000;
const at = (t: string) => new Date(`${t.length === 10 ? `${t}T00:00` : t}:00Z`).getTime();

interface Row {
  name: string;
  offset: number;
  work: number;
  rest: number;
  start: string;
  end: string;
  restUntil: string;
  handsOnHours: number;
  restHours: number;
}

export function toRows(calendar: CalendarResult, stageNames: Record<string, string>): Row[] {
  const origin = at(calendar.start.slice(0, 10));
  return calendar.sessions.map((s) => {
    const start = at(s.start);
    const end = at(s.end);
    const restUntil = at(s.restUntil);
    return {
      name: `${stageNames[s.stage] ?? s.stage} ${s.session}`,
      offset: (start - origin) / DAY_MS,
      work: Math.max(0.04, (end - start) / DAY_MS),
      rest: Math.max(0, (restUntil - end) / DAY_MS),
      start: s.start,
      end: s.end,
      restUntil: s.restUntil,
      handsOnHours: s.handsOnHours,
      restHours: s.restHours,
    };
  });
}

function SessionTooltip({ active, payload }: { active?: boolean; payload?: ReadonlyArray<{ payload?: Row }> }) {
  const row = active ? payload?.[0]?.payload : undefined;
  if (!row) return null;
  return (
    <div className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-xs text-walnut-800 shadow-card">
      <p className="font-semibold">{row.name}</p>
      <p className="num">
        Session {formatDateTime(row.start)} – {formatDateTime(row.end)} ({row.handsOnHours.toFixed(1)} h hands-on)
      </p>
      <p className="num">
        Rest {row.restHours.toFixed(0)} h, until {formatDateTime(row.restUntil)}
      </p>
    </div>
  );
}

export default function CalendarChart({ calendar, stageNames }: { calendar: CalendarResult; stageNames: Record<string, string> }) {
  const rows = toRows(calendar, stageNames);
  const height = Math.max(220, rows.length * 20 + 70);
  return (
    <div style={{ height }} data-testid="calendar-chart" role="img" aria-label={`Calendar of ${rows.length} sessions over ${calendar.calendarDays} days`}>
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={rows} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 8 }} barCategoryGap={3}>
          <CartesianGrid horizontal={false} stroke="#eee1c6" />
          <XAxis type="number" domain={[0, 'dataMax']} tickFormatter={(d: number) => `day ${Math.round(d) + 1}`} stroke="#7f5339" fontSize={11} allowDecimals={false} />
          <YAxis type="category" dataKey="name" width={230} stroke="#7f5339" fontSize={11} interval={0} />
          <Tooltip content={<SessionTooltip />} cursor={{ fill: '#f7f0e2' }} />
          <Legend verticalAlign="top" height={26} iconType="square" wrapperStyle={{ fontSize: 12 }} />
          <Bar dataKey="offset" stackId="t" fill="transparent" legendType="none" isAnimationActive={false} />
          <Bar dataKey="work" name="Session (hands-on)" stackId="t" fill="#bf7720" isAnimationActive={false} />
          <Bar dataKey="rest" name="Rest before the next session" stackId="t" fill="#d6b9a2" isAnimationActive={false} />
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
