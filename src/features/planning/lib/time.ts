/**
 * Board times are local date-times without a time zone ("2026-12-07T08:00"), counted here in minutes since
 * 1970-01-01 as the planning engine does. They are shown in the workshop's own terms, never shifted by the
 * browser's time zone.
 */
import { fromMinutes, toMinutes } from '@shared/calc/calendar';

export { fromMinutes, toMinutes };

export const MIN_PER_DAY = 1440;

/** The board's dates and durations in the one formatter's words. */
export {
  formatDay as dayLabel,
  formatLongDay as longDate,
  formatDayTime as dateTime,
  formatWorkTime as hoursText,
  formatRest as restText,
  formatDuration as durationText,
} from '@shared/format';

/** "08:00" */
export function clock(local: string): string {
  return local.slice(11, 16);
}

/** Calendar arithmetic and the workshop's clock come from the one time module. */
export { addDays, daysBetween, mondayOf, nowLocal, weekdayIndex as weekday } from '@shared/time';
