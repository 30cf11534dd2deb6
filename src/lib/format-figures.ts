/**
 * Display formats that need no unit library (so that list pages stay light): money, hours, days and dates.
 * Every figure leaves here with its unit.
 */

import { formatHours as hoursWithUnit } from '@shared/format';

/** Money, changes, counts and signed figures come from the one formatting module (shared/format.ts). */
export { formatDelta, formatDays, formatMoney, formatMoneyDelta, plural } from '@shared/format';

/** Hours to a tenth ("46.0 h"). */
export function formatHours(hours: number): string {
  return hoursWithUnit(hours, { fixed: 1 });
}

function toDate(text: string): Date {
  // Local date-times from the engine carry no zone: read them as they are written.
  return /^\d{4}-\d{2}-\d{2}$/.test(text) ? new Date(`${text}T00:00:00`) : new Date(text);
}

// Made once: each toLocale…String call with options builds a new formatter, about half a millisecond, and the live
// figures show dates on every keystroke. The same locale and options, so the same words.
const DATE = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric' });
const DATE_TIME = new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' });
const WHEN = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short' });

export function formatDate(text: string): string {
  const d = toDate(text);
  return Number.isNaN(d.getTime()) ? text : DATE.format(d);
}

export function formatDateTime(text: string): string {
  const d = toDate(text);
  return Number.isNaN(d.getTime()) ? text : DATE_TIME.format(d);
}

export function formatWhen(text: string): string {
  const d = toDate(text);
  return Number.isNaN(d.getTime()) ? text : WHEN.format(d);
}

/** Today as YYYY-MM-DD in the workshop's time zone (shared/time.ts). */
export { today as todayLocal } from '@shared/time';
