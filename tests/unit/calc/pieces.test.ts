/** Things used by the piece are counted whole, per stage and per session. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { estimate, sessionShare, wholeForUnit } from '../../../shared/calc';
import { DEMO_CATALOG } from '../../fixtures/catalog';

describe('whole pieces', () => {
  it('2.3 sheets are 3 sheets; 2.3 mL stays 2.3 mL; binary noise is not a piece', () => {
    expect(wholeForUnit(2.3, 'sheet')).toBe(3);
    expect(wholeForUnit(2.3, 'each')).toBe(3);
    expect(wholeForUnit(2.3, 'mL')).toBe(2.3);
    expect(wholeForUnit(3.0000000001, 'sheet')).toBe(3);
  });

  it('session shares are whole and add up to the stage\'s whole count (fast-check)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 500, noNaN: true }), fc.integer({ min: 1, max: 30 }), (q, n) => {
        const shares = Array.from({ length: n }, (_, i) => sessionShare(q, 'sheet', n, i + 1));
        for (const s of shares) expect(Number.isInteger(s) && s >= 0).toBe(true);
        expect(shares.reduce((t, s) => t + s, 0)).toBe(wholeForUnit(q, 'sheet'));
      }),
      { numRuns: 300 },
    );
  });

  it('the grand\'s sheets and cloths are whole in every stage and in the total', () => {
    const r = estimate({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish', startDate: '2025-03-03' }, DEMO_CATALOG);
    const pieces = new Set(['abrasive-sheet', 'polishing-cloth']);
    for (const s of r.stages) for (const m of s.materials) if (pieces.has(m.material)) expect(Number.isInteger(m.quantity)).toBe(true);
    for (const m of r.materials) if (pieces.has(m.key)) expect(Number.isInteger(m.need)).toBe(true);
    // Weight and volume stay fractional: flakes are not rounded to whole grams of a pack.
    expect(Number.isInteger(r.materials.find((m) => m.key === 'wadding')!.need)).toBe(false);
  });
});
