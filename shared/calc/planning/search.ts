/**
 * Laying a job from a start, and finding the earliest start at which the whole job fits.
 */
import { dayOf, fromMinutes, openingWindow } from '../calendar';
import { AREA_EPS, dateOf, prepare, roomNeed, weekdayOf } from './context';
import type { Prepared } from './context';
import { layWork, minimumLength, normalise } from './place';
import type { Work } from './place';
import { firstConflict, fullStretches, lastStartingBefore, roomProfile } from './room';
import type { FullStretch } from './room';
import type { BookedJob, EarliestStart, JobPlan, NewJob, PlannedSession, PlanningContext, PlanResult, WhyNot, WhyNotCode } from './types';

/** A plan from laid sessions. */
export function toPlan(job: Pick<NewJob, 'id' | 'bays' | 'areaM2'>, sessions: PlannedSession[]): JobPlan {
  const first = sessions[0] as PlannedSession;
  const last = sessions[sessions.length - 1] as PlannedSession;
  return {
    id: job.id,
    sessions,
    room: { start: first.start, end: last.restUntil },
    ...(job.bays === undefined ? {} : { bays: job.bays }),
    ...(job.areaM2 === undefined ? {} : { areaM2: job.areaM2 }),
  };
}

/**
 * Lays a job's sessions as early as possible from `fromMinute`: each after the previous one's end plus its rest,
 * inside opening hours, by a polisher free at that time with hours left that day (booked jobs' work counts; a
 * booked job with the same id is ignored). The drying room is not checked here: see `findEarliestStart` and
 * `bookAt`.
 *
 * @example planJob(job, toMinutes('2026-12-07T08:00'), booked, ctx) // { ok: true, plan }
 */
export function planJob(job: NewJob, fromMinute: number, booked: readonly BookedJob[], ctx: PlanningContext): PlanResult {
  const prep = prepare(booked, ctx, job.id);
  const laid = layWork(prep, normalise(job.sessions), fromMinute);
  return laid.ok ? { ok: true, plan: toPlan(job, laid.sessions) } : laid;
}

interface Label {
  code: WhyNotCode;
  message: string;
}

function clock(t: number): string {
  return fromMinutes(t).replace('T', ' ');
}

function hours(min: number): string {
  return `${Math.round((min / 60) * 100) / 100} h`;
}

function amount(value: number, prep: Prepared): string {
  return prep.unit === 'bays' ? `${value} of ${prep.capacity} bays` : `${Math.round(value * 100) / 100} of ${prep.capacity} m²`;
}

/** The reason a day can never take work, or null when it is an open day. */
function structural(prep: Prepared, day: number): Label | null {
  if (prep.cal.closed.has(day)) return { code: 'closed-date', message: 'closed date' };
  if (!prep.cal.hours[weekdayOf(day)]) return { code: 'non-working-day', message: 'not a working day' };
  return null;
}

function roomLabel(prep: Prepared, day: number, s: FullStretch): Label {
  const dayStart = day * 1440;
  const covers = s.start < dayStart + 1440 && s.end > dayStart;
  return {
    code: 'room-full',
    message: covers
      ? `drying room full (${amount(s.peak, prep)}) until ${clock(s.end)}`
      : `drying room full (${amount(s.peak, prep)}) from ${clock(s.start)} to ${clock(s.end)}, while the job would be in it`,
  };
}

/** Labels the days from `s` to the day before `a` on which the first session could not be placed. */
function labelGap(prep: Prepared, why: Map<number, Label>, s: number, a: number, first: Work): void {
  for (let day = dayOf(s); day < dayOf(a); day++) {
    const fixed = structural(prep, day);
    if (fixed) {
      why.set(day, fixed);
      continue;
    }
    const w = openingWindow(prep.cal, day) as readonly [number, number];
    const lo = day === dayOf(s) ? Math.max(s, w[0]) : w[0];
    if (day === dayOf(s) && s > w[0] && why.has(day)) continue;
    if (first.duration <= w[1] - w[0] && lo + first.duration > w[1]) {
      why.set(day, { code: 'too-late-in-day', message: `not enough opening hours left after ${clock(lo).slice(11)} for the first session` });
    } else {
      why.set(day, { code: 'polishers-busy', message: `polisher hours taken: no polisher free for the first session (${hours(first.duration)})` });
    }
  }
}

/** Merges day labels into runs of consecutive days with the same reason. */
function runs(why: ReadonlyMap<number, Label>): WhyNot[] {
  const days = [...why.keys()].sort((x, y) => x - y);
  const out: WhyNot[] = [];
  let i = 0;
  while (i < days.length) {
    const from = days[i] as number;
    const label = why.get(from) as Label;
    let to = from;
    while (i + 1 < days.length && days[i + 1] === to + 1 && why.get(to + 1)?.message === label.message) to = days[++i] as number;
    i++;
    const range = from === to ? dateOf(from) : `${dateOf(from)} to ${dateOf(to)}`;
    out.push({ from: dateOf(from), to: dateOf(to), code: label.code, text: `${range}: ${label.message}` });
  }
  return out;
}

/**
 * The earliest start at which the whole job fits: every session with its rest, no polisher over their hours or on
 * two sessions at once, the drying room never over capacity at any moment of the job's room interval.
 *
 * Exact at the minute, relative to the greedy laying of `planJob`: the plan returned is `planJob(job, s)` for the
 * smallest minute `s >= notBefore` whose plan fits the room. Candidates are skipped only when they provably fail:
 * starts giving the same first session, and starts whose shortest possible room interval (all hands-on time and
 * rests back to back) would meet a moment the room is full.
 *
 * `whyNotSooner` explains, day by day from `notBefore`, why the job could not start earlier.
 *
 * @example findEarliestStart(job, booked, ctx, { notBefore: toMinutes('2026-12-07') })
 */
export function findEarliestStart(
  job: NewJob,
  booked: readonly BookedJob[],
  ctx: PlanningContext,
  options: { notBefore: number },
): EarliestStart {
  const prep = prepare(booked, ctx, job.id);
  const need = roomNeed(job, ctx.room);
  if (need > prep.capacity + AREA_EPS) {
    return {
      ok: false,
      problem: { code: 'room-too-small', text: `The job needs ${need} ${prep.unit} but the drying room holds ${prep.capacity}` },
      whyNotSooner: [],
    };
  }
  const work = normalise(job.sessions);
  const shortest = minimumLength(work);
  const stretches = fullStretches(roomProfile(booked, ctx.room, job.id), need, prep.capacity);
  const why = new Map<number, Label>();
  const lastDay = dayOf(options.notBefore) + prep.horizonDays;
  let s = options.notBefore;
  while (dayOf(s) < lastDay) {
    const laid = layWork(prep, work, s);
    if (!laid.ok) return { ok: false, problem: laid.problem, whyNotSooner: runs(why) };
    const a = (laid.sessions[0] as PlannedSession).start;
    const b = (laid.sessions[laid.sessions.length - 1] as PlannedSession).restUntil;
    labelGap(prep, why, s, a, work[0] as Work);
    const conflict = firstConflict(stretches, a, b);
    if (!conflict) {
      for (const day of why.keys()) if (day >= dayOf(a)) why.delete(day);
      return { ok: true, plan: toPlan(job, laid.sessions), whyNotSooner: runs(why) };
    }
    why.set(dayOf(a), structural(prep, dayOf(a)) ?? roomLabel(prep, dayOf(a), conflict));
    // Every start in [cur, end of a full stretch meeting [cur, cur + shortest)) fails: skip them.
    let cur = a;
    for (;;) {
      const j = lastStartingBefore(stretches, cur + shortest);
      const st = stretches[j];
      if (!st || st.end <= cur) break;
      // The day the room frees up is labelled too: if the job can still start that day, the label is dropped.
      for (let day = Math.max(dayOf(cur), dayOf(a) + 1); day <= dayOf(st.end); day++) {
        why.set(day, structural(prep, day) ?? roomLabel(prep, day, st));
      }
      cur = st.end;
    }
    s = Math.max(a + 1, cur);
  }
  return {
    ok: false,
    problem: { code: 'beyond-horizon', text: `No start found within ${prep.horizonDays} days` },
    whyNotSooner: runs(why),
  };
}
