/**
 * Workshop planning: jobs made from accepted quotes, their bookings in the drying room and the polishers' week,
 * progress with actual hours, the actuals-against-estimates report and the material forecast.
 *
 * Times on the board are local and carry no time zone ("2026-12-07T08:00"), as in the coat calendar.
 */
import { z } from 'zod';
import { MaterialsUsedSchema } from './stock';
import type { AgreedFigures } from './quotes';
import { DATE_RULES, dateOrDateTimeSchema, dateSchema, localDateTimeSchema } from './dates';
import type { DayOccupancy, PolisherOverbooking, RoomOverbooking, WhyNot } from '../calc/planning/types';
import type { PackCount } from '../calc/packs';
import type { StageKind } from './catalog';
import { IdSchema } from './customers';

/**
 * unbooked: a job made from an accepted quote, not yet on the board; booked: on the board, nothing done yet;
 * in-progress: at least one session done; finished: every session done; cancelled: off the board.
 */
export const JOB_STATES = ['unbooked', 'booked', 'in-progress', 'finished', 'cancelled'] as const;
export type JobState = (typeof JOB_STATES)[number];
export const JOB_STATE_LABELS: Record<JobState, string> = {
  unbooked: 'Not booked',
  booked: 'Booked',
  'in-progress': 'In progress',
  finished: 'Finished',
  cancelled: 'Cancelled',
};
/** States whose sessions take places on the board. */
export const ACTIVE_JOB_STATES: readonly JobState[] = ['booked', 'in-progress'];

/** Stage kinds in words, for reports. */
export const STAGE_KIND_LABELS: Record<StageKind, string> = {
  strip: 'Stripping',
  prepare: 'Preparing',
  stain: 'Staining',
  'grain-fill': 'Grain filling',
  fad: 'Fadding',
  body: 'Bodying',
  stiffen: 'Stiffening',
  'spirit-off': 'Spiriting off',
  'cut-back': 'Cutting back',
  burnish: 'Burnishing',
  wax: 'Waxing',
};

/** A job's session kinds: the finishing stages, and extra work the customer took with the quote. */
export type JobStageKind = StageKind | 'extra';

// Who may plan the room and who may record progress: `planRoom` and `recordProgress` in shared/roles.ts.

const isoDate = dateSchema({ ...DATE_RULES.planning, example: '2026-12-07' });
const localDateTime = localDateTimeSchema({ ...DATE_RULES.planning, example: '2026-12-07' });
const dateOrDateTime = dateOrDateTimeSchema({ ...DATE_RULES.planning, example: '2026-12-07' });

/** A job from an accepted quote: the quoted revision's sessions and rests. */
export const CreateJobSchema = z
  .object({
    quoteId: IdSchema,
    /** The chosen line (piece) of a quote of several pieces; the first chosen line not yet a job when left out. */
    quoteLineId: IdSchema.optional(),
    /** Bays taken when the room counts bays; 1 when left out. */
    bays: z.number({ message: 'must be a whole number of bays' }).int().min(1).max(50).optional(),
    /** Rack area taken, m², when the room counts area; the piece's largest face when left out. */
    areaM2: z.number({ message: 'must be an area in m²' }).min(0.01).max(200).optional(),
    notes: z.string().trim().max(2000).optional(),
  })
  .strict();
export type CreateJobInput = z.input<typeof CreateJobSchema>;
export type CreateJobData = z.output<typeof CreateJobSchema>;

export const UpdateJobSchema = z
  .object({
    bays: z.number({ message: 'must be a whole number of bays' }).int().min(1).max(50).optional(),
    areaM2: z.number({ message: 'must be an area in m²' }).min(0.01).max(200).optional(),
    notes: z.string().trim().max(2000).optional(),
  })
  .strict();
export type UpdateJobInput = z.input<typeof UpdateJobSchema>;

export const JobListQuerySchema = z.object({ state: z.enum([...JOB_STATES, 'active', 'all']).default('all') });

/** Book at the earliest start (from `notBefore`, today when left out) or at a chosen start. */
export const BookingSchema = z
  .object({
    mode: z.enum(['earliest', 'date'], { message: 'must be "earliest" or "date"' }),
    notBefore: isoDate.optional(),
    start: dateOrDateTime.optional(),
    /** A chosen start that overbooks the room or a polisher is refused unless confirmed. */
    confirm: z.boolean().default(false),
    /** Lay the sessions a polisher is kept on with whoever is free (the planner overrides the kept hand). */
    overrideKeep: z.boolean().optional(),
  })
  .strict()
  .superRefine((b, ctx) => {
    if (b.mode === 'date' && !b.start) ctx.addIssue({ code: 'custom', path: ['start'], message: 'give the date to book at' });
  });
export type BookingInput = z.input<typeof BookingSchema>;
export type BookingData = z.output<typeof BookingSchema>;

/** A session marked done: when it finished, the hands-on hours it took, the day's climate and notes. */
export const SessionDoneSchema = z
  .object({
    actualEnd: localDateTime,
    actualHours: z.number({ message: 'must be a number of hours' }).min(0).max(100),
    temperatureC: z.number({ message: 'must be degrees Celsius' }).min(-10).max(50),
    humidityPct: z.number({ message: 'must be a percentage' }).min(0).max(100),
    notes: z.string({ message: 'is required' }).trim().min(1, { message: 'is required: say how the session went' }).max(2000),
    /** What went on, as the polisher writes it. */
    materialsUsed: z.string({ message: 'must be text' }).trim().max(1000, { message: 'must be at most 1000 characters' }).optional(),
    /** A problem met in the session (blush, a cut-through edge); empty when none. */
    problem: z.string({ message: 'must be text' }).trim().max(2000, { message: 'must be at most 2000 characters' }).optional(),
    /** The materials used, in packs (prefilled from the estimate); each takes its quantity off stock on hand. */
    materials: MaterialsUsedSchema.optional(),
  })
  .strict();
export type SessionDoneInput = z.input<typeof SessionDoneSchema>;

export const PolisherInputSchema = z
  .object({
    name: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(120),
    hoursPerDay: z.number({ message: 'must be a number of hours' }).min(0.5).max(12),
    daysOff: z.array(isoDate).max(400).default([]),
    active: z.boolean().default(true),
  })
  .strict();
export type PolisherInput = z.input<typeof PolisherInputSchema>;
export const UpdatePolisherSchema = z
  .object({
    name: z.string().trim().min(1, { message: 'is required' }).max(120).optional(),
    hoursPerDay: z.number({ message: 'must be a number of hours' }).min(0.5).max(12).optional(),
    daysOff: z.array(isoDate).max(400).optional(),
    active: z.boolean().optional(),
  })
  .strict();
export type UpdatePolisherInput = z.input<typeof UpdatePolisherSchema>;

export const BoardQuerySchema = z.object({
  from: isoDate.optional(),
  weeks: z.coerce.number().int().min(1).max(26).default(8),
});
export const ForecastQuerySchema = z.object({ weeks: z.coerce.number().int().min(1).max(26).default(4) });

export const StockSchema = z.object({ quantity: z.number({ message: 'must be a quantity' }).min(0).max(1_000_000_000) }).strict();

export const ApplyActualsSchema = z
  .object({
    items: z
      .array(z.object({ systemId: IdSchema, stageKey: z.string().min(1).max(64) }).strict())
      .min(1, { message: 'choose at least one correction' })
      .max(400),
  })
  .strict();
export type ApplyActualsInput = z.input<typeof ApplyActualsSchema>;
export type ApplyActualsData = z.output<typeof ApplyActualsSchema>;

// ------------------------------------------------------------------------------------------------ answers

export interface PolisherDto {
  id: number;
  name: string;
  hoursPerDay: number;
  daysOff: string[];
  active: boolean;
}

export interface Ref {
  id: number;
  name: string;
}

export interface JobSessionDto {
  id: number;
  index: number;
  stage: string;
  stageKind: JobStageKind;
  stageName: string;
  /** Session number within its stage, and how many the stage has. */
  session: number;
  ofSessions: number;
  label: string;
  handsOnHours: number;
  restHours: number;
  /** The current plan (moves when an earlier session slips); null until booked. */
  start: string | null;
  end: string | null;
  restUntil: string | null;
  segments: { start: string; end: string }[];
  /** As first booked, for planned against actual. */
  baselineStart: string | null;
  baselineEnd: string | null;
  polisher: Ref | null;
  done: boolean;
  actualEnd: string | null;
  actualHours: number | null;
  temperatureC: number | null;
  humidityPct: number | null;
  notes: string | null;
  materialsUsed: string | null;
  problem: string | null;
  doneBy: Ref | null;
  doneAt: string | null;
}

export interface JobSummary {
  id: number;
  number: string;
  title: string;
  state: JobState;
  customer: Ref;
  estimate: { id: number; number: string; revision: number };
  quote: { id: number; number: string };
  bays: number;
  areaM2: number;
  roomStart: string | null;
  roomEnd: string | null;
  /** Booked at a chosen date that overbooked the room or a polisher. */
  forced: boolean;
  sessionsDone: number;
  sessionsTotal: number;
  estimatedHours: number;
  actualHours: number;
  /** Where the piece is, and when it is collected and goes home (shared/schemas/job-end.ts). */
  custody: 'awaiting-collection' | 'in-workshop' | 'ready' | 'returned';
  collectionDate: string | null;
  returnDate: string | null;
  /** The polisher kept on the job or its bodying, when one is. */
  keptPolisherId: number | null;
  keepScope: 'job' | 'bodying' | null;
}

export interface OverbookingDto {
  room: RoomOverbooking[];
  polishers: (PolisherOverbooking & { polisherName: string })[];
}

export interface StagePlanVsActual {
  stage: string;
  stageKind: JobStageKind;
  name: string;
  sessions: number;
  sessionsDone: number;
  estimatedHours: number;
  /** Hours of the sessions done so far. */
  actualHours: number;
  /** Estimated hours of the same sessions done, to compare like with like. */
  estimatedDoneHours: number;
  plannedStart: string | null;
  plannedEnd: string | null;
  currentEnd: string | null;
  actualEnd: string | null;
}

export interface JobDetail extends JobSummary {
  notes: string;
  roomUnit: 'bays' | 'm²';
  whyNotSooner: WhyNot[];
  /** What the booking overbooked when it was made (or a slip since). */
  overbooking: OverbookingDto | null;
  bookedAt: string | null;
  bookedBy: Ref | null;
  startMode: 'earliest' | 'date' | null;
  stages: StagePlanVsActual[];
  sessions: JobSessionDto[];
  /**
   * What the customer agreed to: the quote's total with the extras taken plus the variations approved since, the
   * deposit, and the balance due on collection (the total less the deposit).
   */
  agreed: (AgreedFigures & { currency: string }) | null;
}

export interface PlannedSessionDto {
  index: number;
  label: string;
  start: string;
  end: string;
  restUntil: string;
  polisher: Ref | null;
}

export interface BookingPreview {
  mode: 'earliest' | 'date';
  jobId: number;
  start: string;
  end: string;
  roomStart: string;
  roomEnd: string;
  sessions: PlannedSessionDto[];
  whyNotSooner: WhyNot[];
  overbooking: OverbookingDto;
  overbooked: boolean;
}

export interface SessionDoneResult {
  job: JobDetail;
  /** Set when the session finished later than planned and the sessions after it moved. */
  shift: { slipMin: number; moved: number; roomEnd: string | null; overbooking: OverbookingDto } | null;
}

export interface ReadyQuote {
  quoteId: number;
  /** The chosen line (piece) this job would be made from. */
  quoteLineId: number;
  quoteNumber: string;
  estimateId: number;
  estimateNumber: string;
  title: string;
  customer: Ref;
  acceptedAt: string | null;
  labourHours: number;
  sessions: number;
  calendarDays: number;
}

export interface ReadyToBook {
  quotes: ReadyQuote[];
  jobs: JobSummary[];
}

export interface BoardSession {
  id: number;
  index: number;
  label: string;
  stageName: string;
  stageKind: JobStageKind;
  start: string;
  end: string;
  restUntil: string;
  segments: { start: string; end: string }[];
  polisherId: number | null;
  done: boolean;
}

export interface BoardJob extends JobSummary {
  sessions: BoardSession[];
}

export interface DueSession {
  day: 'today' | 'tomorrow';
  jobId: number;
  jobNumber: string;
  title: string;
  sessionId: number;
  label: string;
  start: string;
  end: string;
  handsOnHours: number;
  polisher: Ref | null;
  /** Earlier sessions of the job are all done: this one may be marked done now. */
  next: boolean;
}

export interface PlanningBoard {
  from: string;
  to: string;
  today: string;
  now: string;
  room: { mode: 'bays' | 'area'; capacity: number; unit: 'bays' | 'm²'; temperatureC: number; humidityPct: number };
  polishers: PolisherDto[];
  days: DayOccupancy[];
  jobs: BoardJob[];
  due: DueSession[];
}

export interface ActualsKindRow {
  kind: StageKind;
  estimatedHours: number;
  actualHours: number;
  /** actual ÷ estimated; null with no estimated hours. */
  ratio: number | null;
  jobs: number;
  sessions: number;
}

export interface ActualsSuggestion {
  systemId: number;
  systemName: string;
  stageKey: string;
  stageName: string;
  kind: StageKind;
  /** Labour minutes per m² per coat now, and as suggested. */
  current: number;
  suggested: number;
  /** Actual ÷ estimated hours of this stage kind on the system's own finished jobs (not yet used to correct it). */
  ratio: number;
  estimatedHours: number;
  actualHours: number;
  jobs: number;
  /** The finished jobs it rests on (those not yet used to correct this stage). */
  jobIds: number[];
}

export interface ActualsReport {
  /** finishedOn: the last session's actual end, local. */
  finishedJobs: { id: number; number: string; title: string; finishedOn: string | null; estimatedHours: number; actualHours: number }[];
  kinds: ActualsKindRow[];
  suggestions: ActualsSuggestion[];
}

export interface ApplyActualsResult {
  applied: { systemId: number; stageKey: string; before: number; after: number }[];
}

export interface StockRow {
  materialId: number;
  key: string;
  name: string;
  kind: string;
  unit: string;
  quantity: number;
  updatedAt: string | null;
}

export interface ForecastRow {
  materialId: number | null;
  key: string;
  name: string;
  unit: string;
  need: number;
  stock: number;
  /** What the stock does not cover. */
  short: number;
  packs: PackCount[];
  cost: string;
  /** Need per week of the window, in the material's unit. */
  byWeek: number[];
  /** Not in today's price list: no packs to suggest. */
  unpriced: boolean;
}

export interface MaterialForecast {
  from: string;
  to: string;
  weeks: number;
  currency: string;
  rows: ForecastRow[];
  jobs: { id: number; number: string; title: string; sessions: number; materials: Record<string, number> }[];
  total: string;
}
