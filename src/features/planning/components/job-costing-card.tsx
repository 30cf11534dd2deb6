/** The owner's view of what a job really cost, against what it was estimated to cost. Never shown to customers. */
import { Card } from '@/components/card';
import { Alert } from '@/components/alert';
import { Spinner } from '@/components/spinner';
import { formatMoney } from '@/lib/format';
import { useJobCosting } from '../api/job-costing';

const h = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 2 });
const pct = (n: number | null) => (n === null ? '—' : `${n.toFixed(1).replace(/^-/, '\u2212')} %`);

export function JobCostingCard({ jobId }: { jobId: number }) {
  const costing = useJobCosting(jobId, true);
  if (costing.isPending) return <Spinner label="Costing the job…" />;
  if (costing.isError) return <Alert tone="error" title="The costing could not be loaded">{costing.error.message}</Alert>;
  const c = costing.data;
  const m = (a: string) => formatMoney(a, c.currency);
  const rows: [string, string, string][] = [
    [`Agreed price without tax (${h.format(c.taxPct)} %)${c.credited !== '0.00' ? `, less ${m(c.credited)} credited` : ''}`, m(c.estimated.net), m(c.agreedNet)],
    [`Labour: ${h.format(c.estimated.hours)} h estimated, ${h.format(c.labour.hours)} h actual at ${m(c.labour.perHour)} an hour`, m(c.estimated.labour), m(c.labour.cost)],
    ['Materials (estimated at cost; used at the price paid)', m(c.estimated.materials), m(c.materials.cost)],
    [`Overhead (${h.format(c.overhead.pct)} % of labour and materials)`, m(c.estimated.overhead), m(c.overhead.cost)],
    ['Margin', `${m(c.estimated.margin)} (${pct(c.estimated.marginPct)})`, `${m(c.realisedMargin)} (${pct(c.realisedMarginPct)})`],
  ];
  return (
    <Card title="Job costing">
      <div className="space-y-3">
        <p className="text-sm text-walnut-600">
          Agreed {m(c.agreedPrice)} with tax{c.variations.length ? `, with ${c.variations.map((v) => `${v.label} (${m(v.amount)})`).join(', ')}` : ''}. {c.sessionsDone} of {c.sessionsTotal} sessions done: the actual side grows as the work goes on.
        </p>
        <div className="overflow-x-auto">
          <table className="min-w-full text-sm">
            <caption className="sr-only">Estimated against actual cost and margin</caption>
            <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
              <tr>
                <th scope="col" className="px-3 py-2"></th>
                <th scope="col" className="px-3 py-2 text-right">Estimated</th>
                <th scope="col" className="px-3 py-2 text-right">Actual</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-parchment-200">
              {rows.map(([label, est, act], i) => (
                <tr key={label} className={i === rows.length - 1 ? 'font-semibold text-walnut-900' : ''}>
                  <th scope="row" className="px-3 py-2 text-left font-normal">{label}</th>
                  <td className="num px-3 py-2 text-right whitespace-nowrap">{est}</td>
                  <td className="num px-3 py-2 text-right whitespace-nowrap">{act}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {c.account && (
          <p className="text-sm text-walnut-600">
            {c.account.wholeAgreement ? 'The agreement (all its pieces): ' : 'Paid so far: '}
            {m(c.account.received)} received, {m(c.account.credited)} credited, {m(c.account.balance)} still owed.
          </p>
        )}
        {c.materials.lines.length > 0 && (
          <p className="text-xs text-walnut-500">Used: {c.materials.lines.map((l) => `${l.material} ${l.packs !== null && l.pack ? `${h.format(l.packs)} × ${l.pack}` : `${h.format(l.quantity)} ${l.unit}`} (${m(l.cost)})`).join(' · ')}</p>
        )}
      </div>
    </Card>
  );
}
