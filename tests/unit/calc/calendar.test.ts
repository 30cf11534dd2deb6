import { describe, expect, it } from 'vitest';
import {
  climateWarnings, compileCalendar, fromMinutes, placeSession, restFactor, scheduleSessions, toMinutes,
} from '../../../shared/calc/calendar';
import type { SessionRequest } from '../../../shared/calc/calendar';
import type { WorkingCalendar } from '../../../shared/schemas/catalog';
import { DEMO_CATALOG } from '../../fixtures/catalog';

const WEEKDAY = ['sun', 'mon', 'tue', 'wed', 'thu', 'fri', 'sat'];

/** Independent check of a stretch of work: same day, inside that weekday's hours, not a closed date. */
function insideOpening(calendar: WorkingCalendar, startIso: string, endIso: string): boolean {
  const date = startIso.slice(0, 10);
  if (endIso.slice(0, 10) !== date) return false;
  if (calendar.closedDates.includes(date)) return false;
  const day = WEEKDAY[new Date(`${date}T00:00:00Z`).getUTCDay()];
  const hours = calendar.workingWeek.find((d) => d.day === day);
  if (!hours) return false;
  return startIso.slice(11, 16) >= hours.open && endIso.slice(11, 16) <= hours.close;
}

function rng(seed: number): () => number {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const calendar: WorkingCalendar = {
  ...DEMO_CATALOG.calendar,
  closedDates: [...DEMO_CATALOG.calendar.closedDates, '2025-03-12', '2025-03-13', '2025-04-18', '2025-04-21'],
};
const compiled = compileCalendar(calendar);

describe('local date-times', () => {
  it('round-trips and counts minutes from 1970-01-01T00:00', () => {
    expect(toMinutes('1970-01-02T01:00')).toBe(1500);
    expect(fromMinutes(toMinutes('2025-03-14T08:30'))).toBe('2025-03-14T08:30');
  });
});

describe('placeSession', () => {
  it('starts at opening when asked before it', () => {
    expect(placeSession(compiled, toMinutes('2025-03-03T05:00'), 60).map((s) => fromMinutes(s.start))).toEqual(['2025-03-03T08:00']);
  });

  it('does not split a session that fits in a day: waits for the next day with room', () => {
    const s = placeSession(compiled, toMinutes('2025-03-03T15:00'), 180);
    expect(s).toHaveLength(1);
    expect(fromMinutes(s[0]!.start)).toBe('2025-03-04T08:00');
  });

  it('skips Sunday and closed dates', () => {
    // Saturday 2025-03-08 closes at 12:00; a 5 h session goes to Monday 10th.
    expect(fromMinutes(placeSession(compiled, toMinutes('2025-03-08T08:00'), 300)[0]!.start)).toBe('2025-03-10T08:00');
    // 12th and 13th are closed.
    expect(fromMinutes(placeSession(compiled, toMinutes('2025-03-12T08:00'), 60)[0]!.start)).toBe('2025-03-14T08:00');
  });

  it('runs a session longer than any day over several openings', () => {
    const s = placeSession(compiled, toMinutes('2025-03-03T08:00'), 600);
    expect(s.map((g) => [fromMinutes(g.start), fromMinutes(g.end)])).toEqual([
      ['2025-03-03T08:00', '2025-03-03T17:00'],
      ['2025-03-04T08:00', '2025-03-04T09:00'],
    ]);
  });

  it('refuses a calendar with no opening hours', () => {
    expect(() => compileCalendar({ workingWeek: [{ day: 'mon', open: '09:00', close: '09:00' }], closedDates: [] })).toThrow(/no opening hours/);
  });
});

describe('scheduleSessions properties', () => {
  const random = rng(42);
  const requests: SessionRequest[] = Array.from({ length: 80 }, (_, i) => ({
    stage: `s${i}`, stageKind: 'body', session: i + 1,
    handsOnMin: 10 + Math.floor(random() * 900),
    restMin: Math.floor(random() * 100) * 60,
  }));
  const out = scheduleSessions(requests, compiled, toMinutes('2025-03-03T10:30'));

  it('never schedules work outside opening hours or on closed dates', () => {
    for (const s of out) for (const g of s.segments) expect(insideOpening(calendar, fromMinutes(g.start), fromMinutes(g.end))).toBe(true);
  });

  it('honours every rest: each session starts after the previous one has rested', () => {
    for (let i = 1; i < out.length; i++) {
      const prev = out[i - 1]!;
      expect(prev.restUntil).toBe(prev.end + requests[i - 1]!.restMin);
      expect(out[i]!.start).toBeGreaterThanOrEqual(prev.restUntil);
    }
  });

  it('gives each session its full hands-on time', () => {
    out.forEach((s, i) => {
      const worked = s.segments.reduce((t, g) => t + g.end - g.start, 0);
      expect(worked).toBe(Math.round(requests[i]!.handsOnMin));
    });
  });
});

describe('climate', () => {
  it('leaves rests alone at 20 °C and 50 % RH', () => {
    expect(restFactor(20, 50)).toBe(1);
    expect(restFactor(25, 40)).toBe(1);
  });

  it('doubles per 10 °C below 20 °C and adds half again at 75 % RH (from memory)', () => {
    expect(restFactor(10, 50)).toBe(2);
    expect(restFactor(20, 75)).toBe(1.5);
    expect(restFactor(10, 75)).toBe(3);
  });

  it('is monotonic: colder or damper never dries faster', () => {
    for (let t = -10; t < 40; t += 5) expect(restFactor(t, 60)).toBeGreaterThanOrEqual(restFactor(t + 5, 60));
    for (let h = 0; h < 100; h += 5) expect(restFactor(18, h)).toBeLessThanOrEqual(restFactor(18, h + 5));
  });

  it('warns of blush at 75 % RH or more (WoodWeb knowledge base) and of cold below 15 °C (common practice)', () => {
    expect(climateWarnings(20, 75).map((w) => w.code)).toEqual(['blush-risk']);
    expect(climateWarnings(20, 74).map((w) => w.code)).toEqual(['humid']);
    expect(climateWarnings(20, 60)).toEqual([]);
    expect(climateWarnings(12, 50).map((w) => w.code)).toEqual(['cold']);
  });
});

describe('fromMinutes against Date', () => {
  it('writes the same local date-time as Date.toISOString for 20 000 random minutes from 1900 to 2200', () => {
    const random = rng(7);
    for (let i = 0; i < 20_000; i++) {
      const m = Math.floor((random() * 300 - 70) * 525_960);
      expect(fromMinutes(m)).toBe(new Date(m * 60_000).toISOString().slice(0, 16));
    }
  });
});
