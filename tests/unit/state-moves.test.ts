import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ESTIMATE_STATES, type EstimateState } from '../../shared/schemas/estimates';
import { QUOTE_STATES, type QuoteState } from '../../shared/schemas/quotes';
import { QUOTE_EVENTS, QUOTE_MOVES, StateMoveError, canMoveQuote, mirrorEstimate, moveQuote, quoteStateOn, quoteSuccessors } from '../../shared/schemas/state-moves';

/** The life of a quote as the product allows it, written out by hand (not derived from the table). */
const ALLOWED: Record<QuoteState, readonly QuoteState[]> = {
  draft: ['quoted', 'withdrawn'],
  quoted: ['quoted', 'viewed', 'accepted', 'declined', 'withdrawn', 'expired'],
  viewed: ['viewed', 'accepted', 'declined', 'withdrawn', 'expired'],
  accepted: ['deposit-paid'],
  'deposit-paid': [],
  declined: [],
  expired: [],
  withdrawn: [],
};

/** Estimate states an estimate may hold while quotes are made and answered. */
const ESTIMATE_AFTER_QUOTE: readonly EstimateState[] = ['priced', 'quoted', 'viewed', 'accepted', 'declined', 'expired', 'deposit-paid'];

describe('the table of quote moves', () => {
  it('any sequence of events only ever passes through allowed states; a refused move changes nothing', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...QUOTE_EVENTS), { maxLength: 30 }), (events) => {
        let state: QuoteState = 'draft';
        for (const event of events) {
          if (canMoveQuote(state, event)) {
            const next = moveQuote(state, event);
            expect(ALLOWED[state]).toContain(next);
            state = next;
          } else {
            expect(() => moveQuote(state, event)).toThrow(StateMoveError);
          }
        }
        expect(QUOTE_STATES).toContain(state);
      }),
    );
  });

  it('closed quotes stay closed, except an accepted one whose deposit is paid', () => {
    fc.assert(
      fc.property(fc.constantFrom<QuoteState>('declined', 'expired', 'withdrawn', 'deposit-paid'), fc.constantFrom(...QUOTE_EVENTS), (state, event) => {
        expect(canMoveQuote(state, event)).toBe(false);
      }),
    );
    expect(quoteSuccessors('accepted')).toEqual(['deposit-paid']);
  });

  it('every successor the table gives is one the product allows', () => {
    for (const state of QUOTE_STATES) for (const next of quoteSuccessors(state)) expect(ALLOWED[state]).toContain(next);
  });

  it('an estimate following any sequence of its quote’s events stays in the states quoting can give it', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<EstimateState>('priced', 'quoted', 'viewed', 'expired', 'declined'),
        fc.array(fc.record({ event: fc.constantFrom(...QUOTE_EVENTS), chosen: fc.boolean(), others: fc.nat(3) }), { maxLength: 30 }),
        (start, steps) => {
          let quote: QuoteState = 'draft';
          let estimate = start;
          for (const { event, chosen, others } of steps) {
            if (!canMoveQuote(quote, event)) continue;
            quote = moveQuote(quote, event);
            estimate = mirrorEstimate(estimate, event, { chosen, otherOpenQuotes: others });
            expect(ESTIMATE_STATES).toContain(estimate);
            expect(ESTIMATE_AFTER_QUOTE).toContain(estimate);
          }
          // Once paid, the estimate is paid too; a quote expires only from a sent or opened state.
          if (quote === 'deposit-paid') expect(estimate).toBe('deposit-paid');
        },
      ),
    );
  });

  it('a sent or opened quote past its day reads as expired, and nothing else does', () => {
    fc.assert(
      fc.property(fc.constantFrom(...QUOTE_STATES), fc.integer({ min: -3, max: 3 }), (state, offset) => {
        const validUntil = `2027-03-${String(14 + offset).padStart(2, '0')}`;
        const read = quoteStateOn(state, validUntil, '2027-03-14');
        const lapsed = QUOTE_MOVES.expire.from.includes(state) && offset < 0;
        expect(read).toBe(lapsed ? 'expired' : state);
      }),
    );
  });
});
