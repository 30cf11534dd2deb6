import { describe, expect, it } from 'vitest';
import { bookAt, findEarliestStart, occupancy, planJob, shiftRemaining } from '../../../shared/calc/planning';
import type { BookedJob, JobPlan, PlanningContext } from '../../../shared/calc/planning';
import { capacity, context, hoursOf, iso, job, m, mulberry32, need, planErrors } from './helpers';

function ok<T extends { ok: boolean }>(r: T): Extract<T, { ok: true }> {
  if (!r.ok) throw new Error('expected a plan');
  return r as Extract<T, { ok: true }>;
}

const oneBay = context({ room: { mode: 'bays', bays: 1 }, polishers: [{ id: 'p1', hoursPerDay: 8.5 }] });
const occupant = ok(planJob(job('x', [[240, 3 * 1440]]), m('2026-12-07T08:00'), [], oneBay)).plan;

describe('bookAt: forced dates', () => {
  it('lays the job from the forced start and reports each day the room is over, and by how much', () => {
    const forced = ok(bookAt(job('n', [[60, 1440]]), m('2026-12-08T08:00'), [occupant], oneBay));
    expect(iso(forced.plan.room.start)).toBe('2026-12-08T08:00');
    // Occupant leaves 2026-12-10T12:00; the new job stays until 2026-12-09T09:00.
    expect(forced.overbooking.room.map((r) => [r.date, r.peak, r.capacity, r.over])).toEqual([
      ['2026-12-08', 2, 1, 1],
      ['2026-12-09', 2, 1, 1],
    ]);
  });

  it('reports polisher days beyond their hours and clashes instead of waiting', () => {
    // The occupant's polisher works 08:00–12:00; forcing 6 h at 08:00 the same day exceeds 8.5 h and clashes.
    const forced = ok(bookAt(job('n', [[360, 0]]), m('2026-12-07T08:00'), [occupant], oneBay));
    expect(iso(forced.plan.sessions[0]!.start)).toBe('2026-12-07T08:00');
    expect(forced.overbooking.polishers).toEqual([
      { day: forced.overbooking.polishers[0]!.day, date: '2026-12-07', polisherId: 'p1', usedMin: 600, availableMin: 510, overMin: 90, clashMin: 240 },
    ]);
  });

  it('gives the forced session to a free polisher when there is one', () => {
    const ctx = context({ room: { mode: 'bays', bays: 5 } });
    const forced = ok(bookAt(job('n', [[120, 0]]), m('2026-12-07T08:00'), [occupant], ctx));
    expect(forced.plan.sessions[0]!.polisherId).toBe('p2');
    expect(forced.overbooking).toEqual({ room: [], polishers: [] });
  });

  it('reports nothing once the overbooking job is cancelled', () => {
    const forced = ok(bookAt(job('n', [[60, 0]]), m('2026-12-08T08:00'), [], oneBay));
    expect(forced.overbooking.room).toEqual([]);
  });
});

describe('shiftRemaining: after a slip', () => {
  const ctx = context();
  const base = ok(planJob(job('j', [[120, 1440], [120, 1440], [120, 1440], [120, 0]]), m('2026-12-07T08:00'), [], ctx)).plan;

  it('re-lays the remaining sessions from the actual end plus the rest, keeping the sessions done', () => {
    // Session 2 (index 1) was planned 2026-12-08 10:00–12:00; it finished at 15:30.
    const shifted = ok(shiftRemaining(base, 2, m('2026-12-08T15:30'), [], ctx)).plan;
    expect(shifted.sessions[0]).toEqual(base.sessions[0]);
    expect(iso(shifted.sessions[1]!.end)).toBe('2026-12-08T15:30');
    // 15:30 + 24 h leaves one hour before closing: too short for 2 h, so the next morning.
    expect(iso(shifted.sessions[2]!.start)).toBe('2026-12-10T08:00');
    expect(shifted.sessions[2]!.start).toBeGreaterThanOrEqual(shifted.sessions[1]!.end + 1440);
    expect(shifted.room.start).toBe(base.room.start);
    expect(shifted.room.end).toBeGreaterThan(base.room.end);
    expect(shifted.sessions.map((s) => s.index)).toEqual([0, 1, 2, 3]);
    expect(planErrors(shifted, ctx).filter((e) => !e.includes('works'))).toEqual([]);
  });

  it('keeps the job with the polisher of the last session done when they are free', () => {
    const byP2: JobPlan = { ...base, sessions: base.sessions.map((x) => ({ ...x, polisherId: 'p2' })) };
    const shifted = ok(shiftRemaining(byP2, 3, m('2026-12-09T16:00'), [], ctx)).plan;
    expect(shifted.sessions[3]!.polisherId).toBe('p2');
  });

  it('reports the room it now overruns into', () => {
    const oneBayCtx = context({ room: { mode: 'bays', bays: 1 } });
    // The next piece is booked to arrive when this job was due to leave.
    const next = ok(planJob(job('next', [[60, 0]]), base.room.end, [base], oneBayCtx)).plan;
    const shifted = ok(shiftRemaining(base, 3, m('2026-12-09T16:00'), [next], oneBayCtx));
    expect(shifted.overbooking.room.length).toBeGreaterThan(0);
    expect(shifted.overbooking.room[0]!.over).toBe(1);
    expect(shifted.overbooking.room[0]!.date).toBe(iso(next.room.start).slice(0, 10));
  });

  it('with nothing done, lays the whole job again from the new time', () => {
    const shifted = ok(shiftRemaining(base, 0, m('2026-12-14T08:00'), [], ctx)).plan;
    expect(iso(shifted.room.start)).toBe('2026-12-14T08:00');
    expect(planErrors(shifted, ctx)).toEqual([]);
  });
});

describe('occupancy: the board', () => {
  it('counts bays and polisher hours per day like an independent tally', () => {
    const r = mulberry32(9);
    const int = (lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));
    const ctx = context({ room: { mode: 'bays', bays: 2 } });
    const booked: BookedJob[] = [];
    for (let i = 0; i < 25; i++) {
      const forced = bookAt(job(`j${i}`, Array.from({ length: int(1, 4) }, () => [int(30, 400), int(0, 3000)] as [number, number])), m('2026-12-07') + int(0, 20 * 1440), booked, ctx);
      booked.push(ok(forced).plan);
    }
    const days = occupancy(booked, ctx, '2026-12-07', '2027-01-10');
    expect(days).toHaveLength(35);
    for (const d of days) {
      // Peak: the most in the room at the day's start or at any arrival that day.
      const points = [m(d.date), ...booked.map((j) => j.room.start).filter((t) => iso(t).slice(0, 10) === d.date)];
      const peak = Math.max(...points.map((t) => booked.filter((j) => j.room.start <= t && t < j.room.end).reduce((s, j) => s + need(j, ctx), 0)));
      expect(d.room.peak, d.date).toBe(peak);
      expect(d.room.over).toBe(peak > capacity(ctx));
      const h = hoursOf(ctx, d.date);
      for (const p of d.polishers) {
        const used = booked.flatMap((j) => j.sessions).filter((s) => s.polisherId === p.polisherId)
          .flatMap((s) => s.segments).filter((g) => iso(g.start).slice(0, 10) === d.date).reduce((t, g) => t + g.end - g.start, 0);
        const hoursPerDay = ctx.polishers.find((x) => x.id === p.polisherId)!.hoursPerDay;
        expect(p.usedMin).toBe(used);
        expect(p.availableMin).toBe(h ? Math.min(hoursPerDay * 60, h.close - h.open) : 0);
      }
      expect(d.overbooked).toBe(d.room.over || d.polishers.some((p) => p.usedMin > p.availableMin));
    }
  });

  it('frees the places of a cancelled job', () => {
    const before = occupancy([occupant], oneBay, '2026-12-07', '2026-12-07')[0]!;
    const after = occupancy([], oneBay, '2026-12-07', '2026-12-07')[0]!;
    expect([before.room.peak, before.polishers[0]!.usedMin]).toEqual([1, 240]);
    expect([after.room.peak, after.polishers[0]!.usedMin]).toEqual([0, 0]);
  });
});

describe('rack area instead of bays', () => {
  const area: PlanningContext = context({ room: { mode: 'area', areaM2: 4 } });

  it('lets small pieces share the rack and holds back one that does not fit', () => {
    const a = ok(planJob(job('a', [[60, 2 * 1440]], { areaM2: 2.5 }), m('2026-12-07T08:00'), [], area)).plan;
    const small = ok(findEarliestStart(job('s', [[60, 0]], { areaM2: 1.5 }), [a], area, { notBefore: m('2026-12-07') })).plan;
    expect(iso(small.room.start)).toBe('2026-12-07T08:00');
    const big: JobPlan = ok(findEarliestStart(job('b', [[60, 0]], { areaM2: 2 }), [a], area, { notBefore: m('2026-12-07') })).plan;
    expect(iso(big.room.start)).toBe(iso(a.room.end));
  });

  it('reports overbooked square metres', () => {
    const a = ok(planJob(job('a', [[60, 1440]], { areaM2: 3 }), m('2026-12-07T08:00'), [], area)).plan;
    const forced = ok(bookAt(job('b', [[60, 0]], { areaM2: 2 }), m('2026-12-07T10:00'), [a], area));
    expect(forced.overbooking.room.map((r) => [r.date, r.peak, r.over])).toEqual([['2026-12-07', 5, 1]]);
  });

  it('explains a full rack in square metres', () => {
    const a = ok(planJob(job('a', [[60, 1440]], { areaM2: 3 }), m('2026-12-07T08:00'), [], area)).plan;
    const r = findEarliestStart(job('b', [[60, 0]], { areaM2: 2 }), [a], area, { notBefore: m('2026-12-07') });
    expect(r.whyNotSooner[0]!.text).toBe('2026-12-07: drying room full (3 of 4 m²) until 2026-12-08 09:00');
  });
});
