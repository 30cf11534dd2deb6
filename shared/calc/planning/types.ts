/**
 * Types of the drying-room and polishers' planning engine.
 *
 * Every time is a count of minutes since 1970-01-01T00:00 local (no time zone), as in the coat calendar; every day
 * is a day number since 1970-01-01 (see `dayOf`). The zod schemas check data at the boundary (API, storage); the
 * engine itself trusts its inputs and does not parse them again, so that it stays fast on large boards.
 */
import { z } from 'zod';
import { WorkingCalendarSchema } from '../../schemas/catalog';

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be a date like 2026-03-14' });
const minute = z.number().int();
const id = z.string().min(1).max(100);

/** How the drying room's capacity is counted: whole bays, or square metres of rack. */
export const RoomCapacitySchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('bays'), bays: z.number().int().min(0) }),
  z.object({ mode: z.literal('area'), areaM2: z.number().min(0) }),
]);
export type RoomCapacity = z.infer<typeof RoomCapacitySchema>;

/** A polisher and the hands-on hours they can give on each open day. */
export const PolisherSchema = z.object({
  id,
  name: z.string().max(200).optional(),
  /** Hands-on hours per open day; never more than the day's opening hours are used. */
  hoursPerDay: z.number().min(0).max(24),
  /** Dates this polisher is away (the workshop may still be open). */
  daysOff: z.array(isoDate).max(1000).optional(),
});
export type Polisher = z.infer<typeof PolisherSchema>;

/** Everything the planner needs besides the jobs. */
export const PlanningContextSchema = z.object({
  calendar: WorkingCalendarSchema,
  /** Closed dates on top of the calendar's own (holidays decided later, a room being repaired). */
  closedDates: z.array(isoDate).max(1000).optional(),
  room: RoomCapacitySchema,
  polishers: z.array(PolisherSchema).min(1).max(200),
  /** How many days ahead a start or a session is looked for before giving up; 3660 (ten years) when absent. */
  horizonDays: z.number().int().min(1).max(36_600).optional(),
});
export type PlanningContext = z.infer<typeof PlanningContextSchema>;

/** One session of a job still to plan: hands-on work, then a rest in calendar time. */
export const JobSessionSchema = z.object({
  label: z.string().max(200).optional(),
  handsOnMin: z.number().min(0),
  restMin: z.number().min(0),
  /** The polisher kept on this session (the same hand through the bodying, or on the whole job): no one else does it. */
  keep: id.optional(),
});
export type JobSession = z.infer<typeof JobSessionSchema>;

/** A job to plan, as it comes from an estimate's coat calendar. */
export const NewJobSchema = z.object({
  id,
  sessions: z.array(JobSessionSchema).min(1).max(500),
  /** Bays taken in the drying room when the room counts bays; 1 when absent. */
  bays: z.number().int().min(0).optional(),
  /** Rack area taken, m², when the room counts area (required then). */
  areaM2: z.number().min(0).optional(),
});
export type NewJob = z.infer<typeof NewJobSchema>;

/** A stretch of hands-on work, always inside one day's opening hours. */
export const SegmentSchema = z.object({ start: minute, end: minute });
export type PlanSegment = z.infer<typeof SegmentSchema>;

/** A session with its times and its polisher. */
export const PlannedSessionSchema = z.object({
  index: z.number().int().min(0),
  label: z.string().max(200).optional(),
  polisherId: id,
  /** Hands-on minutes as planned (at least 1, whole minutes). */
  handsOnMin: z.number().int().min(0),
  restMin: z.number().int().min(0),
  start: minute,
  end: minute,
  /** End of the rest that follows: the next session starts no earlier. */
  restUntil: minute,
  segments: z.array(SegmentSchema).min(1),
  /** The polisher was kept on this session: laying it again keeps them. */
  kept: z.boolean().optional(),
});
export type PlannedSession = z.infer<typeof PlannedSessionSchema>;

/** A job laid on the calendar: a plan from the engine, or a job already booked on the board. */
export const JobPlanSchema = z.object({
  id,
  sessions: z.array(PlannedSessionSchema).min(1),
  /** The piece is in the drying room over [start, end): first session's start to the final rest's end. */
  room: z.object({ start: minute, end: minute }),
  bays: z.number().int().min(0).optional(),
  areaM2: z.number().min(0).optional(),
});
export type JobPlan = z.infer<typeof JobPlanSchema>;
/** A job already on the board: same shape as a plan. */
export type BookedJob = JobPlan;

/** Why something cannot be planned. */
export type PlanProblemCode = 'session-too-long' | 'room-too-small' | 'no-room-need' | 'beyond-horizon' | 'bad-input';
export interface PlanProblem {
  code: PlanProblemCode;
  text: string;
}

/** The outcome of laying a job: the plan, or why it cannot be laid. */
export type PlanResult = { ok: true; plan: JobPlan } | { ok: false; problem: PlanProblem };

/** Why the job could not start on some days before the one found. */
export type WhyNotCode = 'closed-date' | 'non-working-day' | 'polishers-busy' | 'too-late-in-day' | 'room-full';
export interface WhyNot {
  /** First and last day of the run, 'YYYY-MM-DD' (the same when one day). */
  from: string;
  to: string;
  code: WhyNotCode;
  /** e.g. "2026-12-07 to 2026-12-10: drying room full (3 of 3 bays) until 2026-12-11 10:00". */
  text: string;
}

/** The earliest start found, with the reasons it could not be sooner. */
export type EarliestStart =
  | { ok: true; plan: JobPlan; whyNotSooner: WhyNot[] }
  | { ok: false; problem: PlanProblem; whyNotSooner: WhyNot[] };

/** A day the drying room would hold more than it can. */
export interface RoomOverbooking {
  day: number;
  date: string;
  /** Peak use that day, this job included (bays or m²). */
  peak: number;
  capacity: number;
  over: number;
}

/** A day a polisher would work more than their hours, or two things at once. */
export interface PolisherOverbooking {
  day: number;
  date: string;
  polisherId: string;
  usedMin: number;
  availableMin: number;
  /** Minutes beyond the day's hours (0 when within them). */
  overMin: number;
  /** Minutes during which this polisher would be on two sessions at once. */
  clashMin: number;
}

/** Overbooking caused (or met) by a forced or shifted job. */
export interface Overbooking {
  room: RoomOverbooking[];
  polishers: PolisherOverbooking[];
}

/** A job laid at a forced date, with the overbooking it causes. */
export type ForcedBooking = { ok: true; plan: JobPlan; overbooking: Overbooking } | { ok: false; problem: PlanProblem };

/** One polisher's day on the board. */
export interface PolisherDay {
  polisherId: string;
  usedMin: number;
  availableMin: number;
  over: boolean;
}

/** One day of the board: drying room and polishers. */
export interface DayOccupancy {
  day: number;
  date: string;
  open: boolean;
  room: { peak: number; capacity: number; unit: 'bays' | 'm²'; over: boolean };
  polishers: PolisherDay[];
  overbooked: boolean;
}

/** A day given as a day number or as 'YYYY-MM-DD'. */
export type DayRef = number | string;
