/**
 * What the booked jobs will use over the coming weeks (shellac flakes, spirit and the rest, spread over their
 * sessions' days), against the stock on hand the owner keeps, with a shopping list in the supplier's packs.
 */
import { AlertTriangle, CircleCheck, ShoppingBasket } from 'lucide-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { ForecastRow } from '@shared/schemas/planning';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { paths } from '@/config/paths';
import { useMe } from '@/lib/me';
import { formatDate, formatMoney } from '@/lib/format';
import { useForecast, useSetStock, useStock } from '../api/forecast';

const nf = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });

/** A quantity with its unit; large masses and volumes also in kg or L. */
export function quantity(value: number, unit: string): string {
  const base = `${nf.format(value)} ${unit}`;
  if (unit === 'g' && value >= 1000) return `${base} (${nf.format(value / 1000)} kg)`;
  if (unit === 'mL' && value >= 1000) return `${base} (${nf.format(value / 1000)} L)`;
  return base;
}

function StockCell({ row, canEdit }: { row: ForecastRow; canEdit: boolean }) {
  const set = useSetStock();
  const [value, setValue] = useState(String(row.stock));
  if (!canEdit || row.materialId === null) return <>{quantity(row.stock, row.unit)}</>;
  const changed = value !== String(row.stock);
  return (
    <form
      className="flex items-center justify-end gap-1.5"
      onSubmit={(e) => {
        e.preventDefault();
        set.mutate({ materialId: row.materialId!, quantity: Number(value) });
      }}
    >
      <input
        type="number"
        min="0"
        step="any"
        value={value}
        onChange={(e) => setValue(e.target.value)}
        aria-label={`Stock of ${row.name} (${row.unit})`}
        aria-invalid={set.isError || undefined}
        className="num w-24 rounded-md border border-walnut-200 px-2 py-1 text-right text-sm focus:border-amber-500 focus:ring-2 focus:ring-amber-200 focus:outline-none"
      />
      <span className="w-8 text-left text-xs text-walnut-500">{row.unit}</span>
      <Button type="submit" size="sm" variant="secondary" disabled={!changed || value === ''} busy={set.isPending}>
        Save
      </Button>
      {set.isError && <span className="text-xs text-brick-700">▲ {set.error.message}</span>}
    </form>
  );
}

export function ForecastPage() {
  const [weeks, setWeeks] = useState(4);
  const forecast = useForecast(weeks);
  const stock = useStock();
  const me = useMe();
  const isOwner = can(me.data?.role, 'editStock');

  if (forecast.isPending) return <Spinner label="Adding up what the jobs will use…" />;
  if (forecast.isError) return <Alert tone="error" title="The forecast could not be loaded">{forecast.error.message}</Alert>;
  const f = forecast.data;
  const toBuy = f.rows.filter((r) => r.short > 0);
  const jobPath = (id: number) => paths.planningJob.replace(':jobId', String(id));
  const onHandOnly = (stock.data ?? []).filter((s) => s.quantity > 0 && !f.rows.some((r) => r.materialId === s.materialId));

  return (
    <div className="space-y-6">
      <PageHeader
        title="Material forecast"
        description={`What the booked jobs will use from ${formatDate(f.from)} to ${formatDate(f.to)}: each stage's shellac, spirit and other materials spread over its sessions, against the stock on hand.`}
        actions={
          <label className="flex items-center gap-2 text-sm text-walnut-700">
            Next
            <select className="rounded-md border border-walnut-200 bg-white px-2 py-1 text-sm" value={weeks} onChange={(e) => setWeeks(Number(e.target.value))} aria-label="Weeks ahead">
              {[2, 4, 8, 12, 26].map((w) => (
                <option key={w} value={w}>
                  {w} weeks
                </option>
              ))}
            </select>
          </label>
        }
      />

      <div className="grid gap-3 sm:grid-cols-3">
        <div className="rounded-xl border border-parchment-200 bg-white px-4 py-3 shadow-card">
          <p className="text-xs font-semibold tracking-wide text-walnut-500 uppercase">Jobs with sessions ahead</p>
          <p className="num text-lg font-semibold text-walnut-900">{f.jobs.length}</p>
        </div>
        <div className={`rounded-xl border px-4 py-3 shadow-card ${toBuy.length ? 'border-amber-400 bg-amber-50' : 'border-moss-600/30 bg-moss-100/60'}`}>
          <p className="text-xs font-semibold tracking-wide text-walnut-600 uppercase">Materials short</p>
          <p className="num flex items-center gap-1.5 text-lg font-semibold text-walnut-900">
            {toBuy.length ? <AlertTriangle className="h-4 w-4 text-amber-700" aria-hidden /> : <CircleCheck className="h-4 w-4 text-moss-700" aria-hidden />}
            {toBuy.length ? `${toBuy.length} of ${f.rows.length}` : 'None: stock covers it'}
          </p>
        </div>
        <div className="rounded-xl border border-parchment-200 bg-white px-4 py-3 shadow-card">
          <p className="text-xs font-semibold tracking-wide text-walnut-500 uppercase">Shopping list, before tax</p>
          <p className="num text-lg font-semibold text-walnut-900" data-testid="forecast-total">
            {formatMoney(f.total, f.currency)}
          </p>
        </div>
      </div>

      <Card title={`Needed in the next ${weeks} weeks`}>
        {f.rows.length === 0 ? (
          <p className="text-sm text-walnut-500">No booked session falls in these weeks.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="min-w-full text-sm">
              <caption className="sr-only">Materials needed, stock and what to buy</caption>
              <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
                <tr>
                  <th scope="col" className="px-3 py-2">Material</th>
                  <th scope="col" className="px-3 py-2 text-right">Needed</th>
                  <th scope="col" className="px-3 py-2">By week</th>
                  <th scope="col" className="px-3 py-2 text-right">In stock</th>
                  <th scope="col" className="px-3 py-2 text-right">Short</th>
                  <th scope="col" className="px-3 py-2">Buy</th>
                  <th scope="col" className="px-3 py-2 text-right">Cost ({f.currency})</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-parchment-200">
                {f.rows.map((r) => {
                  const peak = Math.max(...r.byWeek, 0.0001);
                  return (
                    <tr key={r.key}>
                      <td className="px-3 py-2 font-medium text-walnut-900">{r.name}</td>
                      <td className="num px-3 py-2 text-right whitespace-nowrap">{quantity(r.need, r.unit)}</td>
                      <td className="px-3 py-2">
                        <span className="flex h-6 items-end gap-0.5" role="img" aria-label={`By week: ${r.byWeek.map((v) => `${nf.format(v)} ${r.unit}`).join(', ')}`}>
                          {r.byWeek.map((v, i) => (
                            <span key={i} className="w-2 rounded-t-sm bg-amber-400" style={{ height: `${Math.max(v > 0 ? 10 : 2, (v / peak) * 100)}%`, opacity: v > 0 ? 1 : 0.3 }} />
                          ))}
                        </span>
                      </td>
                      <td className="num px-3 py-2 text-right whitespace-nowrap">
                        <StockCell key={r.stock} row={r} canEdit={isOwner} />
                      </td>
                      <td className="num px-3 py-2 text-right whitespace-nowrap">
                        {r.short > 0 ? (
                          <span className="inline-flex items-center gap-1 font-semibold text-amber-800">
                            <AlertTriangle className="h-3.5 w-3.5" aria-hidden /> {quantity(r.short, r.unit)}
                          </span>
                        ) : (
                          <span className="inline-flex items-center gap-1 text-moss-700">
                            <CircleCheck className="h-3.5 w-3.5" aria-hidden /> covered
                          </span>
                        )}
                      </td>
                      <td className="px-3 py-2">
                        {r.unpriced ? (
                          <span className="text-brick-700">not in the price list</span>
                        ) : r.packs.length ? (
                          <span className="inline-flex items-center gap-1.5">
                            <ShoppingBasket className="h-3.5 w-3.5 text-walnut-500" aria-hidden />
                            {r.packs.map((p) => `${p.count} × ${nf.format(p.size)} ${r.unit}${p.label ? ` (${p.label})` : ''}`).join(', ')}
                          </span>
                        ) : (
                          <span className="text-walnut-400">—</span>
                        )}
                      </td>
                      <td className="num px-3 py-2 text-right">{r.packs.length ? formatMoney(r.cost, f.currency) : '—'}</td>
                    </tr>
                  );
                })}
              </tbody>
              <tfoot>
                <tr className="border-t-2 border-walnut-200 font-semibold">
                  <td className="px-3 py-2" colSpan={6}>
                    Shopping list, before tax, at today&rsquo;s pack prices
                  </td>
                  <td className="num px-3 py-2 text-right">{formatMoney(f.total, f.currency)}</td>
                </tr>
              </tfoot>
            </table>
          </div>
        )}
        {!isOwner && <p className="mt-3 text-xs text-walnut-500">The owner keeps the stock on hand up to date.</p>}
      </Card>

      {f.jobs.length > 0 && (
        <Card title="By job">
          <ul className="divide-y divide-parchment-200 text-sm">
            {f.jobs.map((j) => (
              <li key={j.id} className="py-2">
                <p>
                  <Link to={jobPath(j.id)} className="font-semibold text-walnut-800 hover:underline">
                    {j.number}
                  </Link>{' '}
                  · {j.title} · {j.sessions} session{j.sessions === 1 ? '' : 's'} in these weeks
                </p>
                <p className="num text-xs text-walnut-600">
                  {Object.entries(j.materials)
                    .map(([k, v]) => {
                      const row = f.rows.find((r) => r.key === k);
                      return `${row?.name ?? k} ${nf.format(v)} ${row?.unit ?? ''}`;
                    })
                    .join(' · ')}
                </p>
              </li>
            ))}
          </ul>
        </Card>
      )}

      {onHandOnly.length > 0 && (
        <Card title="Also on the shelf">
          <p className="text-sm text-walnut-700">{onHandOnly.map((s) => `${s.name}: ${quantity(s.quantity, s.unit)}`).join(' · ')}</p>
        </Card>
      )}
    </div>
  );
}
