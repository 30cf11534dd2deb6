import type { AgreedFigures, QuoteExtra, QuotePricing } from '@shared/schemas/quotes';
import { formatMoney } from '@/lib/format';

function pct(n: number): string {
  return `${n.toLocaleString('en-GB', { maximumFractionDigits: 2 })} %`;
}

/**
 * A quote's price as the customer reads it: every line of the breakdown (discount and tax among them), the total,
 * the deposit and the balance. Optional extras are listed apart, priced with tax, never in the total. Once the
 * customer has accepted, the extras they took and the agreed total follow, and the deposit and balance are on it.
 */
export function PriceBreakdown({
  pricing,
  extras = [],
  pricesIncludeTax,
  agreed = null,
  caption = 'Price breakdown',
}: {
  pricing: QuotePricing;
  extras?: QuoteExtra[];
  pricesIncludeTax?: boolean;
  agreed?: AgreedFigures | null;
  caption?: string;
}) {
  const c = pricing.currency;
  const deposit = agreed?.deposit ?? pricing.deposit;
  const balance = agreed?.balance ?? pricing.balance;
  const tax = pricing.taxLabel || 'tax';
  return (
    <div className="space-y-4">
      <table className="w-full text-sm" data-testid="price-breakdown">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-parchment-200 text-left text-xs uppercase tracking-wide text-walnut-500">
            <th scope="col" className="py-1.5 font-semibold">Item</th>
            <th scope="col" className="py-1.5 text-right font-semibold">Amount ({c})</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {pricing.lines.map((l) => (
            <tr key={l.code} data-line={l.code} className={l.code === 'discount' ? 'text-moss-700' : l.code === 'tax' ? 'text-walnut-600' : ''}>
              <td className="py-1.5 pr-3">{l.label}</td>
              <td className="num py-1.5 text-right">{formatMoney(l.amount, c)}</td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr className="border-t-2 border-walnut-800">
            <th scope="row" className="py-2 text-left font-serif text-base font-semibold text-walnut-900">
              Total, {tax} included
            </th>
            <td className="num py-2 text-right font-serif text-lg font-semibold text-walnut-900" data-testid="quote-total">
              {formatMoney(pricing.total, c)}
            </td>
          </tr>
          {agreed &&
            agreed.extras.map((x) => (
              <tr key={x.id} data-line={`extra-${x.id}`}>
                <th scope="row" className="py-1.5 pr-3 text-left font-normal">Extra taken: {x.label}</th>
                <td className="num py-1.5 text-right">{formatMoney(x.priceWithTax, c)}</td>
              </tr>
            ))}
          {agreed && (
            <tr className="border-t-2 border-amber-500">
              <th scope="row" className="py-2 text-left font-serif text-base font-semibold text-walnut-900">
                Agreed total{agreed.extras.length > 0 ? ', with the extras taken' : ''}
              </th>
              <td className="num py-2 text-right font-serif text-lg font-semibold text-walnut-900" data-testid="agreed-total">
                {formatMoney(agreed.total, c)}
              </td>
            </tr>
          )}
        </tfoot>
      </table>
      {pricesIncludeTax !== undefined && (
        <p className="text-xs italic text-walnut-500">
          {pricesIncludeTax
            ? `Prices include ${tax} at ${pct(pricing.taxPct)}; its line shows how much of the total it is.`
            : `Prices are before ${tax}, added at ${pct(pricing.taxPct)} on its own line; the total includes it.`}
        </p>
      )}
      <dl className="grid gap-px overflow-hidden rounded-lg border border-amber-300 bg-amber-300 text-sm sm:grid-cols-2">
        <div className="bg-amber-50 px-3 py-2">
          <dt className="text-xs uppercase tracking-wide text-amber-800">Deposit on acceptance ({pct(pricing.depositPct)})</dt>
          <dd className="num font-serif text-lg font-semibold text-walnut-900" data-testid="quote-deposit">{formatMoney(deposit, c)}</dd>
        </div>
        <div className="bg-amber-50 px-3 py-2">
          <dt className="text-xs uppercase tracking-wide text-amber-800">Balance when the piece is ready</dt>
          <dd className="num font-serif text-lg font-semibold text-walnut-900" data-testid="quote-balance">{formatMoney(balance, c)}</dd>
        </div>
      </dl>
      {extras.length > 0 && !agreed && (
        <div>
          <h3 className="text-sm font-semibold text-walnut-800">Optional extras (not in the total)</h3>
          <ul className="mt-1 divide-y divide-parchment-200 text-sm">
            {extras.map((x) => (
              <li key={x.id} className="flex items-start justify-between gap-3 py-1.5">
                <span>
                  <span className="font-medium text-walnut-900">{x.label}</span>
                  {x.description && <span className="block text-xs text-walnut-500">{x.description}</span>}
                  <span className="block text-xs text-walnut-500 num">{x.hours.toLocaleString('en-GB')} h of work</span>
                </span>
                <span className="num shrink-0 text-right">
                  {formatMoney(x.priceWithTax, c)}
                  <span className="block text-xs text-walnut-500">{formatMoney(x.price, c)} before {tax}</span>
                </span>
              </li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}
