/**
 * Prepares a planning call once: the compiled calendar, each polisher's hours and days off, the polishers' booked
 * work indexed by day, and the room's use over time. Every public function builds this from plain data, so removing
 * a job from the booked list is all it takes to free its places.
 */
import { compileCalendar, dayOf, fromMinutes, openingWindow, toMinutes } from '../calendar';
import type { CompiledCalendar } from '../calendar';
import type { BookedJob, JobPlan, NewJob, PlanningContext, RoomCapacity } from './types';

export const MIN_PER_DAY = 1440;
/** Tolerance when comparing rack areas (m², sums of decimals). */
export const AREA_EPS = 1e-9;
const DEFAULT_HORIZON_DAYS = 3660;

/** Thrown when planning data is inconsistent (an unknown capacity mode, a job without the area the room counts). */
export class PlanningError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PlanningError';
  }
}

/** A polisher ready for look-up. */
export interface PolisherRow {
  id: string;
  index: number;
  /** Hands-on minutes per open day before clipping to the opening window. */
  minutesPerDay: number;
  off: ReadonlySet<number>;
}

/** A polisher's booked work on one day: minutes used and busy stretches (flat sorted start, end pairs). */
export interface DayLoad {
  used: number;
  busy: number[];
}

/** Everything a planning call reads, built once. */
export interface Prepared {
  cal: CompiledCalendar;
  room: RoomCapacity;
  capacity: number;
  unit: 'bays' | 'm²';
  polishers: PolisherRow[];
  byId: ReadonlyMap<string, PolisherRow>;
  /** Key `day * polishers.length + polisher index`. */
  load: Map<number, DayLoad>;
  horizonDays: number;
}

/** The local date of a day number, 'YYYY-MM-DD'. */
export function dateOf(day: number): string {
  return fromMinutes(day * MIN_PER_DAY).slice(0, 10);
}

/** A day number from a day number or a 'YYYY-MM-DD' date. */
export function dayNumber(ref: number | string): number {
  return typeof ref === 'number' ? ref : dayOf(toMinutes(ref));
}

/** Weekday of a day number, Monday 0 … Sunday 6 (1970-01-01 was a Thursday). */
export function weekdayOf(day: number): number {
  return (((day + 3) % 7) + 7) % 7;
}

/** What a job takes in the room, in the room's unit. */
export function roomNeed(job: Pick<NewJob, 'id' | 'bays' | 'areaM2'>, room: RoomCapacity): number {
  if (room.mode === 'bays') return job.bays ?? 1;
  if (job.areaM2 === undefined) throw new PlanningError(`Job "${job.id}" has no rack area but the drying room counts area`);
  return job.areaM2;
}

/** The room's capacity in its unit. */
export function roomCapacity(room: RoomCapacity): number {
  return room.mode === 'bays' ? room.bays : room.areaM2;
}

/** Minutes a polisher can work on a day: their hours, clipped to the opening window; 0 when closed or away. */
export function availableMinutes(prep: Prepared, p: PolisherRow, day: number): number {
  if (p.off.has(day)) return 0;
  const w = openingWindow(prep.cal, day);
  return w ? Math.min(p.minutesPerDay, w[1] - w[0]) : 0;
}

/** Adds a stretch of work to a polisher's day, keeping the busy list sorted. */
export function addLoad(load: Map<number, DayLoad>, key: number, start: number, end: number): void {
  let dl = load.get(key);
  if (!dl) {
    dl = { used: 0, busy: [] };
    load.set(key, dl);
  }
  dl.used += end - start;
  const busy = dl.busy;
  let i = busy.length;
  while (i > 0 && (busy[i - 2] as number) > start) i -= 2;
  busy.splice(i, 0, start, end);
}

/** Calls `fn` for each one-day piece of a stretch (booked data may cross midnight; plans never do). */
export function eachDayPiece(start: number, end: number, fn: (day: number, start: number, end: number) => void): void {
  let s = start;
  while (s < end) {
    const day = dayOf(s);
    const e = Math.min(end, (day + 1) * MIN_PER_DAY);
    fn(day, s, e);
    s = e;
  }
}

/**
 * Builds the look-up tables for one call. Booked jobs whose id is `exceptId` are ignored (moving a job never
 * collides with itself); sessions of polishers not in the list count against nobody.
 */
export function prepare(booked: readonly BookedJob[], ctx: PlanningContext, exceptId?: string): Prepared {
  const cal = compileCalendar({ ...ctx.calendar, closedDates: [...ctx.calendar.closedDates, ...(ctx.closedDates ?? [])] });
  const polishers: PolisherRow[] = ctx.polishers.map((p, index) => ({
    id: p.id,
    index,
    minutesPerDay: Math.round(p.hoursPerDay * 60),
    off: new Set((p.daysOff ?? []).map((d) => dayNumber(d))),
  }));
  const byId = new Map(polishers.map((p) => [p.id, p]));
  if (byId.size !== polishers.length) throw new PlanningError('Two polishers share an id');
  const prep: Prepared = {
    cal,
    room: ctx.room,
    capacity: roomCapacity(ctx.room),
    unit: ctx.room.mode === 'bays' ? 'bays' : 'm²',
    polishers,
    byId,
    load: new Map(),
    horizonDays: ctx.horizonDays ?? DEFAULT_HORIZON_DAYS,
  };
  for (const job of booked) {
    if (job.id === exceptId) continue;
    addJobLoad(prep, job);
  }
  return prep;
}

/** Adds a job's hands-on work to the polishers' days. */
export function addJobLoad(prep: Prepared, job: JobPlan): void {
  const n = prep.polishers.length;
  for (const s of job.sessions) {
    const p = prep.byId.get(s.polisherId);
    if (!p) continue;
    for (const seg of s.segments) eachDayPiece(seg.start, seg.end, (day, a, b) => addLoad(prep.load, day * n + p.index, a, b));
  }
}

/** Jobs other than `exceptId`. */
export function others(booked: readonly BookedJob[], exceptId: string): BookedJob[] {
  return booked.filter((j) => j.id !== exceptId);
}
