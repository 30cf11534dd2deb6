import { describe, expect, it } from 'vitest';
import { makeUpPolish, solutionPerLitreOfSolvent } from '../../shared/calc/shellac';
import { DEFAULT_SHELLAC } from '../../shared/calc/presets/settings';
import { estimate } from '../../shared/calc';
import { demoCatalog } from '../fixtures/catalog';

const density = DEFAULT_SHELLAC.apparentDensity;

describe('solution volume (Fine Woodworking shellac dilution chart)', () => {
  // The chart: pounds of flakes in one gallon of alcohol → gallons of solution.
  it.each([
    [2, 1.2],
    [3, 1.3],
    [4, 1.4],
  ])('%d lb in 1 gal make about %d gal', (lb, gallons) => {
    expect(Math.abs(solutionPerLitreOfSolvent(lb, density) - gallons)).toBeLessThan(0.03);
  });

  it('with the pure resin density of about 1.14 (Ure) the 2 lb figure still reads about 1.2 gal', () => {
    expect(solutionPerLitreOfSolvent(2, 1.14)).toBeCloseTo(1.21, 1);
  });

  it('making up 1.2 L of 2 lb cut takes about 1 L of spirit and 240 g of flakes (hand arithmetic: 2 × 119.83 g/L)', () => {
    const made = makeUpPolish(1.2, 2, density);
    expect(made.solventL).toBeCloseTo(1, 1);
    expect(made.flakesG / made.solventL).toBeCloseTo(239.65, 1);
    // The parts add back up: solvent + flakes at their apparent density = the polish made.
    expect(made.solventL + made.flakesG / (density * 1000)).toBeCloseTo(1.2, 10);
  });
});

describe('the gallon of a pound cut (Woodcraft, "Scaling Down Pound-Cuts"; UK Weights and Measures Act 1985)', () => {
  const body = (gallon: 'us' | 'uk') => {
    const catalog = demoCatalog();
    catalog.shellac.gallon = gallon;
    return estimate({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish', startDate: '2025-03-03' }, catalog).stages.find((s) => s.kind === 'body')!;
  };

  it('a 1.5 lb cut per US gallon is 1.5 × 453.59237 / 3.785411784 = 179.74 g/L', () => {
    expect(body('us').cutGPerL).toBeCloseTo(179.74, 2);
    expect(body('us').cutBasis).toBe('us');
  });

  it('per imperial gallon it is 1.5 × 453.59237 / 4.54609 = 149.66 g/L, and the flakes follow', () => {
    const uk = body('uk');
    expect(uk.cutGPerL).toBeCloseTo(149.66, 2);
    expect(uk.cutBasis).toBe('uk');
    // The same volume of polish, weaker: flakes per litre of polish are g/L ÷ (1 + g/L ÷ 1200), so the flakes go
    // from 179.74 / 1.14978 = 156.32 to 149.66 / 1.12472 = 133.07 g per litre of polish, a ratio of 0.8512.
    expect(uk.flakesG / body('us').flakesG).toBeCloseTo(0.8512, 3);
  });
});
