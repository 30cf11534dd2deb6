/**
 * The one date schema: every date a client sends (API bodies and queries, the supplier price file) is checked here.
 * A date is YYYY-MM-DD naming a real calendar day (no 2026-02-30, no year 0000: nothing rolls over to another day),
 * and within bounds that each field states. Bounds are absolute dates or days from today, read when the value is
 * checked (today being the workshop's, shared/time.ts), so that a long-running server keeps moving them.
 */
import { z } from 'zod';
import { addDays, today } from '../time';

/** The widest range any date may take: before it or after it is a typing slip, never a workshop date. */
export const DATE_FLOOR = '2000-01-01';
export const DATE_CEILING = '2099-12-31';

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DATE_TIME_RE = /^(\d{4}-\d{2}-\d{2})T([01]\d|2[0-3]):([0-5]\d)$/;

/** Days in a month of the proleptic Gregorian calendar. */
function daysInMonth(year: number, month: number): number {
  if (month === 2) return year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0) ? 29 : 28;
  return [4, 6, 9, 11].includes(month) ? 30 : 31;
}

/** YYYY-MM-DD that names a real day (year 1 or later). */
export function isRealDate(s: string): boolean {
  const m = DATE_RE.exec(s);
  if (!m) return false;
  const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
  return year >= 1 && month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month);
}

/** Today in the workshop's time zone (shared/time.ts). */
export function localToday(now: Date = new Date()): string {
  return today(undefined, now);
}

/** A date moved by whole days. */
export const addDaysTo = addDays;

/** A bound: a fixed date, or so many days from today (negative for the past). */
export type DateBound = string | { daysFromToday: number };

function resolve(bound: DateBound): string {
  return typeof bound === 'string' ? bound : addDays(today(), bound.daysFromToday);
}

function describe(bound: DateBound, side: 'min' | 'max'): string {
  if (typeof bound === 'string') return side === 'min' ? `must be on or after ${bound}` : `must be on or before ${bound}`;
  const n = bound.daysFromToday;
  if (n === 0) return side === 'min' ? 'must be today or later' : 'must be today or earlier';
  const span = Math.abs(n) >= 365 && Math.abs(n) % 365 <= 1 ? `${Math.round(Math.abs(n) / 365)} year${Math.abs(n) >= 730 ? 's' : ''}` : `${Math.abs(n)} days`;
  return n > 0 ? `must be at most ${span} from today` : `must be at most ${span} ago`;
}

export interface DateRule {
  /** Earliest date allowed; DATE_FLOOR when left out. */
  min?: DateBound;
  /** Latest date allowed; DATE_CEILING when left out. */
  max?: DateBound;
  /** An example shown in the message for a malformed value. */
  example?: string;
}

/** Why a YYYY-MM-DD value breaks a rule, or undefined when it keeps it. */
export function dateProblem(value: string, rule: DateRule = {}): string | undefined {
  if (!DATE_RE.test(value)) return `must be a date like ${rule.example ?? '2027-03-14'}`;
  if (!isRealDate(value)) return 'is not a real calendar date';
  const min = rule.min ?? DATE_FLOOR;
  const max = rule.max ?? DATE_CEILING;
  if (value < DATE_FLOOR) return describe(DATE_FLOOR, 'min');
  if (value > DATE_CEILING) return describe(DATE_CEILING, 'max');
  if (value < resolve(min)) return describe(min, 'min');
  if (value > resolve(max)) return describe(max, 'max');
  return undefined;
}

/** A calendar date, YYYY-MM-DD, real and within the rule's bounds. */
export function dateSchema(rule: DateRule = {}) {
  return z.string({ message: `must be a date like ${rule.example ?? '2027-03-14'}` }).superRefine((value, ctx) => {
    const problem = dateProblem(value, rule);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });
}

/** A local date and time to the minute, YYYY-MM-DDTHH:MM, whose date keeps the rule. */
export function localDateTimeSchema(rule: DateRule = {}) {
  const example = `${rule.example ?? '2027-03-14'}T14:30`;
  return z.string({ message: `must be a local date and time like ${example}` }).superRefine((value, ctx) => {
    const m = DATE_TIME_RE.exec(value);
    const problem = m ? dateProblem(m[1]!, rule) : `must be a local date and time like ${example}`;
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });
}

/** A local date (YYYY-MM-DD) or date and time (YYYY-MM-DDTHH:MM, seconds allowed when `seconds`). */
export function dateOrDateTimeSchema(rule: DateRule & { seconds?: boolean } = {}) {
  const example = rule.example ?? '2027-03-14';
  const re = rule.seconds ? /^(\d{4}-\d{2}-\d{2})(T([01]\d|2[0-3]):[0-5]\d(:[0-5]\d)?)?$/ : /^(\d{4}-\d{2}-\d{2})(T([01]\d|2[0-3]):[0-5]\d)?$/;
  return z.string({ message: `must be a date like ${example} or a date and time like ${example}T08:00` }).superRefine((value, ctx) => {
    const m = re.exec(value);
    const problem = m ? dateProblem(m[1]!, rule) : `must be a date like ${example} or a date and time like ${example}T08:00`;
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });
}

/** Bounds of the fields that take dates, in one place. */
export const DATE_RULES = {
  /** A price takes effect from a date: back-dating within five years, forward within two. */
  priceEffective: { min: { daysFromToday: -5 * 365 }, max: { daysFromToday: 2 * 365 } },
  /** A quote is valid for at most a year. */
  quoteValidUntil: { max: { daysFromToday: 366 } },
  /** Audit filters: the log starts with the product and holds nothing from the future. */
  auditFilter: { max: { daysFromToday: 31 } },
  /** Planning dates: the workshop's calendar, days off, bookings and the board. */
  planning: {},
  /** When a job starts in the estimator's calendar. */
  calcStart: {},
} satisfies Record<string, DateRule>;
