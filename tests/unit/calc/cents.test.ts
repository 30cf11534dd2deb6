/**
 * The engine's whole-cent short cuts must give exactly what decimal money gives (worked arithmetic: decimal.js is
 * the reference), or decline so that the decimal working is used.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatCents, parseCents, usedCents } from '../../../shared/calc/cents';
import { usedCost } from '../../../shared/calc/price';
import { formatAmount, money } from '../../../shared/money';

const amount = fc.bigInt({ min: 0n, max: 10n ** 9n }).map((c) => formatAmount(money(c.toString()).dividedBy(100)));

describe('whole cents', () => {
  it('reads and writes amounts to the cent as decimal money does', () => {
    fc.assert(fc.property(amount, (a) => {
      const c = parseCents(a);
      expect(c).not.toBeNull();
      expect(formatCents(c as bigint)).toBe(a);
      expect(formatCents(c as bigint)).toBe(money(a).toFixed(2));
    }));
    expect(parseCents('-1.00')).toBeNull();
    expect(parseCents('1.5')).toBeNull();
    expect(formatCents(5n)).toBe('0.05');
    expect(formatCents(0n)).toBe('0.00');
  });

  it('used cost in cents equals the decimal usedCost whenever it answers', () => {
    const qty = fc.oneof(fc.integer({ min: 0, max: 1_000_000 }), fc.double({ min: 0, max: 1e6, noNaN: true }), fc.double({ min: 0, max: 2, noNaN: true }));
    let answered = 0;
    fc.assert(fc.property(amount, qty, qty, (cost, a, b) => {
      const [need, bought] = a <= b ? [a, b] : [b, a];
      const c = usedCents(parseCents(cost) as bigint, bought, need);
      if (c === null) return;
      answered++;
      expect(formatCents(c)).toBe(formatAmount(usedCost(cost, bought, need)));
    }), { numRuns: 3000 });
    expect(answered).toBeGreaterThan(1000);
  });

  it('answers the half-cent cases exactly and declines where decimal rounding to 20 digits could tip them', () => {
    // 0.01 × 1 / 2 = half a cent: rounds up.
    expect(formatCents(usedCents(1n, 2, 1) as bigint)).toBe(formatAmount(usedCost('0.01', 2, 1)));
    expect(usedCents(1n, 0, 0)).toBeNull();
    expect(usedCents(10n ** 15n, 1e6, 999_999.999999)).toBeNull();
  });
});

describe('whole cents at exact half cents', () => {
  it('rounds an exact half cent up, as decimal money does', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 10_000_000 }), fc.integer({ min: 1, max: 1000 }), (cents, n) => {
      // cost × need ÷ bought with bought = 2 × need: exactly half the cost.
      const cost = formatCents(BigInt(2 * cents + 1));
      const c = usedCents(BigInt(2 * cents + 1), 2 * n, n);
      expect(c).not.toBeNull();
      expect(formatCents(c as bigint)).toBe(formatAmount(usedCost(cost, 2 * n, n)));
    }));
  });
});
