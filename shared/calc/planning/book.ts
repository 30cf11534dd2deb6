/**
 * Forced bookings and re-laying after a slip: these never refuse for lack of room or hands; they lay the job and
 * report what is overbooked, day by day.
 */
import { CalendarError, dayOf, placeSession } from '../calendar';
import { addJobLoad, AREA_EPS, availableMinutes, dateOf, eachDayPiece, MIN_PER_DAY, prepare, roomNeed } from './context';
import type { PolisherRow, Prepared } from './context';
import { layWork, normalise, session } from './place';
import type { Work } from './place';
import { peakBetween, roomProfile } from './room';
import type { RoomProfile } from './room';
import { toPlan } from './search';
import type {
  BookedJob, ForcedBooking, JobPlan, NewJob, Overbooking, PlannedSession, PlanningContext, PlanSegment, PolisherOverbooking,
  RoomOverbooking,
} from './types';

/** Minutes of [start, end) during which busy pairs are also busy. */
function overlap(busy: readonly number[] | undefined, start: number, end: number): number {
  let total = 0;
  if (!busy) return 0;
  for (let i = 0; i < busy.length; i += 2) total += Math.max(0, Math.min(end, busy[i + 1] as number) - Math.max(start, busy[i] as number));
  return total;
}

/**
 * What a job's plan overbooks, given the other jobs (already in `prep` and `profile`): each day the room would
 * hold more than its capacity (peak that day, this job included), and each day a polisher of this job would work
 * beyond their hours or on two sessions at once.
 */
export function overbookingOf(plan: JobPlan, prep: Prepared, profile: RoomProfile, need: number): Overbooking {
  const room: RoomOverbooking[] = [];
  if (need > 0 && plan.room.end > plan.room.start) {
    for (let day = dayOf(plan.room.start); day <= dayOf(plan.room.end - 1); day++) {
      const from = Math.max(plan.room.start, day * MIN_PER_DAY);
      const to = Math.min(plan.room.end, (day + 1) * MIN_PER_DAY);
      const peak = peakBetween(profile, from, to) + need;
      if (peak > prep.capacity + AREA_EPS) room.push({ day, date: dateOf(day), peak, capacity: prep.capacity, over: peak - prep.capacity });
    }
  }
  const n = prep.polishers.length;
  const mine = new Map<number, { added: number; clash: number }>();
  for (const s of plan.sessions) {
    const p = prep.byId.get(s.polisherId);
    if (!p) continue;
    for (const seg of s.segments) {
      eachDayPiece(seg.start, seg.end, (day, a, b) => {
        const key = day * n + p.index;
        const m = mine.get(key) ?? { added: 0, clash: 0 };
        m.added += b - a;
        m.clash += overlap(prep.load.get(key)?.busy, a, b);
        mine.set(key, m);
      });
    }
  }
  const polishers: PolisherOverbooking[] = [];
  for (const [key, m] of [...mine.entries()].sort((x, y) => x[0] - y[0])) {
    const day = Math.floor(key / n);
    const p = prep.polishers[key - day * n] as PolisherRow;
    const usedMin = (prep.load.get(key)?.used ?? 0) + m.added;
    const availableMin = availableMinutes(prep, p, day);
    const overMin = Math.max(0, usedMin - availableMin);
    if (overMin > 0 || m.clash > 0) polishers.push({ day, date: dateOf(day), polisherId: p.id, usedMin, availableMin, overMin, clashMin: m.clash });
  }
  return { room, polishers };
}

/** Overbooking minutes a polisher would take on by doing these segments (hours beyond the day, plus clashes). */
function cost(prep: Prepared, own: ReadonlyMap<number, number>, p: PolisherRow, segments: readonly PlanSegment[]): number {
  const n = prep.polishers.length;
  let total = 0;
  for (const seg of segments) {
    const day = dayOf(seg.start);
    const key = day * n + p.index;
    const dl = prep.load.get(key);
    const before = (dl?.used ?? 0) + (own.get(key) ?? 0);
    const limit = availableMinutes(prep, p, day);
    total += Math.max(0, before + seg.end - seg.start - limit) - Math.max(0, before - limit) + overlap(dl?.busy, seg.start, seg.end);
  }
  return total;
}

/**
 * Lays a job from a forced start and reports the overbooking rather than refusing. Sessions follow the coat
 * calendar exactly (each at the first opening with room for it after the previous rest, never waiting for a
 * polisher); each goes to the polisher it overbooks least (a free one when there is one), the job's previous
 * polisher first on a tie.
 *
 * @example bookAt(job, toMinutes('2026-12-07T08:00'), booked, ctx).overbooking.room // days the room is over
 */
export function bookAt(job: NewJob, startMinute: number, booked: readonly BookedJob[], ctx: PlanningContext): ForcedBooking {
  const prep = prepare(booked, ctx, job.id);
  const need = roomNeed(job, ctx.room);
  const n = prep.polishers.length;
  const own = new Map<number, number>();
  const sessions: PlannedSession[] = [];
  let earliest = startMinute;
  let last: PolisherRow | null = null;
  for (const [i, w] of normalise(job.sessions).entries()) {
    let segments: PlanSegment[];
    try {
      segments = placeSession(prep.cal, earliest, w.duration);
    } catch (e) {
      if (e instanceof CalendarError) return { ok: false, problem: { code: 'beyond-horizon', text: e.message } };
      throw e;
    }
    // A kept polisher does the session whatever it overbooks; otherwise the one it overbooks least.
    const kept = w.keep === undefined ? undefined : prep.byId.get(w.keep);
    if (w.keep !== undefined && !kept) return { ok: false, problem: { code: 'bad-input', text: `Session ${i + 1} is kept for a polisher who is not on the list of polishers` } };
    let best: PolisherRow = kept ?? last ?? (prep.polishers[0] as PolisherRow);
    let bestCost = cost(prep, own, best, segments);
    for (const p of prep.polishers) {
      if (bestCost === 0 || kept) break;
      const c = cost(prep, own, p, segments);
      if (c < bestCost) {
        best = p;
        bestCost = c;
      }
    }
    for (const seg of segments) {
      const key = dayOf(seg.start) * n + best.index;
      own.set(key, (own.get(key) ?? 0) + seg.end - seg.start);
    }
    sessions.push(session(i, w, best.id, segments));
    earliest = (segments[segments.length - 1] as PlanSegment).end + w.rest;
    last = best;
  }
  const plan = toPlan(job, sessions);
  return { ok: true, plan, overbooking: overbookingOf(plan, prep, roomProfile(booked, ctx.room, job.id), need) };
}

/**
 * Re-lays a booked job after a slip: the first `doneSessions` sessions stand (the last of them now ending at
 * `actualEnd`), the remaining ones are laid again as early as possible after its rest, with the same rules as
 * `planJob` (the polisher of the last session done keeps the job when free). With no session done, the whole job
 * is laid again from `actualEnd`. The room interval keeps its start and moves its end; anything it now overbooks
 * is reported.
 *
 * @example shiftRemaining(job, 3, toMinutes('2026-12-09T15:40'), booked, ctx)
 */
export function shiftRemaining(
  job: BookedJob,
  doneSessions: number,
  actualEnd: number,
  booked: readonly BookedJob[],
  ctx: PlanningContext,
): ForcedBooking {
  const count = Math.max(0, Math.min(doneSessions, job.sessions.length));
  const done: PlannedSession[] = job.sessions.slice(0, count).map((s) => ({ ...s, segments: s.segments.map((g) => ({ ...g })) }));
  let from = actualEnd;
  const lastDone = done[done.length - 1];
  if (lastDone) {
    const kept = lastDone.segments.filter((g) => g.start < actualEnd);
    const segments = kept.length > 0 ? kept : [lastDone.segments[0] as PlanSegment];
    const tail = segments[segments.length - 1] as PlanSegment;
    tail.end = Math.max(tail.start, actualEnd);
    lastDone.segments = segments;
    lastDone.end = tail.end;
    lastDone.restUntil = tail.end + lastDone.restMin;
    from = lastDone.restUntil;
  }
  const rest: Work[] = job.sessions.slice(count).map((s) => ({
    ...(s.label === undefined ? {} : { label: s.label }),
    duration: Math.max(1, Math.round(s.handsOnMin)),
    rest: Math.max(0, Math.round(s.restMin)),
    ...(s.kept ? { keep: s.polisherId } : {}),
  }));
  let sessions = done;
  if (rest.length > 0) {
    const withDone = prepare(booked, ctx, job.id);
    addJobLoad(withDone, { ...job, sessions: done });
    const prefer = lastDone ? (withDone.byId.get(lastDone.polisherId)?.index ?? -1) : -1;
    const laid = layWork(withDone, rest, from, prefer, count);
    if (!laid.ok) return laid;
    sessions = [...done, ...laid.sessions];
  }
  const plan = toPlan(job, sessions);
  const prep = prepare(booked, ctx, job.id);
  return { ok: true, plan, overbooking: overbookingOf(plan, prep, roomProfile(booked, ctx.room, job.id), roomNeed(job, ctx.room)) };
}
