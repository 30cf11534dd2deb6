import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { MaterialHistory } from '@shared/schemas/price-list';
import { formatDate, formatMoney, todayIso } from '@/lib/format';

const COLOURS = ['#9d5b19', '#3a2418', '#4f6b3a', '#bf7720', '#7f5339', '#a23b24'];
const DASHES = ['', '6 3', '2 3', '8 3 2 3', '1 4', '10 2'];

/**
 * Each pack's price over time as steps: a price holds until the next one takes effect. The figures are drawn from
 * numbers; every label shows the exact decimal string with its currency.
 */
export function PriceChart({ history }: { history: MaterialHistory }) {
  const packs = history.packs.filter((p) => p.history.length > 0);
  const today = todayIso();
  const dates = [...new Set([...packs.flatMap((p) => p.history.map((h) => h.effectiveFrom)), today])].sort();
  const data = dates.map((date) => {
    const point: Record<string, string | number | null> = { date, t: Date.parse(`${date}T12:00:00Z`) };
    for (const { pack, history: rows } of packs) {
      let current: string | null = null;
      for (const r of rows) if (r.effectiveFrom <= date) current = r.price;
      point[`p${pack.id}`] = current === null ? null : Number(current);
      point[`s${pack.id}`] = current;
    }
    return point;
  });
  const unit = history.material.unit;
  return (
    <figure className="h-72 w-full" aria-label={`Price history chart of ${history.material.name}`}>
      <ResponsiveContainer width="100%" height="100%">
        <LineChart data={data} margin={{ top: 8, right: 24, bottom: 8, left: 8 }}>
          <CartesianGrid stroke="#eee1c6" strokeDasharray="3 3" />
          <XAxis
            dataKey="t"
            type="number"
            scale="time"
            domain={['dataMin', 'dataMax']}
            ticks={data.map((d) => d.t as number)}
            tickFormatter={(t: number) => formatDate(new Date(t).toISOString())}
            stroke="#7f5339"
            fontSize={12}
          />
          <YAxis stroke="#7f5339" fontSize={12} width={72} tickFormatter={(v: number) => formatMoney(String(v), history.currency)} domain={['auto', 'auto']} />
          <Tooltip
            labelFormatter={(t) => formatDate(new Date(Number(t)).toISOString())}
            formatter={(_value, name, item) => {
              const id = String(item.dataKey).slice(1);
              const exact = (item.payload as Record<string, string | null>)[`s${id}`];
              return [exact ? formatMoney(exact, history.currency) : '—', name];
            }}
          />
          <Legend />
          {packs.map(({ pack }, i) => (
            <Line
              key={pack.id}
              type="stepAfter"
              dataKey={`p${pack.id}`}
              name={`${pack.size} ${unit} pack`}
              stroke={COLOURS[i % COLOURS.length]}
              strokeDasharray={DASHES[i % DASHES.length]}
              strokeWidth={2}
              dot={{ r: 3 }}
              connectNulls={false}
              isAnimationActive={false}
            />
          ))}
        </LineChart>
      </ResponsiveContainer>
      <figcaption className="sr-only">Steps show each price from its effective date until the next.</figcaption>
    </figure>
  );
}
