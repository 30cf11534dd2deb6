/**
 * The calendar's placing rule is monotonic: a longer session, a later start, more area or more coats never ends
 * sooner (fast-check over sizes, systems and working weeks). And with the usual overnight rest, bodying goes one
 * session a working day (docs/calculations.md, "Coat calendar").
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { compileCalendar, fromMinutes, placeSession, scheduleSessions, toMinutes } from '../../../shared/calc/calendar';
import { estimate } from '../../../shared/calc';
import type { WorkingCalendar } from '../../../shared/schemas/catalog';
import { DEMO_CATALOG } from '../../fixtures/catalog';

const WEEKS: WorkingCalendar[] = [
  DEMO_CATALOG.calendar,
  { workingWeek: (['mon', 'tue', 'wed', 'thu', 'fri'] as const).map((day) => ({ day, open: '08:00', close: '17:00' })), closedDates: [] },
  {
    workingWeek: [
      { day: 'mon', open: '07:30', close: '12:00' }, { day: 'tue', open: '09:00', close: '18:30' },
      { day: 'thu', open: '08:00', close: '16:00' }, { day: 'sat', open: '10:00', close: '13:00' },
    ],
    closedDates: ['2025-03-11', '2025-03-20'],
  },
];
const compiled = WEEKS.map(compileCalendar);
const T0 = toMinutes('2025-03-03T00:00');
const end = (segments: { end: number }[]): number => segments[segments.length - 1]!.end;

describe('placeSession is monotonic', () => {
  it('a longer session or a later earliest start never ends sooner (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: WEEKS.length - 1 }),
        fc.integer({ min: 0, max: 14 * 1440 }),
        fc.integer({ min: 0, max: 2 * 1440 }),
        fc.integer({ min: 1, max: 1500 }),
        fc.integer({ min: 0, max: 600 }),
        (w, at, later, duration, longer) => {
          const cal = compiled[w]!;
          expect(end(placeSession(cal, T0 + at + later, duration + longer))).toBeGreaterThanOrEqual(end(placeSession(cal, T0 + at, duration)));
        },
      ),
      { numRuns: 400 },
    );
  });

  it('one minute over the longest opening does not finish before a session of exactly the longest opening', () => {
    // Monday 16:00: 540 min waits for Tuesday 08:00–17:00; 541 min used to start at once and finish Tuesday 16:01.
    const cal = compiled[1]!;
    const at = toMinutes('2025-03-03T16:00');
    expect(fromMinutes(end(placeSession(cal, at, 540)))).toBe('2025-03-04T17:00');
    expect(fromMinutes(end(placeSession(cal, at, 541)))).toBe('2025-03-05T08:01');
  });
});

describe('a job is monotonic', () => {
  const panel = (length: number, width: number) => ({ name: 'Panel', shape: { kind: 'rectangle' as const, length, width }, faces: 2 as const, species: 'walnut' });
  const systems = DEMO_CATALOG.systems.map((s) => s.key);

  it('more area never finishes sooner, in any system and working week (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...systems),
        fc.integer({ min: 0, max: WEEKS.length - 1 }),
        fc.integer({ min: 100, max: 4000 }),
        fc.integer({ min: 100, max: 3000 }),
        fc.integer({ min: 0, max: 800 }),
        (system, w, length, width, grow) => {
          const catalog = { ...DEMO_CATALOG, calendar: WEEKS[w]! };
          const run = (l: number) => estimate({ parts: [panel(l, width)], system, startDate: '2025-03-03T10:15' }, catalog).calendar.end;
          expect(run(length + grow) >= run(length)).toBe(true);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('more coats (a bodying session more, or a coat more a session) never finishes sooner (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 200, max: 3000 }),
        fc.integer({ min: 1, max: 10 }),
        fc.integer({ min: 1, max: 5 }),
        fc.constantFrom('sessions', 'coatsPerSession'),
        (length, sessions, coats, more) => {
          const stages = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!.stages;
          const withBody = (n: number, c: number) => stages.map((s) => (s.kind === 'body' ? { ...s, sessions: n, coatsPerSession: c } : s));
          const run = (n: number, c: number) => estimate({ parts: [panel(length, 800)], stages: withBody(n, c), startDate: '2025-03-03' }, DEMO_CATALOG).calendar.end;
          const bigger = more === 'sessions' ? run(sessions + 1, coats) : run(sessions, coats + 1);
          expect(bigger >= run(sessions, coats)).toBe(true);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('scheduleSessions: a longer session or a longer rest anywhere never ends the job sooner (fast-check)', () => {
    const request = fc.record({ handsOnMin: fc.integer({ min: 1, max: 1200 }), restMin: fc.integer({ min: 0, max: 3000 }) });
    fc.assert(
      fc.property(fc.array(request, { minLength: 1, maxLength: 12 }), fc.nat(), fc.integer({ min: 1, max: 300 }), fc.boolean(), (list, pick, extra, onRest) => {
        const reqs = list.map((r, i) => ({ stage: `s${i}`, stageKind: 'body' as const, session: 1, ...r }));
        const i = pick % reqs.length;
        const grown = reqs.map((r, j) => (j !== i ? r : onRest ? { ...r, restMin: r.restMin + extra } : { ...r, handsOnMin: r.handsOnMin + extra }));
        const last = (rs: typeof reqs) => scheduleSessions(rs, compiled[0]!, toMinutes('2025-03-03T09:00')).at(-1)!.end;
        expect(last(grown)).toBeGreaterThanOrEqual(last(reqs));
      }),
      { numRuns: 200 },
    );
  });
});

describe('a bodying session a working day (Bitmead: about 12 h between bodying sessions)', () => {
  const grand = estimate({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish', startDate: '2025-03-03' }, DEMO_CATALOG);
  const body = grand.calendar.sessions.filter((s) => s.stageKind === 'body');

  it('the grand\'s seven bodying sessions fall on seven consecutive working days, one a day', () => {
    const days = body.map((s) => s.start.slice(0, 10));
    expect(new Set(days).size).toBe(7);
    // Mon–Sat working week: Friday 14th, Saturday 15th, then Monday 17th to Friday 21st.
    expect(days).toEqual(['2025-03-14', '2025-03-15', '2025-03-17', '2025-03-18', '2025-03-19', '2025-03-20', '2025-03-21']);
  });

  it('each rests at least its 12 hours, overnight, before the next', () => {
    for (let i = 1; i < body.length; i++) {
      const gapH = (toMinutes(body[i]!.start) - toMinutes(body[i - 1]!.end)) / 60;
      expect(gapH).toBeGreaterThanOrEqual(12);
      expect(body[i]!.start.slice(11)).toBe('08:00');
    }
  });
});
