/**
 * The engine's safe-integer short cuts must give exactly what decimal money gives (decimal.js is the reference:
 * priceEstimate, labourCost, roundHours and usedCost are the decimal working), or decline so that the decimal
 * working is used. Properties over prices, percentages, steps and hours.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { centsOf, centsText, hundredthsOfHours, usedCentsNumber } from '../../../shared/calc/cents';
import { labourCost, roundHours } from '../../../shared/calc/labour';
import { labourCentsOf, priceEstimate, priceFromCents, usedCost } from '../../../shared/calc/price';
import { formatAmount, money } from '../../../shared/money';
import type { Pricing } from '../../../shared/schemas/catalog';

/** A percentage as a workshop types it: whole, to a tenth, to a hundredth, or any double in range. */
const pct = fc.oneof(
  { arbitrary: fc.integer({ min: 0, max: 100 }), weight: 3 },
  { arbitrary: fc.integer({ min: 0, max: 1000 }).map((n) => n / 10), weight: 2 },
  { arbitrary: fc.integer({ min: 0, max: 10_000 }).map((n) => n / 100), weight: 2 },
  { arbitrary: fc.double({ min: 0, max: 100, noNaN: true }), weight: 1 },
);
const cents = fc.oneof(fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 0, max: 2 ** 40 }));
const step = fc.constantFrom('0.01', '0.05', '0.1', '0.5', '1', '5', '10', '100', '0.25', '0.005', '3', '0.07', '1.5');
const rate = fc.oneof(
  fc.integer({ min: 0, max: 50_000 }).map((n) => formatAmount(money(n).dividedBy(100))),
  fc.integer({ min: 0, max: 5_000_000 }).map((n) => money(n).dividedBy(10_000).toFixed(4)),
);

const pricing = (p: { markupPct: number; overheadPct: number; marginPct: number; taxPct: number; depositPct: number; roundTo: string }): Pricing => ({
  currency: 'EUR', polisherRate: 'polisher', materialsCharge: 'whole-packs', taxLabel: 'VAT', wastePct: 10, maxDiscountPct: 100, ...p,
});

describe('price in safe-integer cents', () => {
  it('gives the decimal price, line for line and text for text, whenever it answers', () => {
    let answered = 0;
    fc.assert(fc.property(
      cents, cents, fc.integer({ min: 0, max: 100_000 }), rate, pct, pct, pct, pct, pct, pct, step,
      (m, l, hundredths, perHour, markupPct, overheadPct, marginPct, taxPct, depositPct, discountPct, roundTo) => {
        const p = pricing({ markupPct, overheadPct, marginPct, taxPct, depositPct, roundTo });
        const labourHours = hundredths / 100;
        const fast = priceFromCents({ materialsCents: m, labourHours, labourCents: l, perHour, discountPct, pricing: p });
        if (fast === null) return;
        answered++;
        const slow = priceEstimate({ materialsCost: money(centsText(m)), labourHours, labourCost: money(centsText(l)), perHour, discountPct, pricing: p });
        expect(JSON.stringify(fast)).toBe(JSON.stringify(slow));
      },
    ), { numRuns: 4000 });
    expect(answered).toBeGreaterThan(1000);
  });

  it('declines a step finer than a cent and a percentage that is not a short decimal', () => {
    const p = pricing({ markupPct: 10, overheadPct: 10, marginPct: 10, taxPct: 20, depositPct: 30, roundTo: '0.005' });
    expect(priceFromCents({ materialsCents: 100, labourHours: 1, labourCents: 100, perHour: '1.00', discountPct: 0, pricing: p })).toBeNull();
    const q = pricing({ markupPct: 1e-7, overheadPct: 10, marginPct: 10, taxPct: 20, depositPct: 30, roundTo: '1' });
    expect(priceFromCents({ materialsCents: 100, labourHours: 1, labourCents: 100, perHour: '1.00', discountPct: 0, pricing: q })).toBeNull();
  });

  it('rounds exact half cents up, as decimal money does', () => {
    // 0.05 × 10 % = half a cent of markup; 1.05 × 50 % tax = 52.5 cents.
    const p = pricing({ markupPct: 10, overheadPct: 0, marginPct: 0, taxPct: 50, depositPct: 50, roundTo: '0.01' });
    const fast = priceFromCents({ materialsCents: 5, labourHours: 1, labourCents: 100, perHour: '1.00', discountPct: 0, pricing: p });
    const slow = priceEstimate({ materialsCost: money('0.05'), labourHours: 1, labourCost: money('1.00'), perHour: '1.00', discountPct: 0, pricing: p });
    expect(fast).toEqual(slow);
    expect(fast?.lines[0]?.amount).toBe('0.06');
  });
});

describe('hours and labour in safe integers', () => {
  const hours = fc.oneof(
    fc.double({ min: 0, max: 100_000, noNaN: true }),
    fc.integer({ min: 0, max: 10_000_000 }).map((n) => n / 1000),
    fc.integer({ min: 0, max: 10_000_000 }).map((n) => n / 200),
    fc.integer({ min: 0, max: 1_000_000 }).map((n) => n / 60),
  );

  it('hours to a hundredth equal roundHours whenever they answer', () => {
    let answered = 0;
    fc.assert(fc.property(hours, (h) => {
      const c = hundredthsOfHours(h);
      if (c === null) return;
      answered++;
      expect(c / 100).toBe(roundHours(h));
    }), { numRuns: 5000 });
    expect(answered).toBeGreaterThan(3000);
    // 1.005 is stored as 1.00499999…, but decimal money reads its shortest text, 1.005, and rounds half up.
    expect(hundredthsOfHours(1.005)).toBe(101);
    expect(hundredthsOfHours(70.256)).toBe(7026);
  });

  it('labour in cents equals labourCost whenever it answers', () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 1_000_000 }), rate, (hundredths, perHour) => {
      const c = labourCentsOf(hundredths, perHour);
      if (c === null) return;
      expect(centsText(c)).toBe(formatAmount(labourCost(hundredths / 100, perHour)));
    }), { numRuns: 3000 });
  });

  it('used cost in safe-integer cents equals the decimal usedCost whenever it answers', () => {
    const qty = fc.oneof(fc.integer({ min: 0, max: 1_000_000 }), fc.double({ min: 0, max: 1e6, noNaN: true }), fc.double({ min: 0, max: 2, noNaN: true }));
    let answered = 0;
    fc.assert(fc.property(fc.integer({ min: 0, max: 100_000_000 }), qty, qty, (c, a, b) => {
      const [need, bought] = a <= b ? [a, b] : [b, a];
      const used = usedCentsNumber(c, bought, need);
      if (used === null) return;
      answered++;
      expect(centsText(used)).toBe(formatAmount(usedCost(centsText(c), bought, need)));
    }), { numRuns: 3000 });
    expect(answered).toBeGreaterThan(1000);
  });

  it('reads and writes amounts to the cent as decimal money does', () => {
    fc.assert(fc.property(fc.integer({ min: -(2 ** 50), max: 2 ** 50 }), (c) => {
      const text = money(c).dividedBy(100).toFixed(2);
      expect(centsText(c)).toBe(text);
      if (c >= 0) expect(centsOf(text)).toBe(c);
    }));
  });
});
