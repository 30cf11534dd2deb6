import { describe, expect, it } from 'vitest';
import Decimal from 'decimal.js';
import { money, roundToStep, sumMoney, toCents, MoneyError } from '../../../shared/money';
import { priceEstimate, usedCost } from '../../../shared/calc/price';
import { labourCost } from '../../../shared/calc/labour';
import type { Pricing } from '../../../shared/schemas/catalog';
import { DEMO_CATALOG } from '../../fixtures/catalog';

const pricing: Pricing = { ...DEMO_CATALOG.pricing, markupPct: 25, overheadPct: 12, marginPct: 15, taxPct: 20, roundTo: '1', depositPct: 30 };

describe('money', () => {
  it('adds exactly where floating point does not', () => {
    expect(0.1 + 0.2).not.toBe(0.3);
    expect(sumMoney(['0.10', '0.20']).toFixed(2)).toBe('0.30');
  });

  it('rounds half away from zero to cents and to steps', () => {
    expect(toCents('1.005').toFixed(2)).toBe('1.01');
    expect(roundToStep('1232.50', '5').toFixed(2)).toBe('1235.00');
    expect(roundToStep('1232.49', '5').toFixed(2)).toBe('1230.00');
    expect(roundToStep('12.345', '0.01').toFixed(2)).toBe('12.35');
  });

  it('refuses what is not a decimal amount', () => {
    expect(() => money('12,50')).toThrow(MoneyError);
    expect(() => money(Number.NaN)).toThrow(MoneyError);
  });
});

describe('priceEstimate', () => {
  it('matches a hand-worked quote', () => {
    // Materials 100.00 + 25 % = 125.00; labour 10 h × 42.00 = 420.00; overhead 12 % of 545.00 = 65.40;
    // margin 15 % of 610.40 = 91.56; before discount 701.96; discount 10 % = 70.196 → −70.20; net 631.76;
    // VAT 20 % = 126.352 → 126.35; gross 758.11; rounded to 1 → 758.00 (rounding −0.11);
    // deposit 30 % = 227.40; balance 530.60.
    const p = priceEstimate({ materialsCost: money('100'), labourHours: 10, labourCost: labourCost(10, '42.00'), perHour: '42.00', discountPct: 10, pricing });
    expect(p.lines.map((l) => [l.code, l.amount])).toEqual([
      ['materials', '125.00'], ['labour', '420.00'], ['overhead', '65.40'], ['margin', '91.56'],
      ['discount', '-70.20'], ['tax', '126.35'], ['rounding', '-0.11'],
    ]);
    expect(p.net).toBe('631.76');
    expect(p.total).toBe('758.00');
    expect(p.deposit).toBe('227.40');
    expect(p.balance).toBe('530.60');
  });

  it('lines add up to the total to the cent, for many amounts and rounding steps', () => {
    for (const step of ['0.01', '1', '5']) {
      for (let i = 1; i < 200; i++) {
        const materials = new Decimal(i).times('3.137');
        const hours = i * 0.37;
        const p = priceEstimate({
          materialsCost: materials, labourHours: hours, labourCost: labourCost(hours, '37.45'), perHour: '37.45',
          discountPct: i % 7, pricing: { ...pricing, roundTo: step, markupPct: i % 40, taxPct: 17.5 },
        });
        expect(sumMoney(p.lines.map((l) => l.amount)).toFixed(2)).toBe(p.total);
        expect(money(p.deposit).plus(p.balance).toFixed(2)).toBe(p.total);
        expect(money(p.total).mod(step).isZero()).toBe(true);
        for (const l of p.lines) expect(l.amount).toMatch(/^-?\d+\.\d{2}$/);
      }
    }
  });

  it('charges used quantity pro rata to the packs bought', () => {
    expect(usedCost('11.00', 1500, 1200).toFixed(2)).toBe('8.80');
    expect(usedCost('0.00', 0, 0).toFixed(2)).toBe('0.00');
  });

  it('labour is hours to the hundredth × rate', () => {
    expect(labourCost(70.256, '42.00').toFixed(2)).toBe('2950.92');
  });
});
