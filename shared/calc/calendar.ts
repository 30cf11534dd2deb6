/**
 * The coat calendar: sessions laid on the workshop's working calendar, each followed by its rest.
 *
 * Times are local and carry no time zone ("2025-03-14T08:30"). Work happens only inside opening hours on open
 * days; rests run in calendar time, nights, weekends and closed days included. Inside, a time is a count of
 * minutes since 1970-01-01T00:00 local.
 */
import { CALENDAR_WEEKDAYS } from '../schemas/catalog';
import type { StageKind, WorkingCalendar } from '../schemas/catalog';

const MIN_PER_DAY = 1440;
/** How far ahead a session may be looked for before the calendar is judged unworkable. */
const SEARCH_DAYS = 3660;

/** Thrown when a calendar has no time to work in or a date cannot be read. */
export class CalendarError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CalendarError';
  }
}

/**
 * Minutes since 1970-01-01T00:00 of a local date ("2025-03-14") or date-time ("2025-03-14T08:30").
 *
 * @example toMinutes('1970-01-02T01:00') // 1500
 */
export function toMinutes(local: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})(?:T(\d{2}):(\d{2})(?::\d{2})?)?$/.exec(local);
  if (!m) throw new CalendarError(`Cannot read "${local}" as a local date or date-time`);
  const ms = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]), Number(m[4] ?? 0), Number(m[5] ?? 0));
  return Math.round(ms / 60_000);
}

/**
 * A local date-time written as "YYYY-MM-DDTHH:MM".
 *
 * @example fromMinutes(1500) // "1970-01-02T01:00"
 */
export function fromMinutes(minutes: number): string {
  const days = Math.floor(minutes / MIN_PER_DAY);
  const inDay = minutes - days * MIN_PER_DAY;
  if (!Number.isInteger(inDay)) return `${dayText(days)}T${pad2(Math.floor(inDay / 60))}:${pad2(inDay % 60)}`;
  let time = TIME_TEXT[inDay];
  if (time === undefined) {
    time = `T${pad2(Math.floor(inDay / 60))}:${pad2(inDay % 60)}`;
    TIME_TEXT[inDay] = time;
  }
  return dayText(days) + time;
}

/** "THH:MM" by minute of the day, and "YYYY-MM-DD" by day number (bounded): a calendar writes the same days again and again. */
const TIME_TEXT: string[] = [];
const DAY_TEXT = new Map<number, string>();
const DAY_TEXT_MAX = 8192;

function dayText(days: number): string {
  let text = DAY_TEXT.get(days);
  if (text !== undefined) return text;
  // Civil date from a day count (H. Hinnant's days-to-civil algorithm): far cheaper than Date + toISOString.
  const z = days + 719_468;
  const era = Math.floor(z / 146_097);
  const doe = z - era * 146_097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36_524) - Math.floor(doe / 146_096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  const year = yoe + era * 400 + (month <= 2 ? 1 : 0);
  text = `${year}-${pad2(month)}-${pad2(day)}`;
  if (DAY_TEXT.size >= DAY_TEXT_MAX) DAY_TEXT.clear();
  DAY_TEXT.set(days, text);
  return text;
}

function pad2(n: number): string {
  return n < 10 ? `0${n}` : String(n);
}

/** The day a minute falls on, as a day number since 1970-01-01. */
export function dayOf(minutes: number): number {
  return Math.floor(minutes / MIN_PER_DAY);
}

function clock(time: string): number {
  return Number(time.slice(0, 2)) * 60 + Number(time.slice(3, 5));
}

/** Opening hours by weekday (Monday 0 … Sunday 6) and closed days, ready for fast look-up. */
export interface CompiledCalendar {
  hours: ReadonlyArray<readonly [number, number] | null>;
  closed: ReadonlySet<number>;
  longestWindow: number;
}

/**
 * Prepares a working calendar for scheduling.
 *
 * @example compileCalendar({ workingWeek: [{ day: 'mon', open: '08:00', close: '17:00' }], closedDates: [] }).longestWindow // 540
 */
export function compileCalendar(calendar: WorkingCalendar): CompiledCalendar {
  const hours: Array<readonly [number, number] | null> = CALENDAR_WEEKDAYS.map(() => null);
  for (const day of calendar.workingWeek) {
    const open = clock(day.open);
    const close = clock(day.close);
    if (close > open) hours[CALENDAR_WEEKDAYS.indexOf(day.day)] = [open, close];
  }
  const longestWindow = Math.max(0, ...hours.map((h) => (h ? h[1] - h[0] : 0)));
  if (longestWindow === 0) throw new CalendarError('The working calendar has no opening hours');
  return { hours, closed: new Set(calendar.closedDates.map((d) => dayOf(toMinutes(d)))), longestWindow };
}

/**
 * Opening window of a day, in minutes since the epoch, or null when the workshop is closed.
 * 1970-01-01 was a Thursday (weekday 3 counting from Monday).
 */
export function openingWindow(cal: CompiledCalendar, day: number): readonly [number, number] | null {
  if (cal.closed.has(day)) return null;
  const hours = cal.hours[(((day + 3) % 7) + 7) % 7];
  return hours ? [day * MIN_PER_DAY + hours[0], day * MIN_PER_DAY + hours[1]] : null;
}

/** A stretch of hands-on work. */
export interface Segment {
  start: number;
  end: number;
}

/**
 * Places a session of `duration` minutes at or after `earliest`, by one monotonic rule: a longer session, or a
 * later earliest start, never ends sooner.
 *
 * - A session that fits inside the longest opening of the week is never split: it starts at the first moment at
 *   or after `earliest` from which the rest of that day's opening holds all of it.
 * - A longer session starts where a session of exactly the longest opening would (the opening of the next
 *   full-length working day) and runs on through the following openings.
 *
 * So a session one minute longer than a day never starts in the last hour of today and finishes before a
 * session of exactly a day, which would have waited for tomorrow.
 *
 * @example placeSession(cal, toMinutes('2025-03-14T16:00'), 120) // next working day at opening
 */
export function placeSession(cal: CompiledCalendar, earliest: number, duration: number): Segment[] {
  if (duration <= cal.longestWindow) {
    const start = wholeStart(cal, earliest, duration);
    return [{ start, end: start + duration }];
  }
  const segments: Segment[] = [];
  let remaining = duration;
  let day = dayOf(wholeStart(cal, earliest, cal.longestWindow));
  for (let i = 0; i < SEARCH_DAYS; i++, day++) {
    const w = openingWindow(cal, day);
    if (!w) continue;
    const room = w[1] - w[0];
    if (remaining <= room) {
      segments.push({ start: w[0], end: w[0] + remaining });
      return segments;
    }
    segments.push({ start: w[0], end: w[1] });
    remaining -= room;
  }
  throw new CalendarError(`No opening hours found within ${SEARCH_DAYS} days to finish a session`);
}

/** The first moment at or after `earliest` from which one day's opening holds `duration` minutes. */
function wholeStart(cal: CompiledCalendar, earliest: number, duration: number): number {
  let day = dayOf(earliest);
  for (let i = 0; i < SEARCH_DAYS; i++, day++) {
    const w = openingWindow(cal, day);
    if (!w) continue;
    const start = Math.max(earliest, w[0]);
    if (w[1] - start >= duration) return start;
  }
  throw new CalendarError(`No opening hours found within ${SEARCH_DAYS} days to place a session`);
}

/** A session to schedule. */
export interface SessionRequest {
  stage: string;
  stageKind: StageKind;
  session: number;
  handsOnMin: number;
  /** Rest after this session, minutes, already stretched for the climate. */
  restMin: number;
}

/** A scheduled session. */
export interface ScheduledSession extends SessionRequest {
  index: number;
  segments: Segment[];
  start: number;
  end: number;
  restUntil: number;
}

/**
 * Lays sessions in order from `start`: each starts no earlier than the previous session's end plus its rest, and
 * only inside opening hours.
 *
 * @example scheduleSessions(sessions, cal, toMinutes('2025-03-03T08:00'))
 */
export function scheduleSessions(requests: readonly SessionRequest[], cal: CompiledCalendar, start: number): ScheduledSession[] {
  const out: ScheduledSession[] = [];
  let earliest = start;
  for (let index = 0; index < requests.length; index++) {
    const req = requests[index] as SessionRequest;
    // A session with no hands-on time still needs a moment of opening hours (one minute) to be placed.
    const segments = placeSession(cal, earliest, Math.max(1, Math.round(req.handsOnMin)));
    const first = segments[0] as Segment;
    const last = segments[segments.length - 1] as Segment;
    const restUntil = last.end + Math.round(req.restMin);
    out.push({
      stage: req.stage, stageKind: req.stageKind, session: req.session, handsOnMin: req.handsOnMin, restMin: req.restMin,
      index, segments, start: first.start, end: last.end, restUntil,
    });
    earliest = restUntil;
  }
  return out;
}

/* Climate ------------------------------------------------------------------------------------------------ */

/**
 * How much longer rests take in the given climate (from memory, common practice): below 20 °C drying slows by
 * half for every 10 °C (a doubling per 10 °C, the chemist's rule of thumb), never faster above 20 °C; above 50 %
 * relative humidity rests stretch linearly, by half again at 75 % and double at 100 %.
 *
 * @example restFactor(20, 50) // 1
 * @example restFactor(10, 75) // 3 (2 × 1.5)
 */
export function restFactor(temperatureC: number, humidityPct: number): number {
  const temperature = temperatureC < 20 ? 2 ** ((20 - temperatureC) / 10) : 1;
  const humidity = humidityPct > 50 ? 1 + (humidityPct - 50) / 50 : 1;
  return temperature * humidity;
}

/** A climate warning. */
export interface ClimateWarning {
  code: string;
  text: string;
}

/**
 * Warnings for the workshop's climate: blush at 75 % RH or more (WoodWeb knowledge base); above about 65 %
 * finishing is best avoided (common practice); below about 15 °C shellac flows and hardens poorly (common
 * practice); above 30 °C the rubber drags (from memory).
 *
 * @example climateWarnings(18, 80).map((w) => w.code) // ['blush-risk']
 */
export function climateWarnings(temperatureC: number, humidityPct: number): ClimateWarning[] {
  const warnings: ClimateWarning[] = [];
  if (humidityPct >= 75) {
    warnings.push({ code: 'blush-risk', text: `At ${humidityPct} % relative humidity shellac risks turning milky (blooming): do not polish until the room is drier.` });
  } else if (humidityPct > 65) {
    warnings.push({ code: 'humid', text: `At ${humidityPct} % relative humidity rests are longer and shellac may bloom; aim for 65 % or less.` });
  }
  if (temperatureC < 15) {
    warnings.push({ code: 'cold', text: `At ${temperatureC} °C shellac flows and hardens slowly; rests are stretched. Warm the room to at least 15–18 °C.` });
  }
  if (temperatureC > 30) {
    warnings.push({ code: 'hot', text: `At ${temperatureC} °C spirit flashes off quickly and the rubber drags; work smaller areas.` });
  }
  return warnings;
}
