import { describe, expect, it } from 'vitest';
import { formatArea, formatLength, formatMass, formatVolume, parseLength, UnitParseError } from '../../../shared/units';

describe('parseLength bad input', () => {
  it.each([
    ['-5 cm', 'negative'],
    ['0 mm', 'zero'],
    ['abc', 'garbage'],
    ['', 'empty'],
    ['5 parsecs', 'unknown unit'],
    ['6 ft 3', 'compound with a bare number'],
    ['1,9 m', 'decimal comma'],
    ['101 m', 'over 100 m'],
    ['1e308', 'absurd'],
  ])('rejects %s (%s) with a UnitParseError naming the text', (text) => {
    expect(() => parseLength(text)).toThrow(UnitParseError);
    try {
      parseLength(text);
    } catch (error) {
      expect((error as UnitParseError).text).toBe(text);
      expect((error as UnitParseError).expected).toMatch(/length/);
    }
  });

  it.each([NaN, Infinity, -Infinity, -1, 0, 1e308])('rejects the number %s', (n) => {
    expect(() => parseLength(n)).toThrow(UnitParseError);
  });

  it('accepts zero only when asked (polygon coordinates)', () => {
    expect(parseLength(0, 'mm', { allowZero: true })).toBe(0);
    expect(parseLength('0 in', 'mm', { allowZero: true })).toBe(0);
  });

  it('reads 100 m but not a hair more', () => {
    expect(parseLength('100 m')).toBe(100_000);
    expect(() => parseLength('100.001 m')).toThrow(/100 m/);
  });
});

describe('formatting', () => {
  it('areas: 1 m² = 10.7639 ft² (1 ft² = 0.09290304 m², from the inch)', () => {
    expect(formatArea(8.834, 'metric')).toBe('8.83 m²');
    expect(formatArea(1, 'imperial')).toBe(`${(1 / 0.09290304).toFixed(1)} ft²`);
  });

  it('volumes: mL under a litre, US fl oz under a pint (473.176 mL), US pints above', () => {
    expect(formatVolume(0.25, 'metric')).toBe('250 mL');
    expect(formatVolume(5.7, 'metric')).toBe('5.70 L');
    expect(formatVolume(0.1, 'imperial')).toBe(`${(100 / 29.5735295625).toFixed(2)} US fl oz`);
    expect(formatVolume(0.473176473 * 15, 'imperial')).toBe('15.0 US pints');
  });

  it('masses: g or kg; oz or lb (1 lb = 453.59237 g, 16 oz)', () => {
    expect(formatMass(526, 'metric')).toBe('526 g');
    expect(formatMass(1500, 'metric')).toBe('1.50 kg');
    expect(formatMass(453.59237 / 2, 'imperial')).toBe('8.00 oz');
    expect(formatMass(453.59237 * 1.5, 'imperial')).toBe('1.50 lb');
  });

  it('lengths: mm or inches', () => {
    expect(formatLength(1905, 'metric')).toBe('1905 mm');
    expect(formatLength(1905, 'imperial')).toBe('75.0 in');
  });
});
