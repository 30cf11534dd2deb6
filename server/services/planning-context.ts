/**
 * What every planning call reads: the workshop's calendar and drying room, the active polishers, and the jobs
 * already on the board in the engine's shape (shared/calc/planning). Also the board lock that serialises every
 * write that takes or frees places, so that two bookings never both take the last bay.
 */
import { BODYING_KINDS } from '@shared/schemas/job-end';
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { fromMinutes, toMinutes } from '@shared/calc';
import type { BookedJob, JobPlan, NewJob, Overbooking, PlanningContext, RoomCapacity } from '@shared/calc/planning';
import type { OverbookingDto } from '@shared/schemas/planning';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { problems } from '../http/problem';
import { Job, JobSession, Polisher } from '../models';
import { loadSettings } from './catalog';

/** Key of the transaction-level advisory lock that every board write takes first. */
const BOARD_LOCK = 7_270_001;

/** Takes the board lock for the rest of the transaction: bookings, moves, cancellations and slips run one at a time. */
export async function lockBoard(transaction: Transaction): Promise<void> {
  await Job.sequelize!.query('SELECT pg_advisory_xact_lock(:key)', { replacements: { key: BOARD_LOCK }, transaction });
}

/**
 * The workshop's wall clock as "YYYY-MM-DDTHH:MM" (board times carry no time zone), and calendar arithmetic: both
 * from the one time module, in the workshop's zone as the settings last read it.
 */
export { addDays, nowLocal as localNow } from '@shared/time';

export interface Planning {
  ctx: PlanningContext;
  settings: WorkshopSettings;
  /** Every polisher, active or not, for names. */
  names: Map<string, string>;
  polishers: Polisher[];
}

export function roomOf(settings: WorkshopSettings): RoomCapacity {
  const room = settings.dryingRoom;
  return room.mode === 'bays' ? { mode: 'bays', bays: room.bays } : { mode: 'area', areaM2: room.rackAreaM2 };
}

/** The planning context; `needPolishers` refuses with 409 when nobody is there to do the sessions. */
export async function loadPlanning(transaction: Transaction | undefined, needPolishers: boolean): Promise<Planning> {
  const { settings } = await loadSettings(transaction);
  const all = await Polisher.findAll({ order: [['id', 'ASC']], transaction });
  const polishers = all.filter((p) => p.active);
  if (needPolishers && polishers.length === 0) {
    throw problems.conflict('no_polishers', 'There is no active polisher: add one under Polishers before booking, so that someone can do the sessions.');
  }
  return {
    settings,
    polishers,
    names: new Map(all.map((p) => [String(p.id), p.name])),
    ctx: {
      calendar: settings.calendar,
      room: roomOf(settings),
      polishers: polishers.map((p) => ({ id: String(p.id), name: p.name, hoursPerDay: Number(p.hoursPerDay), daysOff: p.daysOff })),
      // Three years ahead is far enough for any workshop's book; it keeps a search of a full board quick.
      horizonDays: 1100,
    },
  };
}

const NO_POLISHER = 'none';

/** A job on the board in the engine's shape. */
export function toBooked(job: Job, sessions: readonly JobSession[]): BookedJob {
  return {
    id: String(job.id),
    sessions: sessions.map((s) => ({
      index: s.idx,
      label: s.stageName,
      polisherId: s.polisherId === null ? NO_POLISHER : String(s.polisherId),
      handsOnMin: s.handsOnMin,
      restMin: s.restMin,
      start: toMinutes(s.plannedStart!),
      end: toMinutes(s.plannedEnd!),
      restUntil: toMinutes(s.restUntil!),
      segments: s.segments.map((g) => ({ start: toMinutes(g.start), end: toMinutes(g.end) })),
      // A session the kept hand holds stays theirs when the rest of the job is laid again (a planner's override stands).
      ...(keptPolisherOf(job, s) !== null && s.polisherId === keptPolisherOf(job, s) ? { kept: true } : {}),
    })),
    room: { start: toMinutes(job.roomStart!), end: toMinutes(job.roomEnd!) },
    bays: job.bays,
    areaM2: Number(job.areaM2),
  };
}

/** A job still to lay, from its sessions. */
/**
 * The polisher kept on a session: the job's kept hand on every session (scope "job"), or on the bodying sessions
 * (first bodying to spiriting off, scope "bodying"); null when no one is kept on it.
 */
export function keptPolisherOf(job: Pick<Job, 'keptPolisherId' | 'keepScope'>, s: Pick<JobSession, 'stageKind'>): number | null {
  if (job.keptPolisherId === null || job.keptPolisherId === undefined || !job.keepScope) return null;
  if (job.keepScope === 'job') return job.keptPolisherId;
  return (BODYING_KINDS as readonly string[]).includes(s.stageKind) ? job.keptPolisherId : null;
}

/** A job to lay; `overrideKeep` lets the engine choose any polisher for the kept sessions (the planner's override). */
export function toNewJob(job: Job, sessions: readonly JobSession[], opts: { overrideKeep?: boolean } = {}): NewJob {
  return {
    id: String(job.id),
    sessions: sessions.map((s) => {
      const kept = opts.overrideKeep ? null : keptPolisherOf(job, s);
      return { label: s.stageName, handsOnMin: s.handsOnMin, restMin: s.restMin, ...(kept === null ? {} : { keep: String(kept) }) };
    }),
    bays: job.bays,
    areaM2: Number(job.areaM2),
  };
}

/**
 * Jobs whose places count on the board: booked and in progress, and finished ones whose piece may still be resting
 * in the room.
 */
export function boardWhere(today: string): WhereOptions<Job> {
  return {
    [Op.or]: [{ state: { [Op.in]: ['booked', 'in-progress'] } }, { state: 'finished', roomEnd: { [Op.gte]: today } }],
  } as WhereOptions<Job>;
}

export interface BoardJobs {
  jobs: Job[];
  sessions: Map<number, JobSession[]>;
  booked: BookedJob[];
}

/** The jobs on the board with their sessions, and the same in the engine's shape. */
export async function loadBoardJobs(today: string, transaction?: Transaction): Promise<BoardJobs> {
  const jobs = await Job.findAll({ where: boardWhere(today), order: [['roomStart', 'ASC'], ['id', 'ASC']], transaction });
  const rows = jobs.length ? await JobSession.findAll({ where: { jobId: jobs.map((j) => j.id) }, order: [['jobId', 'ASC'], ['idx', 'ASC']], transaction }) : [];
  const sessions = new Map<number, JobSession[]>();
  for (const s of rows) sessions.set(s.jobId, [...(sessions.get(s.jobId) ?? []), s]);
  const placed = jobs.filter((j) => j.roomStart && j.roomEnd && (sessions.get(j.id) ?? []).every((s) => s.plannedStart));
  return { jobs: placed, sessions, booked: placed.map((j) => toBooked(j, sessions.get(j.id) ?? [])) };
}

/** Writes a plan's times and polishers onto the sessions; `baseline` also keeps them as the plan to compare with. */
export async function writePlan(sessions: readonly JobSession[], plan: JobPlan, baseline: boolean, transaction: Transaction): Promise<number> {
  let moved = 0;
  for (const p of plan.sessions) {
    const s = sessions[p.index];
    if (!s) continue;
    const start = fromMinutes(p.start);
    if (!s.done && s.plannedStart !== start) moved++;
    s.set({
      plannedStart: start,
      plannedEnd: fromMinutes(p.end),
      restUntil: fromMinutes(p.restUntil),
      segments: p.segments.map((g) => ({ start: fromMinutes(g.start), end: fromMinutes(g.end) })),
      polisherId: p.polisherId === NO_POLISHER ? null : Number(p.polisherId),
      ...(baseline ? { baselineStart: start, baselineEnd: fromMinutes(p.end) } : {}),
    });
    s.changed('segments', true);
    await s.save({ transaction });
  }
  return moved;
}

/** The engine's overbooking with the polishers' names. */
export function overbookingDto(o: Overbooking, names: ReadonlyMap<string, string>): OverbookingDto {
  return { room: o.room, polishers: o.polishers.map((p) => ({ ...p, polisherName: names.get(p.polisherId) ?? 'former polisher' })) };
}

export function isOverbooked(o: Overbooking | OverbookingDto | null): boolean {
  return !!o && (o.room.length > 0 || o.polishers.length > 0);
}

/** One line per overbooked day, in words. */
export function describeOverbooking(o: OverbookingDto, unit: 'bays' | 'm²'): string[] {
  const lines = o.room.map((r) => `${r.date}: drying room ${round(r.peak)} of ${round(r.capacity)} ${unit} (${round(r.over)} ${unit} over)`);
  for (const p of o.polishers) {
    const parts = [];
    if (p.overMin > 0) parts.push(`${hours(p.usedMin)} of ${hours(p.availableMin)} (${hours(p.overMin)} over)`);
    if (p.clashMin > 0) parts.push(`two sessions at once for ${hours(p.clashMin)}`);
    lines.push(`${p.date}: ${p.polisherName} ${parts.join(', ')}`);
  }
  return lines;
}

function round(n: number): number {
  return Math.round(n * 100) / 100;
}

function hours(min: number): string {
  return `${round(min / 60)} h`;
}
