import { ArrowLeft, ArrowRight, CircleCheck, GitCompare, RefreshCw } from 'lucide-react';
import { useCallback, useEffect, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { Dialog } from '@/components/dialog';
import { Spinner } from '@/components/spinner';
import { paths, pathTo } from '@/config/paths';
import { StateBadge } from '@/components/estimate-state-badge';
import { formatMoney } from '@/lib/format-figures';
import { useRepriceCandidates, useRepriceEstimates, type RepricedEstimate, type RepriceRow } from '../api/reprice';
import { TotalChange } from '../components/total-change';
import { sumTotals } from '../lib/change';

const link = 'font-medium text-walnut-800 underline decoration-amber-400 underline-offset-2 hover:text-amber-700';

function estimates(n: number): string {
  return `${n} estimate${n === 1 ? '' : 's'}`;
}

/** Old and new totals of several rows, when they share one currency. */
function Totals({ rows }: { rows: RepriceRow[] }) {
  const currency = rows[0]?.currency;
  if (!currency || rows.some((r) => r.currency !== currency)) return null;
  const before = sumTotals(rows.map((r) => r.oldTotal));
  const after = sumTotals(rows.map((r) => r.newTotal));
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <span className="num">{formatMoney(before, currency)}</span>
      <ArrowRight className="h-3.5 w-3.5 text-walnut-400" aria-label="becomes" />
      <span className="num font-semibold text-walnut-900">{formatMoney(after, currency)}</span>
      <TotalChange oldTotal={before} newTotal={after} currency={currency} />
    </span>
  );
}

function SelectAll({ rows, selected, onChange }: { rows: RepriceRow[]; selected: RepriceRow[]; onChange: (all: boolean) => void }) {
  const box = useRef<HTMLInputElement>(null);
  const some = selected.length > 0 && selected.length < rows.length;
  useEffect(() => {
    if (box.current) box.current.indeterminate = some;
  }, [some]);
  return (
    <input
      ref={box}
      type="checkbox"
      className="h-4 w-4 accent-amber-600"
      checked={rows.length > 0 && selected.length === rows.length}
      onChange={(e) => onChange(e.target.checked)}
      aria-label="Select every estimate"
    />
  );
}

function CandidatesTable({ rows, selected, toggle, setAll }: { rows: RepriceRow[]; selected: RepriceRow[]; toggle: (id: number) => void; setAll: (all: boolean) => void }) {
  const ids = new Set(selected.map((r) => r.id));
  const th = 'px-4 py-2.5 font-semibold';
  return (
    <div className="overflow-hidden rounded-xl border border-parchment-200 bg-white shadow-card">
      <div className="overflow-x-auto">
        <table className="min-w-full text-sm">
          <caption className="sr-only">Open estimates on an older price list</caption>
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              <th scope="col" className="w-10 px-4 py-2.5">
                <SelectAll rows={rows} selected={selected} onChange={setAll} />
              </th>
              <th scope="col" className={th}>Estimate</th>
              <th scope="col" className={th}>Customer</th>
              <th scope="col" className={th}>State</th>
              <th scope="col" className={th}>Priced with</th>
              <th scope="col" className={`${th} text-right`}>Total then</th>
              <th scope="col" className={`${th} text-right`}>Total now</th>
              <th scope="col" className={`${th} text-right`}>Change</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-parchment-200">
            {rows.map((r) => {
              const on = ids.has(r.id);
              return (
                <tr key={r.id} className={on ? 'bg-amber-50/70' : 'hover:bg-parchment-50'}>
                  <td className="px-4 py-2.5 align-middle">
                    <input type="checkbox" className="h-4 w-4 accent-amber-600" checked={on} onChange={() => toggle(r.id)} aria-label={`Select ${r.number}, ${r.customer}`} />
                  </td>
                  <td className="px-4 py-2.5 align-middle">
                    <Link to={pathTo.estimate(r.id)} className={`num ${link}`}>{r.number}</Link>
                    {r.title && <span className="block max-w-72 truncate text-xs text-walnut-500" title={r.title}>{r.title}</span>}
                  </td>
                  <td className="px-4 py-2.5 align-middle text-walnut-800">{r.customer}</td>
                  <td className="px-4 py-2.5 align-middle"><StateBadge state={r.state} /></td>
                  <td className="whitespace-nowrap px-4 py-2.5 align-middle text-walnut-600">{r.priceList}</td>
                  <td className="num px-4 py-2.5 text-right align-middle text-walnut-600" data-testid="old-total">{formatMoney(r.oldTotal, r.currency)}</td>
                  <td className="num px-4 py-2.5 text-right align-middle font-semibold text-walnut-900" data-testid="new-total">{formatMoney(r.newTotal, r.currency)}</td>
                  <td className="px-4 py-2.5 text-right align-middle"><TotalChange oldTotal={r.oldTotal} newTotal={r.newTotal} currency={r.currency} /></td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function ResultSummary({ done, before }: { done: RepricedEstimate[]; before: Map<number, RepriceRow> }) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => heading.current?.focus(), [done]);
  return (
    <section aria-labelledby="reprice-result" className="rounded-xl border border-moss-600/40 bg-moss-100/60 px-5 py-4 shadow-card">
      <h2 id="reprice-result" ref={heading} tabIndex={-1} className="flex items-center gap-2 text-lg font-semibold text-walnut-900 focus:outline-none">
        <CircleCheck className="h-5 w-5 text-moss-700" aria-hidden /> {estimates(done.length)} repriced
      </h2>
      <p className="mt-0.5 text-sm text-walnut-700">
        {done.length === 1 ? 'It has' : 'Each has'} a new revision priced with today's list. The earlier revisions are kept as they were: compare them to see what moved.
      </p>
      <ul className="mt-3 divide-y divide-moss-600/20 rounded-lg border border-moss-600/20 bg-white text-sm" aria-label="Repriced estimates">
        {done.map((e) => {
          const row = before.get(e.id);
          return (
            <li key={e.id} className="flex flex-wrap items-center gap-x-4 gap-y-1 px-4 py-2.5" data-testid={`repriced-${e.number}`}>
              <span className="min-w-48">
                <span className="num font-semibold text-walnut-900">{e.number}</span>
                {row && <span className="text-walnut-600"> · {row.customer}</span>}
              </span>
              <span className="text-walnut-700">
                Revision <span className="num font-medium">{e.revision}</span> saved
              </span>
              {row ? (
                <span className="inline-flex flex-wrap items-center gap-2">
                  <span className="num text-walnut-600">{formatMoney(row.oldTotal, row.currency)}</span>
                  <ArrowRight className="h-3.5 w-3.5 text-walnut-400" aria-label="now" />
                  <span className="num font-semibold text-walnut-900">{formatMoney(e.total, row.currency)}</span>
                  <TotalChange oldTotal={row.oldTotal} newTotal={e.total} currency={row.currency} />
                </span>
              ) : (
                <span className="num font-semibold">{e.total}</span>
              )}
              <span className="ml-auto flex gap-3">
                <Link to={pathTo.estimate(e.id)} className={link} aria-label={`Open ${e.number}`}>Open</Link>
                {e.revision > 1 && (
                  <Link to={pathTo.compareRevisions(e.id, e.revision - 1, e.revision)} className={`inline-flex items-center gap-1 ${link}`}>
                    <GitCompare className="h-3.5 w-3.5" aria-hidden /> Compare {e.revision - 1} and {e.revision}
                    <span className="sr-only"> of {e.number}</span>
                  </Link>
                )}
              </span>
            </li>
          );
        })}
      </ul>
    </section>
  );
}

/** The owner's list of open estimates priced with an older price list, to reprice some or all as new revisions. */
export function RepricePage() {
  const candidates = useRepriceCandidates();
  const reprice = useRepriceEstimates();
  const [picked, setPicked] = useState<ReadonlySet<number>>(new Set());
  const [confirming, setConfirming] = useState(false);
  const [batch, setBatch] = useState<Map<number, RepriceRow>>(new Map());
  const rows = candidates.data?.rows ?? [];
  const busy = reprice.isPending;
  const close = useCallback(() => {
    if (!busy) setConfirming(false);
  }, [busy]);
  const selected = rows.filter((r) => picked.has(r.id));

  const toggle = (id: number) =>
    setPicked((p) => {
      const next = new Set(p);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  const confirm = () => {
    setBatch(new Map(selected.map((r) => [r.id, r])));
    reprice.mutate(
      selected.map((r) => r.id),
      {
        onSuccess: () => setPicked(new Set()),
        onSettled: () => setConfirming(false),
      },
    );
  };

  return (
    <>
      <Link to={paths.priceList} className="mb-3 inline-flex items-center gap-1 text-sm text-walnut-600 hover:text-walnut-900">
        <ArrowLeft className="h-4 w-4" aria-hidden /> Price list
      </Link>
      <PageHeader
        title="Reprice open estimates"
        description="Draft and priced estimates whose figures come from an older price list, with their total at today's prices. Repricing saves a new revision with today's list; the revisions already saved never change."
      />
      <div className="space-y-5">
        {reprice.isSuccess && <ResultSummary done={reprice.data.repriced} before={batch} />}
        {reprice.isError && (
          <Alert tone="error" title="Repricing stopped">
            {reprice.error.message} Estimates before that one may already have their new revision: the list below is up to date.
          </Alert>
        )}
        {candidates.isError ? (
          <Alert tone="error" title="The open estimates could not be loaded">{candidates.error.message}</Alert>
        ) : candidates.isPending ? (
          <Spinner label="Working out today's totals…" />
        ) : rows.length === 0 ? (
          <Card>
            <p className="flex items-center gap-2 text-walnut-700">
              <CircleCheck className="h-5 w-5 text-moss-700" aria-hidden /> Every open estimate uses today's prices. There is nothing to reprice.
            </p>
          </Card>
        ) : (
          <>
            <div className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-parchment-200 bg-parchment-50 px-4 py-3 text-sm">
              <div className="space-y-0.5 text-walnut-700">
                <p>
                  <span className="font-semibold text-walnut-900">{rows.length} open {rows.length === 1 ? 'estimate uses' : 'estimates use'} older prices.</span> Today's price list:{' '}
                  {candidates.data.priceList}.
                </p>
                <p aria-live="polite">
                  {selected.length === 0 ? 'Select the estimates to reprice.' : <><span className="font-medium">{estimates(selected.length)} selected:</span> <Totals rows={selected} /></>}
                </p>
              </div>
              <Button variant="accent" disabled={selected.length === 0} onClick={() => setConfirming(true)}>
                <RefreshCw className="h-4 w-4" aria-hidden /> Reprice selected{selected.length > 0 ? ` (${selected.length})` : ''}
              </Button>
            </div>
            <CandidatesTable rows={rows} selected={selected} toggle={toggle} setAll={(all) => setPicked(new Set(all ? rows.map((r) => r.id) : []))} />
          </>
        )}
      </div>
      <Dialog title={`Reprice ${estimates(selected.length)}?`} open={confirming} onClose={close}>
        <p className="text-sm text-walnut-700">
          Each gets a new revision priced with today's price list ({candidates.data?.priceList}). The revisions already saved stay exactly as they are, so
          the change can be compared and explained to the customer.
        </p>
        <ul className="my-3 max-h-64 divide-y divide-parchment-200 overflow-y-auto rounded-lg border border-parchment-200 text-sm">
          {selected.map((r) => (
            <li key={r.id} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
              <span>
                <span className="num font-semibold text-walnut-900">{r.number}</span> <span className="text-walnut-600">· {r.customer}</span>
              </span>
              <span className="inline-flex items-center gap-2">
                <span className="num text-walnut-600">{formatMoney(r.oldTotal, r.currency)}</span>
                <ArrowRight className="h-3.5 w-3.5 text-walnut-400" aria-label="becomes" />
                <span className="num font-semibold">{formatMoney(r.newTotal, r.currency)}</span>
              </span>
            </li>
          ))}
        </ul>
        {selected.length > 1 && (
          <p className="mb-3 text-sm text-walnut-700">
            Together: <Totals rows={selected} />
          </p>
        )}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={close} disabled={busy}>Cancel</Button>
          <Button variant="accent" busy={busy} onClick={confirm}>
            <RefreshCw className="h-4 w-4" aria-hidden /> Reprice {estimates(selected.length)}
          </Button>
        </div>
      </Dialog>
    </>
  );
}

/** The route module's component for React Router's lazy loading. */
export const Component = RepricePage;
