/**
 * Board times are local date-times without a time zone ("2026-12-07T08:00"), counted here in minutes since
 * 1970-01-01 as the planning engine does. They are shown in the workshop's own terms, never shifted by the
 * browser's time zone.
 */
import { fromMinutes, toMinutes } from '@shared/calc/calendar';

export { fromMinutes, toMinutes };

export const MIN_PER_DAY = 1440;

const utc = (local: string) => new Date(`${local.length === 10 ? `${local}T00:00` : local}:00Z`);

/** "Mon 7 Dec" */
export function dayLabel(local: string): string {
  return utc(local).toLocaleDateString('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' });
}

/** "Mon 7 Dec 2026" */
export function longDate(local: string): string {
  return utc(local).toLocaleDateString('en-GB', { weekday: 'short', day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}

/** "Mon 7 Dec, 08:00" */
export function dateTime(local: string | null): string {
  if (!local) return '—';
  return `${dayLabel(local)}, ${local.slice(11, 16)}`;
}

/** "08:00" */
export function clock(local: string): string {
  return local.slice(11, 16);
}

/** Calendar arithmetic and the workshop's clock come from the one time module. */
export { addDays, daysBetween, mondayOf, nowLocal, weekdayIndex as weekday } from '@shared/time';

/** Hours with their unit: "7.5 h", "45 min" below an hour. */
export function hoursText(hours: number): string {
  if (hours > 0 && hours < 1) return `${Math.round(hours * 60)} min`;
  return `${Math.round(hours * 100) / 100} h`;
}

/** A rest: hours up to two days, days beyond ("26.4 h", "7.7 days"). */
export function restText(hours: number): string {
  if (hours <= 0) return 'none';
  return hours < 48 ? hoursText(hours) : `${Math.round((hours / 24) * 10) / 10} days`;
}

/** A duration in minutes as "1 day 3 h 20 min". */
export function durationText(min: number): string {
  const days = Math.floor(min / MIN_PER_DAY);
  const h = Math.floor((min % MIN_PER_DAY) / 60);
  const m = Math.round(min % 60);
  return [days ? `${days} day${days === 1 ? '' : 's'}` : '', h ? `${h} h` : '', m ? `${m} min` : ''].filter(Boolean).join(' ') || '0 min';
}
