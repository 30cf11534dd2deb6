import fc from 'fast-check';
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { describe, expect, it } from 'vitest';
import { formatDay, formatDayTime, formatDuration, formatLongDay, formatMoney, formatMoneyDelta, formatRest, formatWorkTime } from '../../shared/format';
import { addDays, daysBetween, isTimeZone, mondayOf, nowLocal, today, weekdayIndex } from '../../shared/time';

const day = fc.date({ min: new Date('2000-01-01T00:00:00Z'), max: new Date('2099-12-31T00:00:00Z'), noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10));

describe('the one clock (shared/time.ts)', () => {
  it('today is the workshop’s day in its own zone, not the server’s', () => {
    // 23:30 UTC on 14 March 2027 is already the 15th in Auckland (UTC+13 then) and still the 14th in New York.
    const instant = new Date('2027-03-14T23:30:00Z');
    expect(today('Pacific/Auckland', instant)).toBe('2027-03-15');
    expect(today('America/New_York', instant)).toBe('2027-03-14');
    expect(today('Europe/London', instant)).toBe('2027-03-14');
    expect(nowLocal('Europe/London', new Date('2027-07-01T07:05:00Z'))).toBe('2027-07-01T08:05');
  });

  it('moving a date by n days then back returns it, and the gap is n, across every daylight-saving change', () => {
    fc.assert(
      fc.property(day, fc.integer({ min: -800, max: 800 }), (date, n) => {
        const moved = addDays(date, n);
        expect(addDays(moved, -n)).toBe(date);
        expect(daysBetween(date, moved)).toBe(n);
      }),
    );
  });

  it('the Monday of a week is a Monday on or before the date, within six days', () => {
    fc.assert(
      fc.property(day, (date) => {
        const monday = mondayOf(date);
        expect(new Date(`${monday}T12:00:00Z`).getUTCDay()).toBe(1);
        expect(weekdayIndex(date)).toBe(daysBetween(monday, date));
        expect(weekdayIndex(date)).toBeGreaterThanOrEqual(0);
        expect(weekdayIndex(date)).toBeLessThanOrEqual(6);
      }),
    );
  });

  it('today and the wall clock, remembered per zone and minute, are what the zone gives for any instant, asked in any order', () => {
    const zones = ['Pacific/Auckland', 'America/New_York', 'Europe/London', 'Asia/Kolkata', 'Australia/Adelaide', 'Pacific/Chatham', 'UTC'];
    const instant = fc.date({ min: new Date('1990-01-01T00:00:00Z'), max: new Date('2090-12-31T00:00:00Z'), noInvalidDate: true });
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.constantFrom(...zones), instant), { minLength: 1, maxLength: 20 }), (asks) => {
        // Each instant is asked twice, the second time from memory, and beside its neighbours a second either side of
        // a minute (the key is the minute of UTC).
        for (const [zone, at] of asks) {
          for (const d of [at, at, new Date(Math.floor(at.getTime() / 60_000) * 60_000 - 1), new Date(Math.floor(at.getTime() / 60_000) * 60_000)]) {
            expect(today(zone, d)).toBe(format(new TZDate(d, zone), 'yyyy-MM-dd'));
            expect(nowLocal(zone, d)).toBe(format(new TZDate(d, zone), "yyyy-MM-dd'T'HH:mm"));
          }
        }
      }),
      { numRuns: 200 },
    );
  });

  it('takes IANA zone names only', () => {
    expect(isTimeZone('Europe/London')).toBe(true);
    expect(isTimeZone('America/Argentina/Buenos_Aires')).toBe(true);
    expect(isTimeZone('UTC')).toBe(true);
    for (const bad of ['Mars/Olympus', '+01:00', 'GMT+1', '', 'europe']) expect(isTimeZone(bad)).toBe(false);
  });
});

describe('the one money format (shared/format.ts)', () => {
  it('writes any amount in cents exactly, with separators and the typographic minus', () => {
    fc.assert(
      fc.property(fc.bigInt({ min: -(10n ** 12n), max: 10n ** 12n }), (cents) => {
        const abs = cents < 0n ? -cents : cents;
        const whole = (abs / 100n).toString().replace(/\B(?=(\d{3})+(?!\d))/g, ',');
        const text = `${abs / 100n}.${String(abs % 100n).padStart(2, '0')}`;
        const expected = `${cents < 0n ? '\u2212' : ''}£${whole}.${String(abs % 100n).padStart(2, '0')}`;
        expect(formatMoney(cents < 0n ? `-${text}` : text, 'GBP')).toBe(expected);
      }),
    );
  });

  it('keeps up to four decimals for unit prices and rounds half up to cents otherwise', () => {
    expect(formatMoney('0.0450', 'GBP', { exact: true })).toBe('£0.045');
    expect(formatMoney('11.4000', 'GBP', { exact: true })).toBe('£11.40');
    expect(formatMoney('2.005', 'GBP')).toBe('£2.01');
    expect(formatMoney('4994', 'EUR')).toBe('€4,994.00');
    expect(formatMoneyDelta('-3.5', 'GBP')).toBe('\u2212£3.50');
    expect(formatMoneyDelta('12', 'GBP')).toBe('+£12.00');
    expect(formatMoneyDelta('0.00', 'GBP')).toBe('£0.00');
  });
});

describe('the board\u2019s days and durations (shared/format.ts)', () => {
  it('a workshop-local day reads as written, whatever the zone of the machine that formats it', () => {
    // 7 December 2026 is a Monday (worked from the calendar).
    expect(formatDay('2026-12-07')).toBe('Mon 7 Dec');
    expect(formatDay('2026-12-07T23:59')).toBe('Mon 7 Dec');
    expect(formatLongDay('2026-12-07T00:00')).toBe('Mon, 7 Dec 2026');
    expect(formatDayTime('2026-12-07T08:00')).toBe('Mon 7 Dec, 08:00');
    expect(formatDayTime(null)).toBe('\u2014');
  });

  it('the day of a local date-time is the day of its date, for every minute of every day', () => {
    fc.assert(
      fc.property(day, fc.integer({ min: 0, max: 1439 }), (date, minute) => {
        const time = `${String(Math.floor(minute / 60)).padStart(2, '0')}:${String(minute % 60).padStart(2, '0')}`;
        expect(formatDay(`${date}T${time}`)).toBe(formatDay(date));
        expect(formatDayTime(`${date}T${time}`)).toBe(`${formatDay(date)}, ${time}`);
      }),
    );
  });

  it('work below an hour reads in minutes, rests beyond two days in days, durations in days, hours and minutes', () => {
    expect(formatWorkTime(0.75)).toBe('45 min');
    expect(formatWorkTime(7.5)).toBe('7.5 h');
    expect(formatRest(0)).toBe('none');
    expect(formatRest(26.4)).toBe('26.4 h');
    // 184.8 h ÷ 24 = 7.7 days.
    expect(formatRest(184.8)).toBe('7.7 days');
    // 1,640 min = 1 day (1,440) + 3 h (180) + 20 min.
    expect(formatDuration(1640)).toBe('1 day 3 h 20 min');
    expect(formatDuration(0)).toBe('0 min');
    expect(formatDuration(2 * 1440)).toBe('2 days');
  });
});
