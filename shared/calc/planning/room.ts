/**
 * The drying room over time: a step function of what is in it, built by a sweep over the booked jobs' room
 * intervals (half-open: a piece leaving at 10:00 frees its bay for one arriving at 10:00).
 */
import { AREA_EPS, roomNeed } from './context';
import type { BookedJob, RoomCapacity } from './types';

/** Use of the room: `usage[k]` holds over [times[k], times[k + 1]); before times[0] and after the last, nothing. */
export interface RoomProfile {
  times: number[];
  usage: number[];
}

/** A stretch during which the room cannot take a given job, and the most it holds then. */
export interface FullStretch {
  start: number;
  end: number;
  peak: number;
}

/** Sweeps the booked room intervals into a step function. */
export function roomProfile(booked: readonly BookedJob[], room: RoomCapacity, exceptId?: string): RoomProfile {
  const events: Array<[number, number]> = [];
  for (const job of booked) {
    if (job.id === exceptId || job.room.end <= job.room.start) continue;
    const need = roomNeed(job, room);
    if (need === 0) continue;
    events.push([job.room.start, need], [job.room.end, -need]);
  }
  events.sort((a, b) => a[0] - b[0]);
  const times: number[] = [];
  const usage: number[] = [];
  let current = 0;
  for (let i = 0; i < events.length; ) {
    const t = (events[i] as [number, number])[0];
    while (i < events.length && (events[i] as [number, number])[0] === t) current += (events[i++] as [number, number])[1];
    // Clean float dust from area sums so that an empty room reads 0.
    if (Math.abs(current) < AREA_EPS) current = 0;
    times.push(t);
    usage.push(current);
  }
  return { times, usage };
}

/** Stretches where the room holds more than `capacity - need` (so a job needing `need` would not fit), merged. */
export function fullStretches(profile: RoomProfile, need: number, capacity: number): FullStretch[] {
  const out: FullStretch[] = [];
  const { times, usage } = profile;
  for (let k = 0; k < times.length - 1; k++) {
    const u = usage[k] as number;
    if (u + need <= capacity + AREA_EPS) continue;
    const start = times[k] as number;
    const end = times[k + 1] as number;
    const last = out[out.length - 1];
    if (last && last.end === start) {
      last.end = end;
      last.peak = Math.max(last.peak, u);
    } else out.push({ start, end, peak: u });
  }
  return out;
}

/** Index of the first stretch ending after `t` (stretches.length when none). */
export function firstEndingAfter(stretches: readonly FullStretch[], t: number): number {
  let lo = 0;
  let hi = stretches.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((stretches[mid] as FullStretch).end > t) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** Index of the last stretch starting before `t` (-1 when none). */
export function lastStartingBefore(stretches: readonly FullStretch[], t: number): number {
  let lo = 0;
  let hi = stretches.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((stretches[mid] as FullStretch).start < t) lo = mid + 1;
    else hi = mid;
  }
  return lo - 1;
}

/** The first full stretch meeting [start, end), or null. */
export function firstConflict(stretches: readonly FullStretch[], start: number, end: number): FullStretch | null {
  const s = stretches[firstEndingAfter(stretches, start)];
  return s && s.start < end ? s : null;
}

/**
 * Peak use of the room over [start, end) (0 when empty), from the step function.
 */
export function peakBetween(profile: RoomProfile, start: number, end: number): number {
  const { times, usage } = profile;
  // Last step starting at or before `start`.
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((times[mid] as number) <= start) lo = mid + 1;
    else hi = mid;
  }
  let peak = lo > 0 ? (usage[lo - 1] as number) : 0;
  for (let k = lo; k < times.length && (times[k] as number) < end; k++) peak = Math.max(peak, usage[k] as number);
  return peak;
}
