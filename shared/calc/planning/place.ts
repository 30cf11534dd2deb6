/**
 * Laying a job's sessions: each session as early as its rest allows, inside opening hours, by one polisher who is
 * free at that time and still has hours that day.
 *
 * Rules (see docs/calculations.md, "Drying room and polishers' planning"):
 * - a session that fits in a day's opening window is never split: it waits for a day, a time and a polisher with
 *   room for all of it;
 * - a session longer than the longest opening window is split into day-sized parts on consecutive open days, all
 *   by the same polisher: it starts at the opening of a full-length day (where a session of exactly the longest
 *   window would start, so a longer session never ends sooner), the next parts from opening (as the estimate's
 *   coat calendar does);
 * - among polishers able to start at the same time, the one who did the job's previous session keeps it, then the
 *   first in the list.
 */
import { dayOf, openingWindow } from '../calendar';
import { availableMinutes, MIN_PER_DAY } from './context';
import type { DayLoad, PolisherRow, Prepared } from './context';
import type { JobSession, PlannedSession, PlanProblem, PlanSegment } from './types';

/** A session reduced to whole minutes: hands-on at least 1 (it still needs a moment of opening hours). */
export interface Work {
  label?: string;
  duration: number;
  rest: number;
  /** The polisher kept on this session: only they may do it. */
  keep?: string;
}

/** Whole-minute work of a job's sessions. */
export function normalise(sessions: readonly JobSession[]): Work[] {
  return sessions.map((s) => ({
    ...(s.label === undefined ? {} : { label: s.label }),
    duration: Math.max(1, Math.round(s.handsOnMin)),
    rest: Math.max(0, Math.round(s.restMin)),
    ...(s.keep === undefined ? {} : { keep: s.keep }),
  }));
}

/** Lower bound of a job's time in the room: every hands-on minute and every rest, back to back. */
export function minimumLength(work: readonly Work[]): number {
  let total = 0;
  for (const w of work) total += w.duration + w.rest;
  return total;
}

/**
 * Earliest start at or after `lo` of `d` free minutes ending by `hi`, given sorted busy pairs; null when none.
 */
export function earliestGap(busy: readonly number[] | undefined, lo: number, hi: number, d: number): number | null {
  let cur = lo;
  if (busy) {
    for (let i = 0; i < busy.length; i += 2) {
      const s = busy[i] as number;
      const e = busy[i + 1] as number;
      if (e <= cur) continue;
      if (s >= cur + d) break;
      cur = Math.max(cur, e);
      if (cur + d > hi) return null;
    }
  }
  return cur + d <= hi ? cur : null;
}

/** Polishers in the order they are tried: the kept one alone, else the preferred one first. */
function order(polishers: readonly PolisherRow[], prefer: number, keep?: PolisherRow): PolisherRow[] {
  if (keep) return [keep];
  if (prefer < 0) return polishers as PolisherRow[];
  const first = polishers[prefer] as PolisherRow;
  return [first, ...polishers.filter((p) => p.index !== prefer)];
}

/** A polisher's booked load plus this job's own minutes that day. */
function usedOn(prep: Prepared, own: ReadonlyMap<number, number>, key: number): { dl: DayLoad | undefined; used: number } {
  const dl = prep.load.get(key);
  return { dl, used: (dl?.used ?? 0) + (own.get(key) ?? 0) };
}

/** A placed session before numbering. */
export interface Placement {
  polisher: PolisherRow;
  segments: PlanSegment[];
}

/** Places a session that fits in one window: first (day, time, polisher) with room for all of it. */
function placeWhole(prep: Prepared, own: ReadonlyMap<number, number>, earliest: number, d: number, prefer: number, keep?: PolisherRow): Placement | null {
  const n = prep.polishers.length;
  const tried = order(prep.polishers, prefer, keep);
  const firstDay = dayOf(earliest);
  for (let day = firstDay; day < firstDay + prep.horizonDays; day++) {
    const w = openingWindow(prep.cal, day);
    if (!w || w[1] - w[0] < d) continue;
    const lo = Math.max(earliest, w[0]);
    if (lo + d > w[1]) continue;
    let best: Placement | null = null;
    let bestStart = Infinity;
    for (const p of tried) {
      const key = day * n + p.index;
      const { dl, used } = usedOn(prep, own, key);
      if (used + d > availableMinutes(prep, p, day)) continue;
      const start = earliestGap(dl?.busy, lo, w[1], d);
      if (start === null || start >= bestStart) continue;
      best = { polisher: p, segments: [{ start, end: start + d }] };
      bestStart = start;
      if (start === lo) break;
    }
    if (best) return best;
  }
  return null;
}

/** Tries to run a long session's parts by one polisher from `start` on `day` to closing, then whole days. */
function tryParts(prep: Prepared, own: ReadonlyMap<number, number>, p: PolisherRow, day: number, start: number, d: number): PlanSegment[] | null {
  const n = prep.polishers.length;
  const segments: PlanSegment[] = [];
  let remaining = d;
  let s = start;
  for (let dd = day, guard = 0; remaining > 0; dd++, guard++) {
    if (guard > prep.horizonDays) return null;
    const w = openingWindow(prep.cal, dd);
    if (!w) continue;
    if (dd !== day) s = w[0];
    const e = Math.min(w[1], s + remaining);
    const key = dd * n + p.index;
    const { dl, used } = usedOn(prep, own, key);
    if (used + (e - s) > availableMinutes(prep, p, dd)) return null;
    if (earliestGap(dl?.busy, s, e, e - s) !== s) return null;
    segments.push({ start: s, end: e });
    remaining -= e - s;
  }
  return segments;
}

/** Places a session longer than any window: day-sized parts on consecutive open days, one polisher. */
function placeSplit(prep: Prepared, own: ReadonlyMap<number, number>, earliest: number, d: number, prefer: number, keep?: PolisherRow): Placement | null {
  const n = prep.polishers.length;
  const tried = order(prep.polishers, prefer, keep);
  const firstDay = dayOf(earliest);
  for (let day = firstDay; day < firstDay + prep.horizonDays; day++) {
    const w = openingWindow(prep.cal, day);
    // As in the coat calendar: a long session starts at the opening of a full-length day.
    if (!w || w[1] - w[0] < prep.cal.longestWindow || earliest > w[0]) continue;
    const lo = w[0];
    let best: Placement | null = null;
    let bestStart = Infinity;
    for (const p of tried) {
      // The first part runs to closing: it starts once the polisher's last booked stretch that day is over.
      const busy = prep.load.get(day * n + p.index)?.busy;
      let start = lo;
      if (busy) for (let i = 1; i < busy.length; i += 2) start = Math.max(start, busy[i] as number);
      if (start >= w[1] || start >= bestStart) continue;
      const segments = tryParts(prep, own, p, day, start, d);
      if (!segments) continue;
      best = { polisher: p, segments };
      bestStart = start;
    }
    if (best) return best;
  }
  return null;
}

/** A job's sessions laid, or why not. */
export type Laid = { ok: true; sessions: PlannedSession[] } | { ok: false; problem: PlanProblem };

/**
 * Checks that every session that fits in a window can be done by someone at all (a long, split session is checked
 * by the search itself: its first and last parts may be short).
 */
export function workProblem(prep: Prepared, work: readonly Work[]): PlanProblem | null {
  const most = Math.max(0, ...prep.polishers.map((p) => Math.min(p.minutesPerDay, prep.cal.longestWindow)));
  for (const [i, w] of work.entries()) {
    if (w.keep !== undefined) {
      const kept = prep.byId.get(w.keep);
      if (!kept) return { code: 'bad-input', text: `Session ${i + 1} is kept for a polisher who is not on the list of polishers` };
      const theirs = Math.min(kept.minutesPerDay, prep.cal.longestWindow);
      if (w.duration <= prep.cal.longestWindow && w.duration > theirs) {
        return { code: 'session-too-long', text: `Session ${i + 1} needs ${w.duration} minutes in one day but the polisher kept on it works ${theirs} minutes a day` };
      }
      continue;
    }
    if (w.duration <= prep.cal.longestWindow && w.duration > most) {
      return {
        code: 'session-too-long',
        text: `Session ${i + 1} needs ${w.duration} minutes in one day but no polisher works more than ${most} minutes a day`,
      };
    }
  }
  return null;
}

/**
 * Lays sessions in order from `from`, greedily: each as early as possible after the previous session's end plus
 * its rest. For a fixed first session this gives the earliest end, so the shortest time in the room.
 */
export function layWork(prep: Prepared, work: readonly Work[], from: number, prefer = -1, firstIndex = 0): Laid {
  const problem = workProblem(prep, work);
  if (problem) return { ok: false, problem };
  const n = prep.polishers.length;
  const own = new Map<number, number>();
  const sessions: PlannedSession[] = [];
  let earliest = from;
  let last = prefer;
  for (const [i, w] of work.entries()) {
    const keep = w.keep === undefined ? undefined : prep.byId.get(w.keep);
    const placed =
      w.duration > prep.cal.longestWindow ? placeSplit(prep, own, earliest, w.duration, last, keep) : placeWhole(prep, own, earliest, w.duration, last, keep);
    if (!placed) {
      return {
        ok: false,
        problem: { code: 'beyond-horizon', text: `No polisher has room for session ${firstIndex + i + 1} within ${prep.horizonDays} days` },
      };
    }
    for (const seg of placed.segments) {
      const key = dayOf(seg.start) * n + placed.polisher.index;
      own.set(key, (own.get(key) ?? 0) + seg.end - seg.start);
    }
    sessions.push(session(firstIndex + i, w, placed.polisher.id, placed.segments));
    earliest = (placed.segments[placed.segments.length - 1] as PlanSegment).end + w.rest;
    last = placed.polisher.index;
  }
  return { ok: true, sessions };
}

/** A planned session from its parts. */
export function session(index: number, w: Work, polisherId: string, segments: PlanSegment[]): PlannedSession {
  const start = (segments[0] as PlanSegment).start;
  const end = (segments[segments.length - 1] as PlanSegment).end;
  return {
    index,
    ...(w.label === undefined ? {} : { label: w.label }),
    polisherId,
    handsOnMin: w.duration,
    restMin: w.rest,
    start,
    end,
    restUntil: end + w.rest,
    segments,
    ...(w.keep === undefined ? {} : { kept: true }),
  };
}

/** Midnight of the day after `t`'s day. */
export function nextMidnight(t: number): number {
  return (dayOf(t) + 1) * MIN_PER_DAY;
}
