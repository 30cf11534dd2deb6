/**
 * Length units converted with mathjs's own definitions, without building mathjs units on every call: the
 * conversion must give the very doubles mathjs gives (mathjs is the reference here), and remembering what a text
 * reads as must never change an answer or swallow an error.
 */
import fc from 'fast-check';
import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { LENGTH_UNITS, parseLength, toMillimetres, UnitParseError } from '../../../shared/units';

/** The conversion as it was written with mathjs: value in the unit to millimetres, rounded at a nanometre. */
function mathjsMillimetres(value: number, from: (typeof LENGTH_UNITS)[number]): number {
  if (from === 'mm') return value;
  const mm = unit(value, from).toNumber('mm');
  return Math.round(mm * 1e6) / 1e6;
}

describe('unit conversion with exact factors', () => {
  const value = fc.oneof(
    fc.double({ min: 0, max: 100_000, noNaN: true }),
    fc.integer({ min: 0, max: 100_000 }),
    fc.integer({ min: 0, max: 10_000_000 }).map((n) => n / 1000),
    fc.integer({ min: 0, max: 100_000 }).map((n) => n / 16),
  );

  it('gives exactly the millimetres mathjs gives, for every unit', () => {
    fc.assert(fc.property(value, fc.constantFrom(...LENGTH_UNITS), (v, u) => {
      expect(Object.is(toMillimetres(v, u), mathjsMillimetres(v, u))).toBe(true);
    }), { numRuns: 20_000 });
  });

  it('reads texts with units as the sum of mathjs conversions', () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 300 }), fc.integer({ min: 0, max: 11 }), fc.integer({ min: 0, max: 99 }), (ft, inch, hundredth) => {
      const inches = inch + hundredth / 100;
      const text = `${ft} ft ${inches} in`;
      const expected = Math.round((mathjsMillimetres(ft, 'ft') + mathjsMillimetres(inches, 'in')) * 1e6) / 1e6;
      if (expected === 0) return;
      expect(parseLength(text)).toBe(expected);
      expect(parseLength(text)).toBe(expected); // again, remembered
    }));
  });
});

describe('remembered lengths', () => {
  it('give the same answer on every call and under every default unit', () => {
    expect(parseLength('75', 'in')).toBe(1905);
    expect(parseLength('75', 'mm')).toBe(75);
    expect(parseLength('75', 'in')).toBe(1905);
    expect(parseLength('0 in', 'mm', { allowZero: true })).toBe(0);
    expect(() => parseLength('0 in')).toThrow(UnitParseError);
  });

  it('throw for a bad text every time, not only the first', () => {
    for (let i = 0; i < 3; i++) expect(() => parseLength('5 parsecs')).toThrow(UnitParseError);
  });
});
