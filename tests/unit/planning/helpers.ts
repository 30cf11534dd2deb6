/**
 * Test helpers for the planning engine: a workshop calendar, a seeded PRNG, and an independent checker that counts
 * the room and the polishers' hours from plain data (no engine code).
 */
import { fromMinutes, toMinutes } from '../../../shared/calc/calendar';
import type { BookedJob, JobPlan, NewJob, PlanningContext } from '../../../shared/calc/planning';
import type { WorkingCalendar } from '../../../shared/schemas/catalog';

export const m = toMinutes;
export const iso = fromMinutes;

/** Monday to Friday 08:00–16:30, Saturday morning, Sunday closed. */
export const CALENDAR: WorkingCalendar = {
  workingWeek: [
    { day: 'mon', open: '08:00', close: '16:30' },
    { day: 'tue', open: '08:00', close: '16:30' },
    { day: 'wed', open: '08:00', close: '16:30' },
    { day: 'thu', open: '08:00', close: '16:30' },
    { day: 'fri', open: '08:00', close: '16:30' },
    { day: 'sat', open: '08:00', close: '12:00' },
  ],
  closedDates: ['2026-12-25', '2026-12-26', '2027-01-01'],
};

export function context(extra: Partial<PlanningContext> = {}): PlanningContext {
  return {
    calendar: CALENDAR,
    room: { mode: 'bays', bays: 3 },
    polishers: [
      { id: 'p1', name: 'First polisher', hoursPerDay: 8.5 },
      { id: 'p2', name: 'Second polisher', hoursPerDay: 6 },
    ],
    ...extra,
  };
}

/** mulberry32: a small seeded PRNG. */
export function mulberry32(seed: number): () => number {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function job(id: string, sessions: Array<[number, number]>, extra: Partial<NewJob> = {}): NewJob {
  return { id, sessions: sessions.map(([handsOnMin, restMin]) => ({ handsOnMin, restMin })), ...extra };
}

const WEEKDAY = ['sun', 'mon', 'tue', 'wed', 'thu', 'fri', 'sat'];

/** Opening hours of a date from the calendar written out, or null (closed date, day not worked). */
export function hoursOf(ctx: PlanningContext, date: string): { open: number; close: number } | null {
  if (ctx.calendar.closedDates.includes(date) || (ctx.closedDates ?? []).includes(date)) return null;
  const day = WEEKDAY[new Date(`${date}T00:00:00Z`).getUTCDay()];
  const h = ctx.calendar.workingWeek.find((d) => d.day === day);
  if (!h) return null;
  return { open: m(`${date}T${h.open}`), close: m(`${date}T${h.close}`) };
}

export function need(j: { bays?: number; areaM2?: number }, ctx: PlanningContext): number {
  return ctx.room.mode === 'bays' ? (j.bays ?? 1) : (j.areaM2 ?? 0);
}

export function capacity(ctx: PlanningContext): number {
  return ctx.room.mode === 'bays' ? ctx.room.bays : ctx.room.areaM2;
}

/** Everything wrong with a plan on its own: order, rests, opening hours, hands-on minutes. */
export function planErrors(plan: JobPlan, ctx: PlanningContext, spec?: NewJob): string[] {
  const errors: string[] = [];
  let prevRestUntil = -Infinity;
  plan.sessions.forEach((s, i) => {
    if (s.start < prevRestUntil) errors.push(`session ${i} starts ${iso(s.start)} before the rest ends ${iso(prevRestUntil)}`);
    if (s.restUntil !== s.end + s.restMin) errors.push(`session ${i} rest miscounted`);
    const worked = s.segments.reduce((t, g) => t + g.end - g.start, 0);
    if (worked !== s.handsOnMin) errors.push(`session ${i} works ${worked} of ${s.handsOnMin} min`);
    if (spec) {
      const want = spec.sessions[i];
      if (!want || s.handsOnMin !== Math.max(1, Math.round(want.handsOnMin)) || s.restMin !== Math.round(want.restMin)) errors.push(`session ${i} differs from the job`);
    }
    for (const g of s.segments) {
      const h = hoursOf(ctx, iso(g.start).slice(0, 10));
      if (!h || g.start < h.open || g.end > h.close) errors.push(`session ${i} works ${iso(g.start)}–${iso(g.end)} outside opening hours`);
    }
    prevRestUntil = s.restUntil;
  });
  if (plan.room.start !== plan.sessions[0]?.start) errors.push('room interval does not start with the first session');
  if (plan.room.end !== plan.sessions[plan.sessions.length - 1]?.restUntil) errors.push('room interval does not end with the last rest');
  return errors;
}

/** Room use at minute t (half-open intervals). */
export function roomAt(jobs: readonly BookedJob[], t: number, ctx: PlanningContext): number {
  let used = 0;
  for (const j of jobs) if (j.room.start <= t && t < j.room.end) used += need(j, ctx);
  return used;
}

/** Whether `plan` fits next to `booked`: room at every moment, and for every polisher-day it touches, hours and no clash. */
export function fits(plan: JobPlan, booked: readonly BookedJob[], ctx: PlanningContext): boolean {
  const mine = need(plan, ctx);
  const points = [plan.room.start, ...booked.map((j) => j.room.start).filter((t) => t > plan.room.start && t < plan.room.end)];
  for (const t of points) if (roomAt(booked, t, ctx) + mine > capacity(ctx) + 1e-9) return false;
  for (const s of plan.sessions) {
    for (const g of s.segments) {
      const date = iso(g.start).slice(0, 10);
      const polisher = ctx.polishers.find((p) => p.id === s.polisherId);
      const h = hoursOf(ctx, date);
      if (!polisher || !h || (polisher.daysOff ?? []).includes(date)) return false;
      let used = 0;
      for (const j of [...booked, plan]) {
        for (const bs of j.sessions) {
          if (bs.polisherId !== s.polisherId) continue;
          for (const bg of bs.segments) {
            if (iso(bg.start).slice(0, 10) !== date) continue;
            used += bg.end - bg.start;
            if (j !== plan && bg.start < g.end && g.start < bg.end) return false;
          }
        }
      }
      if (used > Math.min(polisher.hoursPerDay * 60, h.close - h.open)) return false;
    }
  }
  return true;
}

/** Every overload on a whole board: room at every arrival, polisher hours per day, clashes. */
export function boardErrors(jobs: readonly BookedJob[], ctx: PlanningContext): string[] {
  const errors: string[] = [];
  for (const j of jobs) {
    const used = roomAt(jobs, j.room.start, ctx);
    if (used > capacity(ctx) + 1e-9) errors.push(`room holds ${used} at ${iso(j.room.start)}`);
  }
  const perDay = new Map<string, Array<[number, number]>>();
  for (const j of jobs) {
    for (const s of j.sessions) {
      for (const g of s.segments) {
        const k = `${s.polisherId} ${iso(g.start).slice(0, 10)}`;
        perDay.set(k, [...(perDay.get(k) ?? []), [g.start, g.end]]);
      }
    }
  }
  for (const [k, list] of perDay) {
    const [pid, date] = k.split(' ') as [string, string];
    const p = ctx.polishers.find((x) => x.id === pid);
    const h = hoursOf(ctx, date);
    const used = list.reduce((t, [a, b]) => t + b - a, 0);
    if (!p || !h || used > Math.min(p.hoursPerDay * 60, h.close - h.open)) errors.push(`${k}: ${used} min`);
    const sorted = [...list].sort((x, y) => x[0] - y[0]);
    for (let i = 1; i < sorted.length; i++) if ((sorted[i] as [number, number])[0] < (sorted[i - 1] as [number, number])[1]) errors.push(`${k}: clash`);
  }
  return errors;
}
