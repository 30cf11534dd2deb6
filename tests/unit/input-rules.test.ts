/**
 * The shared input rules as properties: the date schema takes exactly the days the calendar has (checked against
 * the proleptic Gregorian calendar as JavaScript's Date.UTC computes it, a second, independent reckoning), and the
 * text rule refuses exactly the strings holding a NUL or an unpaired surrogate.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { addDaysTo, dateProblem, dateSchema, isRealDate, localDateTimeSchema, localToday } from '../../shared/schemas/dates';
import { badTextReason, findBadText } from '../../server/http/input';

const pad = (n: number, w = 2) => String(n).padStart(w, '0');
const wellFormed = (s: string) => {
  try {
    encodeURIComponent(s);
    return true;
  } catch {
    return false;
  }
};

describe('the shared date schema', () => {
  it('a YYYY-MM-DD is real exactly when the calendar has that day (no rolling over)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9999 }), fc.integer({ min: 0, max: 13 }), fc.integer({ min: 0, max: 32 }), (y, m, d) => {
        const s = `${pad(y, 4)}-${pad(m)}-${pad(d)}`;
        const t = new Date(0);
        t.setUTCFullYear(y, m - 1, d);
        const roundTrips = m >= 1 && m <= 12 && d >= 1 && t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
        expect(isRealDate(s)).toBe(roundTrips);
      }),
      { numRuns: 2000 },
    );
  });

  it('refuses the dates that once reached the database or rolled over', () => {
    const schema = dateSchema();
    for (const bad of ['2026-02-30', '2025-02-29', '2100-02-29', '0000-01-01', '2026-13-01', '2026-00-10', '2026-04-31', '9999-12-31', '1899-12-31', '+275760-09-13', '2026-1-5', '']) {
      expect(schema.safeParse(bad).success, bad).toBe(false);
    }
    for (const good of ['2024-02-29', '2000-02-29', '2026-12-31', '2000-01-01', '2099-12-31']) {
      expect(schema.safeParse(good).success, good).toBe(true);
    }
    expect(localDateTimeSchema().safeParse('2026-02-30T10:00').success).toBe(false);
    expect(localDateTimeSchema().safeParse('2026-12-07T24:00').success).toBe(false);
    expect(localDateTimeSchema().safeParse('2026-12-07T23:59').success).toBe(true);
  });

  it('bounds from today move with today', () => {
    const today = localToday();
    const rule = { min: { daysFromToday: 0 }, max: { daysFromToday: 366 } };
    expect(dateProblem(today, rule)).toBeUndefined();
    expect(dateProblem(addDaysTo(today, 366), rule)).toBeUndefined();
    expect(dateProblem(addDaysTo(today, 367), rule)).toMatch(/from today/);
    expect(dateProblem(addDaysTo(today, -1), rule)).toMatch(/today or later/);
  });
});

describe('the text rule', () => {
  it('passes every well-formed string, whatever its characters', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 60 }).filter((s) => !s.includes('\u0000')), (s) => {
        expect(badTextReason(s)).toBeUndefined();
      }),
      { numRuns: 1000 },
    );
  });

  it('finds a NUL or an unpaired surrogate anywhere in a body, value or key, and names its path', () => {
    const bad = fc.constantFrom('\u0000', '\uD800', '\uDBFF', '\uDC00', '\uDFFF');
    fc.assert(
      fc.property(fc.string({ maxLength: 10 }), bad, fc.string({ maxLength: 10 }), fc.constantFrom('value', 'key', 'deep'), (a, b, c, where) => {
        const text = a + b + c;
        // A lone surrogate next to its partner is no longer lone: skip the pairs the generator happens to make.
        // (encodeURIComponent refuses exactly the strings with an unpaired surrogate: an independent check.)
        fc.pre(text.includes('\u0000') || !wellFormed(text));
        const body = where === 'value' ? { name: text } : where === 'key' ? { [text]: 1 } : { input: { parts: [{ note: 'ok' }, { note: text }] } };
        const found = findBadText(body);
        expect(found).toBeDefined();
        if (where === 'value') expect(found!.field).toBe('name');
        if (where === 'deep') expect(found!.field).toBe('input.parts.1.note');
      }),
      { numRuns: 500 },
    );
  });
});
