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

// ------------------------------------------------------------------------------------------ a job's piece

/** Where the customer's piece is, from the deposit to its return. */
export const JOB_CUSTODY = ['awaiting-collection', 'in-workshop', 'ready', 'returned'] as const;
export type JobCustody = (typeof JOB_CUSTODY)[number];

/** What can happen to the piece: it arrives (collected or brought in), the work is done, it goes home, or it is reopened. */
export const CUSTODY_EVENTS = ['arrive', 'ready', 'return', 'reopen'] as const;
export type CustodyEvent = (typeof CUSTODY_EVENTS)[number];

/** For each event, the states it may happen in and the state it leads to. */
export const CUSTODY_MOVES: Record<CustodyEvent, { from: readonly JobCustody[]; to: JobCustody }> = {
  arrive: { from: ['awaiting-collection'], to: 'in-workshop' },
  ready: { from: ['in-workshop'], to: 'ready' },
  return: { from: ['ready'], to: 'returned' },
  // Something more to do once it was called ready (a variation approved late, a fault found at the check).
  reopen: { from: ['ready'], to: 'in-workshop' },
};

/** A move of the piece the table does not hold (answered 409 `state_move_refused`). */
export class CustodyMoveError extends Error {
  constructor(
    readonly event: CustodyEvent,
    readonly from: JobCustody,
  ) {
    super(`a piece that is ${from} cannot be moved by "${event}"`);
    this.name = 'CustodyMoveError';
  }
}

export function canMoveCustody(from: JobCustody, event: CustodyEvent): boolean {
  return CUSTODY_MOVES[event].from.includes(from);
}

/** The piece's next state; throws {@link CustodyMoveError} for a move the table does not hold. */
export function moveCustody(from: JobCustody, event: CustodyEvent): JobCustody {
  if (!canMoveCustody(from, event)) throw new CustodyMoveError(event, from);
  return CUSTODY_MOVES[event].to;
}

/** The answers a variation sent to the customer can get, and staff's own moves. */
export const VARIATION_STATES = ['draft', 'sent', 'approved', 'declined', 'withdrawn'] as const;
export type VariationState = (typeof VARIATION_STATES)[number];
export const VARIATION_EVENTS = ['send', 'approve', 'decline', 'withdraw'] as const;
export type VariationEvent = (typeof VARIATION_EVENTS)[number];
export const VARIATION_MOVES: Record<VariationEvent, { from: readonly VariationState[]; to: VariationState }> = {
  // Sending again gives a fresh link and keeps it sent.
  send: { from: ['draft', 'sent'], to: 'sent' },
  approve: { from: ['sent'], to: 'approved' },
  decline: { from: ['sent'], to: 'declined' },
  withdraw: { from: ['draft', 'sent'], to: 'withdrawn' },
};

export class VariationMoveError extends Error {
  constructor(
    readonly event: VariationEvent,
    readonly from: VariationState,
  ) {
    super(`a ${from} variation cannot be moved by "${event}"`);
    this.name = 'VariationMoveError';
  }
}

export function moveVariation(from: VariationState, event: VariationEvent): VariationState {
  if (!VARIATION_MOVES[event].from.includes(from)) throw new VariationMoveError(event, from);
  return VARIATION_MOVES[event].to;
}
