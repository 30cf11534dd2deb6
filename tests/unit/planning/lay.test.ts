import { describe, expect, it } from 'vitest';
import { compileCalendar, scheduleSessions } from '../../../shared/calc/calendar';
import { jobFromCoatCalendar, planJob } from '../../../shared/calc/planning';
import type { BookedJob, JobPlan } from '../../../shared/calc/planning';
import { CALENDAR, context, iso, job, m, mulberry32, planErrors } from './helpers';

function planned(result: ReturnType<typeof planJob>): JobPlan {
  if (!result.ok) throw new Error(result.problem.text);
  return result.plan;
}

describe('planJob: rests and opening hours', () => {
  it('starts each session no earlier than the previous end plus its rest', () => {
    const plan = planned(planJob(job('j', [[120, 600], [90, 1440], [60, 30], [45, 0], [30, 2880]]), m('2026-12-07T08:00'), [], context()));
    expect(planErrors(plan, context())).toEqual([]);
    for (let i = 1; i < plan.sessions.length; i++) {
      expect(plan.sessions[i]!.start).toBeGreaterThanOrEqual(plan.sessions[i - 1]!.end + plan.sessions[i - 1]!.restMin);
    }
  });

  it('lets rests run through nights and weekends, but work waits for opening hours', () => {
    // Friday 15:00: 60 min work ends 16:00; 40 h rest ends Sunday 08:00; Sunday is not worked, Monday is.
    const plan = planned(planJob(job('j', [[60, 2400], [60, 0]]), m('2026-12-11T15:00'), [], context()));
    expect(iso(plan.sessions[0]!.start)).toBe('2026-12-11T15:00');
    expect(iso(plan.sessions[0]!.restUntil)).toBe('2026-12-13T08:00');
    expect(iso(plan.sessions[1]!.start)).toBe('2026-12-14T08:00');
  });

  it('skips closed dates and a Saturday too short for the session', () => {
    // Thursday 24 Dec, rest 1 h after 16:00 → Friday 25 and Saturday 26 are closed, Sunday not worked.
    const plan = planned(planJob(job('j', [[60, 60], [300, 0]]), m('2026-12-24T15:00'), [], context()));
    expect(iso(plan.sessions[1]!.start)).toBe('2026-12-28T08:00');
    // A 5 h session asked for on a Saturday (4 h opening) goes to Monday.
    const sat = planned(planJob(job('k', [[300, 0]]), m('2026-12-12T08:00'), [], context()));
    expect(iso(sat.sessions[0]!.start)).toBe('2026-12-14T08:00');
  });

  it('never splits a session that fits in one day', () => {
    const plan = planned(planJob(job('j', [[240, 0]]), m('2026-12-07T14:00'), [], context()));
    expect(plan.sessions[0]!.segments).toHaveLength(1);
    expect(iso(plan.sessions[0]!.start)).toBe('2026-12-08T08:00');
  });

  it('splits a session longer than the longest window into parts on consecutive open days, one polisher', () => {
    // 20 h asked from Friday 12:00 starts at the next full day's opening, as the coat calendar does: Monday 8.5 h,
    // Tuesday 8.5 h, Wednesday 3 h.
    const plan = planned(planJob(job('j', [[1200, 0]]), m('2026-12-11T12:00'), [], context()));
    const s = plan.sessions[0]!;
    expect(s.segments.map((g) => [iso(g.start), iso(g.end)])).toEqual([
      ['2026-12-14T08:00', '2026-12-14T16:30'],
      ['2026-12-15T08:00', '2026-12-15T16:30'],
      ['2026-12-16T08:00', '2026-12-16T11:00'],
    ]);
    expect(s.polisherId).toBe('p1');
    expect(planErrors(plan, context())).toEqual([]);
  });

  it('honours extra closed dates from the settings', () => {
    const ctx = context({ closedDates: ['2026-12-08'] });
    const plan = planned(planJob(job('j', [[60, 1440], [60, 0]]), m('2026-12-07T08:00'), [], ctx));
    expect(iso(plan.sessions[1]!.start)).toBe('2026-12-09T08:00');
  });

  it('matches the estimate’s coat calendar on an empty board with a full-time polisher', () => {
    const random = mulberry32(7);
    const sessions = Array.from({ length: 30 }, (_, i) => ({
      stage: 'bodying', stageKind: 'body' as const, session: i + 1,
      handsOnMin: 15 + Math.floor(random() * 700), restMin: Math.floor(random() * 3000),
    }));
    const ctx = context({ polishers: [{ id: 'p1', hoursPerDay: 24 }] });
    const plan = planned(planJob(job('j', sessions.map((s) => [s.handsOnMin, s.restMin])), m('2026-12-07T09:10'), [], ctx));
    const coat = scheduleSessions(sessions, compileCalendar(CALENDAR), m('2026-12-07T09:10'));
    expect(plan.sessions.map((s) => s.segments)).toEqual(coat.map((s) => s.segments));
  });
});

describe('planJob: polishers', () => {
  const busyDay: BookedJob = {
    id: 'busy',
    room: { start: m('2026-12-07T08:00'), end: m('2026-12-07T16:30') },
    sessions: [
      { index: 0, polisherId: 'p1', handsOnMin: 240, restMin: 0, start: m('2026-12-07T08:00'), end: m('2026-12-07T12:00'), restUntil: m('2026-12-07T12:00'), segments: [{ start: m('2026-12-07T08:00'), end: m('2026-12-07T12:00') }] },
    ],
  };

  it('gives the session to a free polisher rather than wait', () => {
    const plan = planned(planJob(job('j', [[120, 0]]), m('2026-12-07T08:00'), [busyDay], context()));
    expect(plan.sessions[0]!.polisherId).toBe('p2');
    expect(iso(plan.sessions[0]!.start)).toBe('2026-12-07T08:00');
  });

  it('waits for the polisher’s busy stretch to end when nobody else is free', () => {
    const ctx = context({ polishers: [{ id: 'p1', hoursPerDay: 8.5 }] });
    const plan = planned(planJob(job('j', [[120, 0]]), m('2026-12-07T08:00'), [busyDay], ctx));
    expect(iso(plan.sessions[0]!.start)).toBe('2026-12-07T12:00');
  });

  it('moves to the next day when the polisher’s hours for the day are used up', () => {
    const ctx = context({ polishers: [{ id: 'p1', hoursPerDay: 5 }] });
    const plan = planned(planJob(job('j', [[120, 0]]), m('2026-12-07T08:00'), [busyDay], ctx));
    expect(iso(plan.sessions[0]!.start)).toBe('2026-12-08T08:00');
  });

  it('counts the job’s own sessions against the polisher’s day', () => {
    const ctx = context({ polishers: [{ id: 'p1', hoursPerDay: 4 }] });
    const plan = planned(planJob(job('j', [[150, 0], [150, 0]]), m('2026-12-07T08:00'), [], ctx));
    expect(iso(plan.sessions[1]!.start)).toBe('2026-12-08T08:00');
  });

  it('keeps the job with the polisher of its previous session when both could start at once', () => {
    const plan = planned(planJob(job('j', [[60, 0], [60, 0], [60, 0]]), m('2026-12-07T08:00'), [busyDay], context()));
    expect(plan.sessions.map((s) => s.polisherId)).toEqual(['p2', 'p2', 'p2']);
  });

  it('skips a polisher’s days off', () => {
    const ctx = context({ polishers: [{ id: 'p1', hoursPerDay: 8.5, daysOff: ['2026-12-07', '2026-12-08'] }] });
    const plan = planned(planJob(job('j', [[60, 0]]), m('2026-12-07T08:00'), [], ctx));
    expect(iso(plan.sessions[0]!.start)).toBe('2026-12-09T08:00');
  });

  it('refuses a session no polisher can do in one day', () => {
    const ctx = context({ polishers: [{ id: 'p1', hoursPerDay: 3 }] });
    const result = planJob(job('j', [[240, 0]]), m('2026-12-07T08:00'), [], ctx);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.problem.code).toBe('session-too-long');
  });
});

describe('jobFromCoatCalendar', () => {
  it('turns the estimate’s hours into minutes and keeps the room need', () => {
    const j = jobFromCoatCalendar('j', [{ stage: 'Bodying', session: 2, handsOnHours: 1.5, restHours: 24 }], { bays: 2 });
    expect(j).toEqual({ id: 'j', sessions: [{ label: 'Bodying 2', handsOnMin: 90, restMin: 1440 }], bays: 2 });
  });
});
