import { describe, expect, it } from 'vitest';
import { bookAt, findEarliestStart, planJob } from '../../../shared/calc/planning';
import type { BookedJob, JobPlan, NewJob, PlanningContext } from '../../../shared/calc/planning';
import { boardErrors, context, fits, iso, job, m, mulberry32, planErrors } from './helpers';

/** A job in the room over [start, end) with one session by p1 at its start. */
function inRoom(id: string, start: string, end: string, extra: Partial<BookedJob> = {}): BookedJob {
  const s = m(start);
  return {
    id,
    room: { start: s, end: m(end) },
    sessions: [{ index: 0, polisherId: 'p1', handsOnMin: 30, restMin: m(end) - s - 30, start: s, end: s + 30, restUntil: m(end), segments: [{ start: s, end: s + 30 }] }],
    ...extra,
  };
}

function found(result: ReturnType<typeof findEarliestStart>): JobPlan {
  if (!result.ok) throw new Error(result.problem.text);
  return result.plan;
}

/** Random small case: forced bookings (which may overbook) make a crowded room and busy polishers. */
function randomCase(seed: number): { ctx: PlanningContext; booked: BookedJob[]; newJob: NewJob; notBefore: number } {
  const r = mulberry32(seed);
  const int = (lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));
  const area = r() < 0.3;
  const ctx = context({
    room: area ? { mode: 'area', areaM2: 4 } : { mode: 'bays', bays: int(1, 2) },
    polishers: Array.from({ length: int(1, 2) }, (_, i) => ({ id: `p${i + 1}`, hoursPerDay: int(6, 17) / 2 })),
    horizonDays: 120,
  });
  const randomJob = (id: string): NewJob =>
    job(id, Array.from({ length: int(1, 3) }, () => [int(1, 10) * 30 - int(0, 1) * 7, int(0, 6) * 480 + int(0, 1) * 45] as [number, number]), area ? { areaM2: int(1, 6) / 2 } : {});
  const origin = m('2026-12-07T00:00');
  const booked: BookedJob[] = [];
  for (let i = 0; i < int(3, 8); i++) {
    const forced = bookAt(randomJob(`b${i}`), origin + int(0, 14 * 1440), booked, ctx);
    if (forced.ok) booked.push(forced.plan);
  }
  return { ctx, booked, newJob: randomJob('new'), notBefore: origin + int(0, 7 * 1440) };
}

/**
 * Brute force: every start minute in order, checked by the independent checker. A start whose plan begins later
 * gives the same plan for every minute up to that beginning, so those are skipped (checked in its own test).
 */
function bruteForce(c: ReturnType<typeof randomCase>): JobPlan | null {
  let s = c.notBefore;
  for (let guard = 0; guard < 200_000; guard++) {
    const r = planJob(c.newJob, s, c.booked, c.ctx);
    if (!r.ok) return null;
    if (fits(r.plan, c.booked, c.ctx)) return r.plan;
    s = r.plan.room.start + 1;
  }
  throw new Error('brute force ran too long');
}

describe('findEarliestStart: truly earliest', () => {
  it('a later asked start with the same first session gives the same plan (the brute force relies on it)', () => {
    for (let seed = 1; seed <= 20; seed++) {
      const c = randomCase(seed);
      const r = mulberry32(seed * 31);
      const a = planJob(c.newJob, c.notBefore, c.booked, c.ctx);
      if (!a.ok) continue;
      const between = c.notBefore + Math.floor(r() * (a.plan.room.start - c.notBefore + 1));
      expect(planJob(c.newJob, between, c.booked, c.ctx)).toEqual(a);
    }
  });

  it('matches a minute-by-minute brute force on 60 seeded random cases', () => {
    let jumped = 0;
    for (let seed = 100; seed < 160; seed++) {
      const c = randomCase(seed);
      const expected = bruteForce(c);
      const got = findEarliestStart(c.newJob, c.booked, c.ctx, { notBefore: c.notBefore });
      expect(got.ok, `seed ${seed}`).toBe(expected !== null);
      if (got.ok && expected) {
        expect(got.plan, `seed ${seed}`).toEqual(expected);
        expect(planErrors(got.plan, c.ctx, c.newJob)).toEqual([]);
        if (got.whyNotSooner.some((w) => w.code === 'room-full')) jumped++;
      }
    }
    // The cases really exercise a crowded room.
    expect(jumped).toBeGreaterThan(10);
  });
});

describe('findEarliestStart: capacity', () => {
  it('never overfills the room or a polisher when a board is filled job after job', () => {
    const r = mulberry32(42);
    const int = (lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));
    const ctx = context({ room: { mode: 'bays', bays: 3 } });
    const booked: BookedJob[] = [];
    for (let i = 0; i < 60; i++) {
      const j = job(`j${i}`, Array.from({ length: int(2, 8) }, () => [int(20, 500), int(0, 4000)] as [number, number]), { bays: int(1, 2) });
      const plan = found(findEarliestStart(j, booked, ctx, { notBefore: m('2026-12-07T00:00') + int(0, 30) * 1440 }));
      expect(planErrors(plan, ctx, j)).toEqual([]);
      booked.push(plan);
    }
    expect(boardErrors(booked, ctx)).toEqual([]);
  });

  it('refuses a job bigger than the room', () => {
    const r = findEarliestStart(job('big', [[60, 0]], { bays: 4 }), [], context(), { notBefore: m('2026-12-07') });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problem.code).toBe('room-too-small');
  });
});

describe('findEarliestStart: why not sooner', () => {
  const oneBay = context({ room: { mode: 'bays', bays: 1 } });

  it('says the room is full until a piece leaves, and starts then', () => {
    const result = findEarliestStart(job('n', [[60, 0]]), [inRoom('x', '2026-12-07T08:00', '2026-12-10T10:00')], oneBay, { notBefore: m('2026-12-07') });
    expect(iso(found(result).room.start)).toBe('2026-12-10T10:00');
    expect(result.whyNotSooner.map((w) => w.text)).toEqual(['2026-12-07 to 2026-12-09: drying room full (1 of 1 bays) until 2026-12-10 10:00']);
  });

  it('names closed dates and days not worked', () => {
    const result = findEarliestStart(job('n', [[60, 0]]), [inRoom('x', '2026-12-22T08:00', '2026-12-24T18:00')], oneBay, { notBefore: m('2026-12-22') });
    expect(iso(found(result).room.start)).toBe('2026-12-28T08:00');
    expect(result.whyNotSooner.map((w) => [w.from, w.to, w.code])).toEqual([
      ['2026-12-22', '2026-12-24', 'room-full'],
      ['2026-12-25', '2026-12-26', 'closed-date'],
      ['2026-12-27', '2026-12-27', 'non-working-day'],
    ]);
  });

  it('names a room that would fill up while the job is still drying', () => {
    // Arrives Wednesday; a job of 60 min + 4 days' rest started Monday would still be there.
    const result = findEarliestStart(job('n', [[60, 4 * 1440]]), [inRoom('x', '2026-12-09T08:00', '2026-12-14T09:00')], oneBay, { notBefore: m('2026-12-07') });
    expect(iso(found(result).room.start)).toBe('2026-12-14T09:00');
    expect(result.whyNotSooner[0]!.text).toContain('from 2026-12-09 08:00 to 2026-12-14 09:00, while the job would be in it');
  });

  it('names polishers without hours left', () => {
    const ctx = context({ polishers: [{ id: 'p1', hoursPerDay: 8.5 }] });
    const full = inRoom('x', '2026-12-07T08:00', '2026-12-07T16:30');
    full.sessions[0] = { ...full.sessions[0]!, handsOnMin: 510, restMin: 0, end: m('2026-12-07T16:30'), segments: [{ start: m('2026-12-07T08:00'), end: m('2026-12-07T16:30') }] };
    const result = findEarliestStart(job('n', [[60, 0]]), [full], ctx, { notBefore: m('2026-12-07') });
    expect(iso(found(result).room.start)).toBe('2026-12-08T08:00');
    expect(result.whyNotSooner.map((w) => w.code)).toEqual(['polishers-busy']);
  });
});

describe('cancelling and moving', () => {
  const oneBay = context({ room: { mode: 'bays', bays: 1 } });
  const x = inRoom('x', '2026-12-07T08:00', '2026-12-18T08:00');

  it('cancelling a job (dropping it from the list) frees its bay and its polisher', () => {
    const n = job('n', [[60, 0]]);
    expect(iso(found(findEarliestStart(n, [x], oneBay, { notBefore: m('2026-12-07') })).room.start)).toBe('2026-12-18T08:00');
    expect(iso(found(findEarliestStart(n, [], oneBay, { notBefore: m('2026-12-07') })).room.start)).toBe('2026-12-07T08:00');
  });

  it('moving a job ignores its own old booking', () => {
    const moved = found(findEarliestStart(job('x', [[60, 0]]), [x], oneBay, { notBefore: m('2026-12-07') }));
    expect(iso(moved.room.start)).toBe('2026-12-07T08:00');
  });
});
