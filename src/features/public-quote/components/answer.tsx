import { CircleCheck, CircleX } from 'lucide-react';
import { useId, useState, type FormEvent } from 'react';
import { percentOf, sumMoney } from '@shared/money';
import { AcceptQuoteSchema, choiceFigures, type PublicQuote } from '@shared/schemas/quotes';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { formatMoney } from '@/lib/format';
import { useAcceptQuote, useDeclineQuote } from '../api/public-quote';

/** The total and deposit once the chosen extras are added, worked out as the workshop does (decimal, to the penny). */
export function withExtras(q: Pick<PublicQuote, 'pricing' | 'extras'>, chosen: readonly string[]): { total: string; deposit: string } {
  const total = sumMoney([q.pricing.total, ...q.extras.filter((x) => chosen.includes(x.id)).map((x) => x.priceWithTax)]);
  return { total: total.toFixed(2), deposit: percentOf(total, q.pricing.depositPct).toFixed(2) };
}

const box = 'rounded-xl border border-parchment-200 bg-white p-5 shadow-card sm:p-6';

/**
 * The customer's answer: the extras they take, then acceptance with their typed full name and the terms ticked (the
 * total and deposit shown before they confirm), or a decline with an optional reason.
 */
export function Answer({ token, quote }: { token: string; quote: PublicQuote }) {
  const accept = useAcceptQuote(token);
  const decline = useDeclineQuote(token);
  const [chosen, setChosen] = useState<string[]>([]);
  const [name, setName] = useState('');
  const [terms, setTerms] = useState(false);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [declining, setDeclining] = useState(false);
  const [reason, setReason] = useState('');
  const termsId = useId();
  const reasonId = useId();
  const c = quote.pricing.currency;
  // A quote of several pieces or with options: one choice a piece, starting from what the workshop recommends.
  const several = quote.lines.length > 1;
  const groups = [...new Set(quote.lines.map((l) => l.group))];
  const [picked, setPicked] = useState<Record<number, number | null>>(() =>
    Object.fromEntries(groups.map((g) => [g, quote.lines.find((l) => l.group === g && l.recommended)?.id ?? null])),
  );
  const lines = Object.values(picked).filter((x): x is number => x !== null);
  const figures = several ? choiceFigures({ lines: quote.lines, depositPct: quote.pricing.depositPct, extras: quote.extras }, lines, chosen) : null;
  const amounts = figures ?? withExtras(quote, chosen);
  const balance = figures?.balance ?? (Math.round(Number(amounts.total) * 100 - Number(amounts.deposit) * 100) / 100).toFixed(2);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const input = { name, acceptTerms: terms, extras: chosen, ...(several ? { lines } : {}) };
    const parsed = AcceptQuoteSchema.safeParse(input);
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    accept.mutate(parsed.data, { onError: (err) => setErrors(serverFieldErrors(err)) });
  };
  const toggle = (id: string) => setChosen((list) => (list.includes(id) ? list.filter((x) => x !== id) : [...list, id]));

  return (
    <section aria-labelledby="answer-heading" className={box} data-testid="answer">
      <h2 id="answer-heading" className="font-serif text-2xl font-semibold text-walnut-900">Your answer</h2>
      <p className="mt-1 text-sm text-walnut-600">Nothing is booked until you accept. After accepting you can pay the deposit by card; we then book the work into the drying room and confirm the dates with you.</p>

      {several && (
        <div className="mt-5 space-y-4" data-testid="choices">
          {groups.map((g, gi) => {
            const of = quote.lines.filter((l) => l.group === g);
            if (of.length === 1 && !of[0]!.groupOptional) return null;
            const options = [...of.map((l, i) => ({ id: l.id as number | null, label: `${of.length > 1 ? `Option ${String.fromCharCode(65 + i)}: ` : ''}${l.label || l.work.systemName}`, total: l.total, recommended: l.recommended && of.length > 1 })), ...(of[0]!.groupOptional ? [{ id: null, label: 'Leave this piece out', total: null, recommended: false }] : [])];
            return (
              <fieldset key={g}>
                <legend className="text-base font-semibold text-walnut-900">Piece {gi + 1}: {of[0]!.piece}</legend>
                <ul className="mt-2 space-y-2">
                  {options.map((o) => (
                    <li key={o.id ?? 'none'}>
                      <label className={`flex cursor-pointer items-center gap-3 rounded-lg border px-4 py-3 ${picked[g] === o.id ? 'border-amber-500 bg-amber-50' : 'border-parchment-200 bg-parchment-50 hover:bg-parchment-100'}`}>
                        <input type="radio" name={`piece-${g}`} className="h-5 w-5 shrink-0 accent-amber-600" checked={picked[g] === o.id} onChange={() => setPicked((p) => ({ ...p, [g]: o.id }))} />
                        <span className="min-w-0 flex-1 font-medium text-walnut-900">
                          {o.label}
                          {o.recommended && <span className="ml-2 text-xs font-normal text-amber-800">(we recommend)</span>}
                        </span>
                        {o.total && <span className="num shrink-0 font-semibold text-walnut-900">{formatMoney(o.total, c)}</span>}
                      </label>
                    </li>
                  ))}
                </ul>
              </fieldset>
            );
          })}
          {errors.lines && <p className="text-sm text-brick-700" role="alert"><span aria-hidden>▲</span> {errors.lines}</p>}
        </div>
      )}

      {quote.extras.length > 0 && (
        <fieldset className="mt-5">
          <legend className="text-base font-semibold text-walnut-900">Optional extras you may add</legend>
          <p className="text-sm text-walnut-600">Each is priced on its own, {quote.pricing.taxLabel} included. Tick what you would like done too.</p>
          <ul className="mt-3 space-y-2">
            {quote.extras.map((x) => (
              <li key={x.id}>
                <label className={`flex cursor-pointer items-start gap-3 rounded-lg border px-4 py-3 transition-colors ${chosen.includes(x.id) ? 'border-amber-500 bg-amber-50' : 'border-parchment-200 bg-parchment-50 hover:bg-parchment-100'}`}>
                  <input type="checkbox" className="mt-1 h-5 w-5 shrink-0 accent-amber-600" checked={chosen.includes(x.id)} onChange={() => toggle(x.id)} />
                  <span className="min-w-0 flex-1">
                    <span className="block font-medium text-walnut-900">{x.label}</span>
                    {x.description && <span className="block text-sm text-walnut-600">{x.description}</span>}
                    <span className="num block text-xs text-walnut-500">about {x.hours.toLocaleString('en-GB')} h of work</span>
                  </span>
                  <span className="num shrink-0 text-right font-semibold text-walnut-900">+{formatMoney(x.priceWithTax, c)}</span>
                </label>
              </li>
            ))}
          </ul>
        </fieldset>
      )}

      {!declining && (
        <form onSubmit={submit} noValidate className="mt-6 space-y-4" aria-label="Accept the quote">
          <dl className={`grid gap-px overflow-hidden rounded-lg border border-walnut-800 bg-walnut-800 text-parchment-50 ${several ? 'sm:grid-cols-3' : 'sm:grid-cols-2'}`} data-testid="accept-amounts">
            <div className="bg-walnut-900 px-4 py-3">
              <dt className="text-xs uppercase tracking-wide text-parchment-200">Total{several ? ' for your choice' : ''}{chosen.length > 0 ? ' with the extras you chose' : ''}</dt>
              <dd className="num font-serif text-2xl font-semibold text-amber-300" data-testid="accept-total">{formatMoney(amounts.total, c)}</dd>
            </div>
            <div className="bg-walnut-900 px-4 py-3">
              <dt className="text-xs uppercase tracking-wide text-parchment-200">Deposit to pay now ({quote.pricing.depositPct} %)</dt>
              <dd className="num font-serif text-2xl font-semibold text-parchment-50" data-testid="accept-deposit">{formatMoney(amounts.deposit, c)}</dd>
            </div>
            {several && (
              <div className="bg-walnut-900 px-4 py-3">
                <dt className="text-xs uppercase tracking-wide text-parchment-200">Balance when ready</dt>
                <dd className="num font-serif text-2xl font-semibold text-parchment-50" data-testid="accept-balance">{formatMoney(balance, c)}</dd>
              </div>
            )}
          </dl>
          <TextField label="Your full name" autoComplete="name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} hint="Typing your name counts as your signature on this quote." />
          <div>
            <label htmlFor={termsId} className="flex cursor-pointer items-start gap-3 text-sm text-walnut-800">
              <input
                id={termsId}
                type="checkbox"
                className="mt-0.5 h-5 w-5 shrink-0 accent-amber-600"
                checked={terms}
                onChange={(e) => setTerms(e.target.checked)}
                aria-invalid={errors.acceptTerms ? true : undefined}
              />
              <span>I have read the quote, its terms and the safety notes, and I accept them.</span>
            </label>
            {errors.acceptTerms && (
              <p className="mt-1 text-sm text-brick-700" role="alert">
                <span aria-hidden>▲</span> {errors.acceptTerms}
              </p>
            )}
          </div>
          {accept.error && Object.keys(errors).length === 0 && <Alert tone="error" title="Your acceptance was not recorded">{accept.error.message}</Alert>}
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" variant="accent" busy={accept.isPending} className="px-5 py-2.5 text-base">
              <CircleCheck className="h-5 w-5" aria-hidden /> Accept for {formatMoney(amounts.total, c)}
            </Button>
            <Button variant="ghost" onClick={() => setDeclining(true)}>
              <CircleX className="h-4 w-4" aria-hidden /> Decline the quote
            </Button>
          </div>
        </form>
      )}

      {declining && (
        <form
          className="mt-6 space-y-3"
          aria-label="Decline the quote"
          onSubmit={(e) => {
            e.preventDefault();
            decline.mutate(reason.trim());
          }}
        >
          <div className="space-y-1">
            <label htmlFor={reasonId} className="block text-sm font-medium text-walnut-800">Would you tell us why? (optional)</label>
            <textarea
              id={reasonId}
              rows={3}
              maxLength={1000}
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              className="block w-full rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm text-walnut-900 focus:border-amber-500 focus:outline-none focus:ring-2 focus:ring-amber-200"
            />
          </div>
          {decline.error && <Alert tone="error" title="Your answer was not recorded">{decline.error.message}</Alert>}
          <div className="flex flex-wrap gap-3">
            <Button type="submit" variant="danger" busy={decline.isPending}>Decline the quote</Button>
            <Button variant="secondary" onClick={() => setDeclining(false)}>Back</Button>
          </div>
        </form>
      )}
    </section>
  );
}
