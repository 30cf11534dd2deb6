/**
 * The price without tax that job costing works from: always to the cent, and within half a cent (before tax) of
 * the price it came from, for any price and tax rate. Checked against decimal.js arithmetic, never floats.
 */
import Decimal from 'decimal.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { withoutTax } from '../../server/services/costing/job-costing';

describe('price without tax', () => {
  it('is to the cent and adds its tax back to the price within half a cent', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000_00 }), fc.integer({ min: 0, max: 10_000 }), (priceCents, taxBasis) => {
        const price = new Decimal(priceCents).div(100);
        const taxPct = taxBasis / 100;
        const net = withoutTax(price, taxPct);
        expect(net.decimalPlaces()).toBeLessThanOrEqual(2);
        const back = net.times(new Decimal(100).plus(taxPct)).div(100);
        expect(back.minus(price).abs().lte(new Decimal('0.005').times(new Decimal(100).plus(taxPct)).div(100))).toBe(true);
      }),
      { numRuns: 500 },
    );
  });

  it('works the fixture by hand: 1,234.56 with 20 % tax is 1,028.80', () => {
    expect(withoutTax('1234.56', 20).toFixed(2)).toBe('1028.80');
    // 100.00 with 7.5 %: 100 / 1.075 = 93.0232… → 93.02.
    expect(withoutTax('100.00', 7.5).toFixed(2)).toBe('93.02');
  });
});
