/**
 * The hand kept on a job: a session kept for a polisher is laid by that polisher and no one else, by every way the
 * engine lays work (the earliest start, a forced date, the rest of the job after a slip), on random boards; without
 * the keep (the planner's override) the engine chooses freely again.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bookAt, findEarliestStart, planJob, shiftRemaining, type BookedJob, type NewJob } from '../../../shared/calc/planning';
import { context, m, planErrors } from './helpers';

const POLISHERS = [
  { id: 'p1', name: 'First polisher', hoursPerDay: 8 },
  { id: 'p2', name: 'Second polisher', hoursPerDay: 6 },
  { id: 'p3', name: 'Third polisher', hoursPerDay: 7 },
];
const ctx = context({ room: { mode: 'bays', bays: 4 }, polishers: POLISHERS });
const START = m('2026-12-07T08:00');

/** Sessions of up to 5 h with rests up to two days, a random stretch of them kept for one polisher. */
const jobArb = fc
  .record({
    sessions: fc.array(fc.record({ handsOnMin: fc.integer({ min: 30, max: 300 }), restMin: fc.integer({ min: 0, max: 2880 }) }), { minLength: 2, maxLength: 8 }),
    keep: fc.constantFrom('p1', 'p2', 'p3'),
    from: fc.nat(),
    to: fc.nat(),
  })
  .map(({ sessions, keep, from, to }) => {
    const a = from % sessions.length;
    const b = a + (to % (sessions.length - a));
    return { job: { id: 'k', sessions: sessions.map((s, i) => (i >= a && i <= b ? { ...s, keep } : s)) } as NewJob, keep, a, b };
  });

/** Other jobs already on the board, laid by the engine one after another (no keep). */
const boardArb = fc
  .array(fc.array(fc.record({ handsOnMin: fc.integer({ min: 60, max: 360 }), restMin: fc.integer({ min: 0, max: 1440 }) }), { minLength: 1, maxLength: 4 }), { maxLength: 4 })
  .map((jobs) => {
    const booked: BookedJob[] = [];
    jobs.forEach((sessions, i) => {
      const r = findEarliestStart({ id: `b${i}`, sessions }, booked, ctx, { notBefore: START });
      if (r.ok) booked.push(r.plan);
    });
    return booked;
  });

function keptOnlyBy(plan: { sessions: { index: number; polisherId: string; kept?: boolean }[] }, keep: string, a: number, b: number): void {
  for (const s of plan.sessions) {
    if (s.index >= a && s.index <= b) {
      expect(s.polisherId).toBe(keep);
      expect(s.kept).toBe(true);
    } else expect(s.kept).toBeUndefined();
  }
}

describe('a polisher kept on a stage', () => {
  it('does every kept session when booking at the earliest start, and the plan stays sound', () => {
    fc.assert(
      fc.property(jobArb, boardArb, ({ job, keep, a, b }, booked) => {
        const r = findEarliestStart(job, booked, ctx, { notBefore: START });
        expect(r.ok).toBe(true);
        if (!r.ok) return;
        keptOnlyBy(r.plan, keep, a, b);
        expect(planErrors(r.plan, ctx, job)).toEqual([]);
      }),
      { numRuns: 120 },
    );
  });

  it('does every kept session on a forced date, whatever it overbooks', () => {
    fc.assert(
      fc.property(jobArb, boardArb, fc.integer({ min: 0, max: 10 }), ({ job, keep, a, b }, booked, days) => {
        const r = bookAt(job, START + days * 1440, booked, ctx);
        expect(r.ok).toBe(true);
        if (r.ok) keptOnlyBy(r.plan, keep, a, b);
      }),
      { numRuns: 120 },
    );
  });

  it('keeps the hand when the rest of the job is laid again after a slip', () => {
    fc.assert(
      fc.property(jobArb, boardArb, fc.nat(), fc.integer({ min: 10, max: 600 }), ({ job, keep, a, b }, booked, doneAt, late) => {
        const r = findEarliestStart(job, booked, ctx, { notBefore: START });
        if (!r.ok) return;
        const done = 1 + (doneAt % (job.sessions.length - 1));
        const last = r.plan.sessions[done - 1]!;
        const shifted = shiftRemaining(r.plan, done, last.end + late, booked, ctx);
        expect(shifted.ok).toBe(true);
        if (shifted.ok) keptOnlyBy(shifted.plan, keep, a, b);
      }),
      { numRuns: 120 },
    );
  });

  it('is chosen freely again once the planner overrides the keep (the same sessions, no keep)', () => {
    // The second polisher is busy every morning of the week with a long job: kept on them, the new job waits;
    // overridden, it goes to whoever is free first.
    const busy = planJob({ id: 'busy', sessions: Array.from({ length: 5 }, () => ({ handsOnMin: 360, restMin: 0, keep: 'p2' })) }, START, [], ctx);
    expect(busy.ok).toBe(true);
    if (!busy.ok) return;
    const kept: NewJob = { id: 'n', sessions: [{ handsOnMin: 120, restMin: 0, keep: 'p2' }] };
    const free: NewJob = { id: 'n', sessions: [{ handsOnMin: 120, restMin: 0 }] };
    const withKeep = findEarliestStart(kept, [busy.plan], ctx, { notBefore: START });
    const overridden = findEarliestStart(free, [busy.plan], ctx, { notBefore: START });
    expect(withKeep.ok && overridden.ok).toBe(true);
    if (!withKeep.ok || !overridden.ok) return;
    expect(withKeep.plan.sessions[0]!.polisherId).toBe('p2');
    expect(overridden.plan.sessions[0]!.polisherId).not.toBe('p2');
    expect(overridden.plan.sessions[0]!.start).toBeLessThan(withKeep.plan.sessions[0]!.start);
  });

  it('refuses a keep for a polisher not on the list, in words', () => {
    const r = findEarliestStart({ id: 'x', sessions: [{ handsOnMin: 60, restMin: 0, keep: 'gone' }] }, [], ctx, { notBefore: START });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problem.text).toMatch(/not on the list of polishers/);
  });
});
