/** Hours round half up in decimal arithmetic, and tax is worked on the rounded lines the customer sees. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { labourCost, priceEstimate, roundHours } from '../../../shared/calc';
import { money, sumMoney } from '../../../shared/money';
import { DEMO_CATALOG } from '../../fixtures/catalog';

describe('hours', () => {
  it('1.005 h shows 1.01 (binary floating point would make it 1.00)', () => {
    expect(Math.round(1.005 * 100) / 100).toBe(1); // the defect, for the record
    expect(roundHours(1.005)).toBe(1.01);
    expect(roundHours(2.675)).toBe(2.68);
    expect(roundHours(60.3 / 60)).toBe(1.01);
  });

  it('labour is the rounded hours times the rate: 1.01 h × 40.00 = 40.40', () => {
    expect(labourCost(1.005, '40.00').toFixed(2)).toBe('40.40');
  });

  it('rounds to the nearest hundredth, half up (fast-check against decimal strings)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), (thousandths) => {
        // x.xx5 written as a decimal string is exactly half: it goes up.
        const hours = Number(`${Math.floor(thousandths / 1000)}.${String(thousandths % 1000).padStart(3, '0')}`);
        const expected = Math.floor(thousandths / 10) + (thousandths % 10 >= 5 ? 1 : 0);
        expect(Math.round(roundHours(hours) * 100)).toBe(expected);
      }),
      { numRuns: 500 },
    );
  });
});

describe('tax on the figures the customer sees', () => {
  it('the lines add up to the total to the penny, and tax is the rate of the rounded lines before it (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 500_000 }),
        fc.integer({ min: 0, max: 20_000 }),
        fc.constantFrom('42.00', '37.50', '18.75'),
        fc.constantFrom(0, 5, 12.5, 20),
        fc.constantFrom(0, 2.5, 10),
        (materialsCents, hundredths, rate, taxPct, discountPct) => {
          const hours = roundHours(hundredths / 100 + 0.005);
          const pricing = { ...DEMO_CATALOG.pricing, taxPct, roundTo: '0.01' };
          const p = priceEstimate({ materialsCost: money(materialsCents).dividedBy(100), labourHours: hours, labourCost: labourCost(hours, rate), perHour: rate, discountPct, pricing });
          expect(sumMoney(p.lines.map((l) => l.amount)).toFixed(2)).toBe(p.total);
          const beforeTax = sumMoney(p.lines.filter((l) => l.code !== 'tax' && l.code !== 'rounding').map((l) => l.amount));
          expect(p.tax).toBe(beforeTax.times(taxPct).dividedBy(100).toDecimalPlaces(2, 4).toFixed(2));
          // The labour line is the hours printed in its label times the rate.
          const labour = p.lines.find((l) => l.code === 'labour')!;
          const shown = /Labour, ([\d.]+) h/.exec(labour.label)![1]!;
          expect(labour.amount).toBe(money(shown).times(rate).toDecimalPlaces(2, 4).toFixed(2));
        },
      ),
      { numRuns: 300 },
    );
  });
});
