/**
 * The life of a quote and of the estimates on its lines, in one table. Every change of state, on the server and in
 * the tests, goes through `moveQuote` and `mirrorEstimate`: a move the table does not hold is refused (the server
 * answers 409), and an estimate follows its quote by the same table instead of by hand in each service.
 */
import type { EstimateState } from './estimates';
import type { QuoteState } from './quotes';

/** What can happen to a quote. */
export const QUOTE_EVENTS = ['send', 'view', 'accept', 'decline', 'withdraw', 'expire', 'pay', 'superseded'] as const;
export type QuoteEvent = (typeof QUOTE_EVENTS)[number];

/** States a quote can still be answered in. */
export const OPEN_QUOTE_STATES: readonly QuoteState[] = ['quoted', 'viewed'];

/**
 * For each event, the quote states it may happen in and the state it leads to. `send` again keeps a sent or opened
 * quote as it is (a fresh link); `superseded` is the withdrawal of the other quotes when one naming the same pieces
 * is accepted.
 */
export const QUOTE_MOVES: Record<QuoteEvent, { from: readonly QuoteState[]; to: QuoteState | 'same' }> = {
  send: { from: ['draft', 'quoted', 'viewed'], to: 'same' },
  view: { from: ['quoted'], to: 'viewed' },
  accept: { from: ['quoted', 'viewed'], to: 'accepted' },
  decline: { from: ['quoted', 'viewed'], to: 'declined' },
  withdraw: { from: ['draft', 'quoted', 'viewed'], to: 'withdrawn' },
  expire: { from: ['quoted', 'viewed'], to: 'expired' },
  pay: { from: ['accepted'], to: 'deposit-paid' },
  superseded: { from: ['draft', 'quoted', 'viewed'], to: 'withdrawn' },
};

/** A move the table does not hold. */
export class StateMoveError extends Error {
  constructor(
    readonly event: QuoteEvent,
    readonly from: QuoteState,
  ) {
    super(`a ${from} quote cannot be moved by "${event}"`);
    this.name = 'StateMoveError';
  }
}

/** Whether the table lets `event` happen to a quote in state `from`. */
export function canMoveQuote(from: QuoteState, event: QuoteEvent): boolean {
  return QUOTE_MOVES[event].from.includes(from);
}

/** The state a quote goes to; throws {@link StateMoveError} for a move the table does not hold. */
export function moveQuote(from: QuoteState, event: QuoteEvent): QuoteState {
  if (!canMoveQuote(from, event)) throw new StateMoveError(event, from);
  const to = QUOTE_MOVES[event].to;
  if (to !== 'same') return to;
  return from === 'draft' ? 'quoted' : from;
}

/** Every state a quote can reach from `from` in one move. */
export function quoteSuccessors(from: QuoteState): QuoteState[] {
  return [...new Set(QUOTE_EVENTS.filter((e) => canMoveQuote(from, e)).map((e) => moveQuote(from, e)))];
}

/**
 * How an estimate on a quote's lines follows the quote's event. `chosen` says whether the customer took this
 * estimate's line (for `accept`); `otherOpenQuotes` how many other sent or opened quotes still name it (for
 * `decline` and `withdraw`). Returns the estimate's new state, or its own when the event leaves it alone.
 */
export function mirrorEstimate(
  estimate: EstimateState,
  event: QuoteEvent,
  ctx: { chosen?: boolean; otherOpenQuotes?: number } = {},
): EstimateState {
  const others = ctx.otherOpenQuotes ?? 0;
  switch (event) {
    case 'send':
      return (['priced', 'expired', 'declined'] as EstimateState[]).includes(estimate) ? 'quoted' : estimate;
    case 'view':
      return estimate === 'quoted' ? 'viewed' : estimate;
    case 'accept':
      // An option not taken, with no other quote open for it, is declined.
      return ctx.chosen ? 'accepted' : (estimate === 'quoted' || estimate === 'viewed') && others === 0 ? 'declined' : estimate;
    case 'decline':
      // Declined only when no other quote naming it is still open.
      return others === 0 ? 'declined' : estimate;
    case 'withdraw':
      return others === 0 && (estimate === 'quoted' || estimate === 'viewed') ? 'priced' : estimate;
    case 'expire':
      return estimate === 'quoted' || estimate === 'viewed' ? 'expired' : estimate;
    case 'pay':
      return 'deposit-paid';
    case 'superseded':
      return estimate;
  }
}

/** A sent or opened quote past its valid-until day reads as expired, whether or not the sweep has written it yet. */
export function quoteStateOn(state: QuoteState, validUntil: string, today: string): QuoteState {
  return OPEN_QUOTE_STATES.includes(state) && validUntil < today ? 'expired' : state;
}
