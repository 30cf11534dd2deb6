/**
 * The one clock. "Today" is the workshop's own day in the workshop's own time zone (the `timeZone` setting), on
 * the server, in the browser, in the database's queries and in the engine alike. Calendar dates travel as
 * 'YYYY-MM-DD' and board times as 'YYYY-MM-DDTHH:MM' without a zone: both are the workshop's wall clock. Date
 * arithmetic goes through date-fns (with @date-fns/tz for the zone), never by hand.
 */
import { TZDate, tz } from '@date-fns/tz';
import { addDays as addDaysFn, differenceInCalendarDays, format, isValid, parse, startOfISOWeek } from 'date-fns';

/** The zone a workshop starts with until the owner sets its own. */
export const DEFAULT_TIME_ZONE = 'Europe/London';

const IANA_NAME = /^(UTC|[A-Za-z]+(?:\/[A-Za-z0-9_+-]+)+)$/;

/** An IANA time-zone name the runtime knows ("Europe/London", "America/New_York", "UTC"); never an offset. */
export function isTimeZone(zone: string): boolean {
  if (!IANA_NAME.test(zone)) return false;
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

/** Every zone the runtime knows, sorted, with `current` kept in the list even when the runtime lacks it. */
export function timeZoneOptions(current?: string): string[] {
  const known = typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('timeZone') : [DEFAULT_TIME_ZONE];
  const all = new Set([...known, 'UTC', DEFAULT_TIME_ZONE]);
  if (current) all.add(current);
  return [...all].sort();
}

let workshopZone = DEFAULT_TIME_ZONE;
let zoneSource: () => string | undefined = () => undefined;

/**
 * Tells the clock which zone the workshop keeps, when one process serves one workshop: the browser when the workshop
 * arrives, and the server for work outside any workshop's scope. An unknown name is ignored (the settings schema
 * refuses it before it is stored).
 */
export function setWorkshopTimeZone(zone: string | undefined | null): void {
  if (zone && isTimeZone(zone)) workshopZone = zone;
}

/**
 * Where the clock asks first for the zone of the work running now. The server, which serves many workshops, answers
 * with the zone of the workshop the current unit of work runs under (server/db/workshop-context.ts); undefined falls
 * back to the zone given to `setWorkshopTimeZone`.
 */
export function setTimeZoneSource(source: () => string | undefined): void {
  zoneSource = source;
}

/** The workshop's time zone: the current work's workshop's where the server knows it, else the one last given. */
export function workshopTimeZone(): string {
  return zoneSource() ?? workshopZone;
}

/** Calendar arithmetic happens in UTC, where every day has 24 hours: no daylight-saving surprise. */
const calendar = { in: tz('UTC') };

function calendarDay(date: string): Date {
  const d = parse(date.slice(0, 10), 'yyyy-MM-dd', new TZDate(0, 'UTC'), calendar);
  if (!isValid(d)) throw new RangeError(`not a calendar date: ${date}`);
  return d;
}

/**
 * The wall clock in a zone to the minute, 'YYYY-MM-DDTHH:MM', remembered per zone and minute: every zone's offset is
 * whole minutes, so the text cannot change within a minute of UTC, and a request that asks for "today" several
 * times (the engine, the expiry of quotes, the lists) works it out once a minute instead of each time.
 */
const wallClocks = new Map<string, string>();
function wallClock(zone: string, now: Date): string {
  const key = `${zone}|${Math.floor(now.getTime() / 60_000)}`;
  let text = wallClocks.get(key);
  if (text === undefined) {
    text = format(new TZDate(now, zone), "yyyy-MM-dd'T'HH:mm");
    if (wallClocks.size >= 256) wallClocks.clear();
    wallClocks.set(key, text);
  }
  return text;
}

/** Today in the workshop's zone (or the zone given), 'YYYY-MM-DD'. */
export function today(zone: string = workshopTimeZone(), now: Date = new Date()): string {
  const clock = wallClock(zone, now);
  return clock.slice(0, clock.indexOf('T'));
}

/** The workshop's wall clock now, 'YYYY-MM-DDTHH:MM' (board times carry no zone). */
export function nowLocal(zone: string = workshopTimeZone(), now: Date = new Date()): string {
  return wallClock(zone, now);
}

/** The year it is in the workshop's zone (record numbers: Q-2026-0001). */
export function currentYear(zone: string = workshopTimeZone(), now: Date = new Date()): number {
  return new TZDate(now, zone).getFullYear();
}

/** The calendar day an instant falls on in the workshop's zone, 'YYYY-MM-DD'. */
export function dayOf(instant: Date, zone: string = workshopTimeZone()): string {
  return format(new TZDate(instant, zone), 'yyyy-MM-dd');
}

/** A calendar date moved by whole days (negative for earlier). */
export function addDays(date: string, days: number): string {
  return format(addDaysFn(calendarDay(date), days, calendar), 'yyyy-MM-dd', calendar);
}

/** Whole calendar days from `a` to `b` (dates, or date-times whose time is ignored). */
export function daysBetween(a: string, b: string): number {
  return differenceInCalendarDays(calendarDay(b), calendarDay(a), calendar);
}

/** The Monday of the week holding a date. */
export function mondayOf(date: string): string {
  return format(startOfISOWeek(calendarDay(date), calendar), 'yyyy-MM-dd', calendar);
}

/** Weekday of a date, Monday 0 … Sunday 6. */
export function weekdayIndex(date: string): number {
  return daysBetween(mondayOf(date), date);
}

/** Today moved by whole days, in the workshop's zone: the default "valid until" of a quote, say. */
export function daysFromToday(days: number, zone: string = workshopTimeZone(), now: Date = new Date()): string {
  return addDays(today(zone, now), days);
}
