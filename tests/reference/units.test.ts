import { describe, expect, it } from 'vitest';
import { unit } from 'mathjs';
import { formatVolume, parseLength, toMillimetres } from '../../shared/units';
import { cutToGramsPerLitre, GRAMS_PER_LB, LITRES_PER_UK_GALLON, LITRES_PER_US_GALLON } from '../../shared/calc/shellac';

describe('unit definitions', () => {
  it('1 in = 25.4 mm exactly (US 16 CFR 500.19; 1959 international yard and pound agreement)', () => {
    expect(toMillimetres(1, 'in')).toBe(25.4);
    expect(toMillimetres(1000, 'in')).toBe(25400);
  });

  it('1 ft = 12 in = 304.8 mm (1959 agreement: 1 yd = 0.9144 m, 3 ft to the yard)', () => {
    expect(toMillimetres(1, 'ft')).toBe(914.4 / 3);
    expect(toMillimetres(3, 'ft')).toBe(914.4);
  });

  it('1 lb = 0.45359237 kg exactly (1959 international yard and pound agreement)', () => {
    expect(GRAMS_PER_LB).toBe(453.59237);
  });

  it('1 US gallon = 231 in³ = 3.785411784 L exactly (NIST Handbook 44, Appendix C)', () => {
    expect(LITRES_PER_US_GALLON).toBeCloseTo(3.785411784, 12);
    // Independently: 231 × 2.54³ cm³ (hand arithmetic from the inch definition).
    expect(LITRES_PER_US_GALLON).toBeCloseTo((231 * 2.54 ** 3) / 1000, 12);
  });

  it('1 UK gallon = 4.54609 L (UK Weights and Measures Act 1985, Schedule 1): about 1.20095 US gallons', () => {
    // Independently: 4.54609 L over the US gallon from the inch (231 × 2.54³ cm³).
    expect(LITRES_PER_UK_GALLON / ((231 * 2.54 ** 3) / 1000)).toBeCloseTo(1.20095, 5);
  });

  it('an imperial pint is an eighth of the UK gallon, 568.26 mL, and 20 imperial fl oz (Weights and Measures Act 1985)', () => {
    expect(formatVolume(0.56826125, 'imperial', 'uk')).toBe('1.00 imperial pints');
    expect(formatVolume(0.56826125 / 20, 'imperial', 'uk')).toBe('1.00 imperial fl oz');
  });

  it('a US pint is 473.18 mL, 16 US fl oz (NIST Handbook 44, Appendix C)', () => {
    expect(formatVolume(0.4732, 'imperial', 'us')).toBe('1.00 US pints');
    expect(formatVolume(0.473176473 / 16, 'imperial')).toBe('1.00 US fl oz');
  });
});

describe('6 ft 3 in = 1905 mm, every spelling (arithmetic from the inch definition: (6 × 12 + 3) × 25.4)', () => {
  const expected = (6 * 12 + 3) * 25.4;
  it.each(['6 ft 3 in', "6' 3\"", '6ft3in', '75 in', '75in', '6.25 ft', '190.5 cm', '1.905 m', '1905 mm', '6 feet 3 inches', '6′ 3″'])(
    'reads %s as 1905 mm',
    (text) => {
      expect(parseLength(text)).toBe(expected);
    },
  );

  it.each(['6 ft 3½ in', '6 ft 3 1/2 in', '75 1/2 in', '6\' 3-1/2"', '75.5 in', '6′ 3½″'])(
    'reads %s as 75.5 in = 1917.7 mm (arithmetic from the inch definition: 75.5 × 25.4)',
    (text) => {
      expect(parseLength(text)).toBeCloseTo(75.5 * 25.4, 9);
    },
  );

  it('refuses "6 ft, 3 in" with a message about the comma between feet and inches, not about decimals', () => {
    expect(() => parseLength('6 ft, 3 in')).toThrow(/without a comma between them/);
    expect(() => parseLength('6 ft, 3 in')).not.toThrow(/decimals/);
    expect(() => parseLength('75,5 in')).toThrow(/a point, not a comma, for decimals/);
  });

  it('reads the other spellings of the brief', () => {
    expect(parseLength('190 cm')).toBe(1900);
    expect(parseLength('1.9 m')).toBe(1900);
    expect(parseLength('1900 mm')).toBe(1900);
    expect(parseLength('6 ft')).toBe(1828.8); // 72 × 25.4
    expect(parseLength('75.5in')).toBe(1917.7); // 75.5 × 25.4
  });

  it('bare numbers take the default unit', () => {
    expect(parseLength(75, 'in')).toBe(expected);
    expect(parseLength('75', 'in')).toBe(expected);
    expect(parseLength(190.5, 'cm')).toBe(expected);
    expect(parseLength(6.25, 'ft')).toBe(expected);
    expect(parseLength(1905)).toBe(expected);
  });
});

describe('pound cut (Woodcraft, "Scaling Down Pound-Cuts"; arithmetic from the unit definitions)', () => {
  it('1 lb cut = 119.83 g per litre of solvent', () => {
    expect(cutToGramsPerLitre(1)).toBeCloseTo(453.59237 / 3.785411784, 10);
    expect(cutToGramsPerLitre(1)).toBeCloseTo(119.83, 2);
  });

  it('1 lb per UK gallon = 99.78 g/L', () => {
    expect(cutToGramsPerLitre(1, 'uk')).toBeCloseTo(99.78, 2);
  });

  it('a cut scales linearly: 2 lb cut = 239.65 g/L', () => {
    expect(cutToGramsPerLitre(2)).toBeCloseTo(2 * 119.826, 2);
  });

  it('1 oz of flakes per cup (8 US fl oz) of alcohol is about a 1 lb cut', () => {
    // Independently with mathjs units: grams in an ounce over litres in a cup.
    const ozPerCup = unit(1, 'oz').toNumber('g') / unit(8, 'floz').toNumber('L');
    expect(Math.abs(ozPerCup / cutToGramsPerLitre(1) - 1)).toBeLessThan(0.01);
  });
});
