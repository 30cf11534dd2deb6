import { describe, expect, it } from 'vitest';
import { makeUpPolish, solutionPerLitreOfSolvent } from '../../shared/calc/shellac';
import { DEFAULT_SHELLAC } from '../../shared/calc/presets/settings';

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
