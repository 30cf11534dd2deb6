/**
 * Capacity by week for a period: the drying room's bay-days (or m²-days) taken against those there to take, and
 * polishers' hours booked against their open hours, for the weeks behind today and the weeks ahead. A week runs
 * Monday to Sunday; the room counts every day (pieces rest over the weekend), polishers only their open hours.
 */
import { occupancy } from '@shared/calc/planning';
import type { CapacityReport, CapacityWeek, Period } from '@shared/schemas/reports';
import { addDays, loadBoardJobs, loadPlanning, localNow } from '../planning-context';
import { toMinutes } from '@shared/calc';

/** Monday of the week holding a date. */
export function mondayOf(date: string): string {
  const day = Math.floor(toMinutes(date) / 1440);
  const weekday = (((day + 3) % 7) + 7) % 7;
  return addDays(date, -weekday);
}

const r1 = (n: number) => Math.round(n * 10) / 10;
const share = (a: number, b: number) => (b > 0 ? r1((a / b) * 100) : null);

export async function capacityReport(p: Period): Promise<CapacityReport> {
  const today = localNow().slice(0, 10);
  const first = mondayOf(p.from);
  const last = addDays(mondayOf(p.to), 6);
  const planning = await loadPlanning(undefined, false);
  const { booked } = await loadBoardJobs(first < today ? first : today);
  const days = occupancy(booked, planning.ctx, first, last);
  const weeks: CapacityWeek[] = [];
  const thisWeek = mondayOf(today);
  for (let i = 0; i < days.length; i += 7) {
    const slice = days.slice(i, i + 7);
    const week = slice[0]!.date;
    const roomBooked = slice.reduce((t, d) => t + Math.max(0, d.room.peak), 0);
    const roomAvailable = slice.reduce((t, d) => t + d.room.capacity, 0);
    const usedMin = slice.reduce((t, d) => t + d.polishers.reduce((s, x) => s + x.usedMin, 0), 0);
    const availableMin = slice.reduce((t, d) => t + d.polishers.reduce((s, x) => s + x.availableMin, 0), 0);
    weeks.push({
      week,
      roomBooked: r1(roomBooked),
      roomAvailable: r1(roomAvailable),
      roomPct: share(roomBooked, roomAvailable),
      polisherHoursBooked: r1(usedMin / 60),
      polisherHoursAvailable: r1(availableMin / 60),
      polisherPct: share(usedMin, availableMin),
      past: week < thisWeek,
    });
  }
  const room = planning.settings.dryingRoom;
  return {
    from: p.from,
    to: p.to,
    today,
    roomUnit: room.mode === 'bays' ? 'bays' : 'm²',
    weeks,
    weeksBehind: weeks.filter((w) => w.past).length,
    weeksAhead: weeks.filter((w) => !w.past).length,
  };
}
