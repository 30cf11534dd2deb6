import { Link } from 'react-router-dom';
import type { QuoteDetail } from '@shared/schemas/quotes';
import { pathTo } from '@/config/paths';
import { formatMoney } from '@/lib/format';

/**
 * The pieces and options of a quote of several lines: each line's estimate and revision, its option name, whether it
 * is recommended, and (once accepted) whether the customer chose it. Nothing shows for a quote of one line.
 */
export function QuoteLines({ quote }: { quote: QuoteDetail }) {
  if (quote.lines.length <= 1) return null;
  const groups = [...new Set(quote.lines.map((l) => l.group))];
  return (
    <section aria-labelledby="lines-heading" className="rounded-xl border border-parchment-200 bg-white px-5 py-4 shadow-card" data-testid="quote-lines-view">
      <h2 id="lines-heading" className="mb-3 text-lg font-semibold text-walnut-800">Pieces and options</h2>
      <div className="overflow-x-auto">
      <table className="w-full text-sm">
        <thead className="border-b border-parchment-200 text-left text-xs uppercase tracking-wide text-walnut-500">
          <tr>
            <th scope="col" className="py-1.5 pr-3">Piece</th>
            <th scope="col" className="py-1.5 pr-3">Option</th>
            <th scope="col" className="py-1.5 pr-3">Estimate</th>
            <th scope="col" className="py-1.5 pr-4 text-right">Total</th>
            <th scope="col" className="py-1.5">Choice</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {quote.lines.map((l) => {
            const of = quote.lines.filter((x) => x.group === l.group);
            return (
              <tr key={l.id} data-testid={`quote-line-${l.position}`}>
                <td className="py-1.5 pr-3">
                  {groups.indexOf(l.group) + 1}. {l.piece.description}
                  {l.groupOptional && <span className="ml-1 text-xs text-walnut-500">(may be left out)</span>}
                </td>
                <td className="py-1.5 pr-3">
                  {l.label || '—'}
                  {l.recommended && of.length > 1 && <span className="ml-1 text-xs text-amber-800">recommended</span>}
                </td>
                <td className="whitespace-nowrap py-1.5 pr-3">
                  <Link to={pathTo.estimate(l.estimate.id)} className="num underline decoration-amber-400 underline-offset-2">{l.estimate.number}</Link> rev. {l.estimate.revision}
                </td>
                <td className="num whitespace-nowrap py-1.5 pr-4 text-right">{formatMoney(l.total, quote.currency)}</td>
                <td className="whitespace-nowrap py-1.5" data-testid={`quote-line-${l.position}-choice`}>{l.chosen === null ? '—' : l.chosen ? 'Chosen' : 'Not chosen'}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      </div>
      <p className="mt-2 text-xs text-walnut-500">{quote.agreed ? 'The price below is for the options the customer chose.' : 'The price below is for the recommended options; the customer’s choice sets the accepted total.'}</p>
    </section>
  );
}
