/** Booking a job: laying it with the planning engine at the earliest start or a chosen date, the overbooking shown first and forced only on confirmation, all under the board lock. */
import { type Sequelize } from 'sequelize';
import { CalendarError, fromMinutes, toMinutes } from '@shared/calc';
import { bookAt, findEarliestStart, PlanningError, type JobPlan, type WhyNot } from '@shared/calc/planning';
import { type BookingData, type BookingPreview, type JobDetail, type OverbookingDto } from '@shared/schemas/planning';
import { HttpProblem, problems } from '../../http/problem';
import { Job, type JobSession } from '../../models';
import { audit } from '../audit';
import { messageOnBooking } from '../messages';
import {
  describeOverbooking,
  isOverbooked,
  loadBoardJobs,
  loadPlanning,
  localNow,
  lockBoard,
  overbookingDto,
  type toBooked,
  toNewJob,
  writePlan,
  type Planning,
} from '../planning-context';
import { sessionsOf } from './mapping';
import { getJob } from './read';

interface Laid {
  plan: JobPlan;
  whyNotSooner: WhyNot[];
  overbooking: OverbookingDto;
}

function bookable(job: Job): void {
  if (job.state === 'unbooked' || job.state === 'booked') return;
  const why: Record<string, string> = {
    'in-progress': 'has sessions done: its remaining sessions move by themselves when one slips',
    finished: 'is finished',
    cancelled: 'is cancelled: make a new job from the quote to book it again',
  };
  throw problems.conflict('job_not_bookable', `Job ${job.number} ${why[job.state] ?? `is ${job.state}`}.`);
}

/** Lays the job with the engine against the other jobs on the board. Nothing is written. */
function lay(job: Job, sessions: readonly JobSession[], input: BookingData, planning: Planning, booked: ReturnType<typeof toBooked>[], opts: { now: string; allowPast: boolean }): Laid {
  const newJob = toNewJob(job, sessions, { overrideKeep: input.overrideKeep });
  const nowMin = toMinutes(opts.now);
  try {
    if (input.mode === 'earliest') {
      const notBefore = Math.max(nowMin, input.notBefore ? toMinutes(input.notBefore) : nowMin);
      const r = findEarliestStart(newJob, booked, planning.ctx, { notBefore });
      if (!r.ok) throw cannotPlan(r.problem);
      return { plan: r.plan, whyNotSooner: r.whyNotSooner, overbooking: { room: [], polishers: [] } };
    }
    const start = toMinutes(input.start!);
    if (!opts.allowPast && start < toMinutes(opts.now.slice(0, 10))) throw problems.badRequest('start_in_past', 'start: must be today or later', 'start');
    const r = bookAt(newJob, Math.max(start, opts.allowPast ? start : nowMin), booked, planning.ctx);
    if (!r.ok) throw cannotPlan(r.problem);
    return { plan: r.plan, whyNotSooner: [], overbooking: overbookingDto(r.overbooking, planning.names) };
  } catch (err) {
    if (err instanceof PlanningError || err instanceof CalendarError) throw problems.conflict('cannot_plan', err.message);
    throw err;
  }
}

/** The engine's reason a job cannot be laid, with what the planner can do about it. */
export function cannotPlan(problem: { code: string; text: string }): HttpProblem {
  const hint: Record<string, string> = {
    'session-too-long': ': give a polisher more hours a day under Polishers, or spread the stage over more sessions in the estimate.',
    'room-too-small': ': the drying room (Settings) is smaller than what the job takes; change the bays or area the job needs.',
    'beyond-horizon': ': nothing fits within three years; look for closed dates or polishers away.',
  };
  return problems.conflict('cannot_plan', `${problem.text}${hint[problem.code] ?? '.'}`);
}

function previewDto(job: Job, laid: Laid, mode: 'earliest' | 'date', planning: Planning): BookingPreview {
  const first = laid.plan.sessions[0]!;
  const last = laid.plan.sessions[laid.plan.sessions.length - 1]!;
  return {
    mode,
    jobId: job.id,
    start: fromMinutes(first.start),
    end: fromMinutes(last.end),
    roomStart: fromMinutes(laid.plan.room.start),
    roomEnd: fromMinutes(laid.plan.room.end),
    sessions: laid.plan.sessions.map((s) => ({
      index: s.index,
      label: s.label ?? `Session ${s.index + 1}`,
      start: fromMinutes(s.start),
      end: fromMinutes(s.end),
      restUntil: fromMinutes(s.restUntil),
      polisher: planning.names.has(s.polisherId) ? { id: Number(s.polisherId), name: planning.names.get(s.polisherId)! } : null,
    })),
    whyNotSooner: laid.whyNotSooner,
    overbooking: laid.overbooking,
    overbooked: isOverbooked(laid.overbooking),
  };
}

/** What booking would do, without booking: the start found or forced, why not sooner, and what it overbooks. */
export async function previewBooking(id: number, input: BookingData): Promise<BookingPreview> {
  const job = await Job.findByPk(id);
  if (!job) throw problems.notFound('Job');
  bookable(job);
  const now = localNow();
  const planning = await loadPlanning(undefined, true);
  const { booked } = await loadBoardJobs(now.slice(0, 10));
  const laid = lay(job, await sessionsOf(id), input, planning, booked, { now, allowPast: false });
  return previewDto(job, laid, input.mode, planning);
}

/**
 * Books (or moves) a job. Under the board lock the board is read again and the job laid again, so a booking made
 * meanwhile by someone else is respected: the earliest start may come out later than the preview showed, and a
 * chosen date that now overbooks is refused unless confirmed.
 */
export async function bookJob(sequelize: Sequelize, actorId: number, id: number, input: BookingData, opts: { now?: string; allowPast?: boolean } = {}): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    await lockBoard(transaction);
    const job = await Job.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!job) throw problems.notFound('Job');
    bookable(job);
    const now = opts.now ?? localNow();
    const planning = await loadPlanning(transaction, true);
    const { booked } = await loadBoardJobs(now.slice(0, 10), transaction);
    const sessions = await sessionsOf(id, transaction);
    const laid = lay(job, sessions, input, planning, booked, { now, allowPast: opts.allowPast ?? false });
    const overbooked = isOverbooked(laid.overbooking);
    const unit = planning.settings.dryingRoom.mode === 'bays' ? 'bays' : 'm²';
    if (overbooked && !input.confirm) {
      const lines = describeOverbooking(laid.overbooking, unit);
      throw new HttpProblem(
        409,
        'overbooking_unconfirmed',
        'Overbooks the board',
        `Booking ${job.number} from ${input.start} overbooks ${lines.length} day${lines.length === 1 ? '' : 's'}: ${lines.slice(0, 3).join('; ')}${lines.length > 3 ? '; …' : ''}. Look at the consequences, then confirm to force it.`,
        { field: 'confirm' },
      );
    }
    await writePlan(sessions, laid.plan, true, transaction);
    const before = { state: job.state, roomStart: job.roomStart, roomEnd: job.roomEnd };
    await job.update(
      {
        state: 'booked',
        roomStart: fromMinutes(laid.plan.room.start),
        roomEnd: fromMinutes(laid.plan.room.end),
        startMode: input.mode,
        forced: overbooked,
        overbooking: overbooked ? laid.overbooking : null,
        whyNotSooner: laid.whyNotSooner,
        bookedAt: new Date(),
        bookedBy: actorId,
      },
      { transaction },
    );
    await audit(
      {
        userId: actorId,
        action: before.state === 'booked' ? 'job.move' : 'job.book',
        entityType: 'job',
        entityId: id,
        before,
        after: { state: 'booked', roomStart: job.roomStart, roomEnd: job.roomEnd, mode: input.mode, forced: overbooked, keptOverridden: Boolean(input.overrideKeep) && job.keptPolisherId !== null, overbooked: overbooked ? describeOverbooking(laid.overbooking, unit) : [] },
      },
      transaction,
    );
    // The customer hears the dates (or the new dates) through the queue once this commits.
    await messageOnBooking(sequelize, job, before, actorId, transaction);
  });
  return getJob(id);
}
