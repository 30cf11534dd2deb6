/**
 * The board: drying room and polishers, day by day.
 */
import { openingWindow } from '../calendar';
import { AREA_EPS, availableMinutes, dateOf, dayNumber, MIN_PER_DAY, prepare } from './context';
import { peakBetween, roomProfile } from './room';
import type { BookedJob, DayOccupancy, DayRef, PlanningContext } from './types';

/**
 * Per day from `fromDay` to `toDay` (both included): the room's peak use that day against its capacity, and each
 * polisher's hands-on minutes against the minutes they have that day, with overbooked flags. Removing a job from
 * `booked` frees its places.
 *
 * @example occupancy(booked, ctx, '2026-12-07', '2026-12-13')[0].room // { peak: 2, capacity: 3, unit: 'bays', over: false }
 */
export function occupancy(booked: readonly BookedJob[], ctx: PlanningContext, fromDay: DayRef, toDay: DayRef): DayOccupancy[] {
  const prep = prepare(booked, ctx);
  const profile = roomProfile(booked, ctx.room);
  const n = prep.polishers.length;
  const out: DayOccupancy[] = [];
  for (let day = dayNumber(fromDay); day <= dayNumber(toDay); day++) {
    const peak = peakBetween(profile, day * MIN_PER_DAY, (day + 1) * MIN_PER_DAY);
    const roomOver = peak > prep.capacity + AREA_EPS;
    const polishers = prep.polishers.map((p) => {
      const usedMin = prep.load.get(day * n + p.index)?.used ?? 0;
      const availableMin = availableMinutes(prep, p, day);
      return { polisherId: p.id, usedMin, availableMin, over: usedMin > availableMin };
    });
    out.push({
      day,
      date: dateOf(day),
      open: openingWindow(prep.cal, day) !== null,
      room: { peak, capacity: prep.capacity, unit: prep.unit, over: roomOver },
      polishers,
      overbooked: roomOver || polishers.some((p) => p.over),
    });
  }
  return out;
}
