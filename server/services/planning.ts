/**
 * Jobs and the board: a job from an accepted quote takes the quoted revision's sessions and rests; booking lays it
 * with the planning engine at the earliest start or at a chosen date (with the overbooking shown first and forced
 * only on confirmation); progress marks sessions done with actual hours, and a slip moves the rest of the job.
 * Every write that takes or frees places runs in one transaction under the board lock, and re-checks there.
 */
import { mondayOf } from '@shared/time';
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { CalendarError, fromMinutes, toMinutes } from '@shared/calc';
import { bookAt, findEarliestStart, occupancy, PlanningError, shiftRemaining, type JobPlan, type WhyNot } from '@shared/calc/planning';
import type { EstimateResult } from '@shared/schemas/calc';
import type { Catalog } from '@shared/schemas/catalog';
import {
  ACTIVE_JOB_STATES,
  type BoardJob,
  type BookingData,
  type BookingPreview,
  type CreateJobData,
  type DueSession,
  type JobDetail,
  type JobSessionDto,
  type JobState,
  type JobSummary,
  type OverbookingDto,
  type PlanningBoard,
  type ReadyToBook,
  type SessionDoneInput,
  type SessionDoneResult,
  type StagePlanVsActual,
  type UpdateJobInput,
} from '@shared/schemas/planning';
import { HttpProblem, problems } from '../http/problem';
import { Customer, Estimate, EstimateRevision, Job, JobSession, Polisher, Quote, QuoteLine, User } from '../models';
import type { JobStage } from '../models/planning';
import { audit } from './audit';
import { agreedOf } from './quotes';
import {
  addDays,
  describeOverbooking,
  isOverbooked,
  loadBoardJobs,
  loadPlanning,
  localNow,
  lockBoard,
  overbookingDto,
  toBooked,
  toNewJob,
  writePlan,
  type Planning,
} from './planning-context';

const ACCEPTED = ['accepted', 'deposit-paid'];
const round = (n: number, places = 2) => Math.round(n * 10 ** places) / 10 ** places;
const num = (v: string | number | null) => (v === null ? null : Number(v));

// ------------------------------------------------------------------------------------------------- DTOs

interface Related {
  customers: Map<number, Customer>;
  estimates: Map<number, Estimate>;
  quotes: Map<number, Quote>;
  revisions: Map<number, number>;
}

async function related(jobs: readonly Job[], transaction?: Transaction): Promise<Related> {
  const [customers, estimates, quotes, revisions] = await Promise.all([
    Customer.findAll({ where: { id: jobs.map((j) => j.customerId) }, attributes: ['id', 'name'], transaction }),
    Estimate.findAll({ where: { id: jobs.map((j) => j.estimateId) }, attributes: ['id', 'number'], transaction }),
    Quote.findAll({ where: { id: jobs.map((j) => j.quoteId) }, attributes: ['id', 'number'], transaction }),
    EstimateRevision.findAll({ where: { id: jobs.map((j) => j.revisionId) }, attributes: ['id', 'number'], transaction }),
  ]);
  return {
    customers: new Map(customers.map((c) => [c.id, c])),
    estimates: new Map(estimates.map((e) => [e.id, e])),
    quotes: new Map(quotes.map((q) => [q.id, q])),
    revisions: new Map(revisions.map((r) => [r.id, r.number])),
  };
}

function summaryDto(job: Job, sessions: readonly JobSession[], rel: Related): JobSummary {
  const done = sessions.filter((s) => s.done);
  return {
    id: job.id,
    number: job.number,
    title: job.title,
    state: job.state,
    customer: { id: job.customerId, name: rel.customers.get(job.customerId)?.name ?? '' },
    estimate: { id: job.estimateId, number: rel.estimates.get(job.estimateId)?.number ?? '', revision: rel.revisions.get(job.revisionId) ?? 0 },
    quote: { id: job.quoteId, number: rel.quotes.get(job.quoteId)?.number ?? '' },
    bays: job.bays,
    areaM2: Number(job.areaM2),
    roomStart: job.roomStart,
    roomEnd: job.roomEnd,
    forced: job.forced,
    sessionsDone: done.length,
    sessionsTotal: sessions.length,
    estimatedHours: round(sessions.reduce((t, s) => t + Number(s.estimatedHours), 0)),
    actualHours: round(done.reduce((t, s) => t + Number(s.actualHours ?? 0), 0)),
  };
}

function sessionDto(s: JobSession, polishers: ReadonlyMap<number, string>, users: ReadonlyMap<number, string>): JobSessionDto {
  return {
    id: s.id,
    index: s.idx,
    stage: s.stage,
    stageKind: s.stageKind,
    stageName: s.stageName,
    session: s.session,
    ofSessions: s.ofSessions,
    label: sessionLabel(s),
    handsOnHours: round(s.handsOnMin / 60),
    restHours: round(s.restMin / 60),
    start: s.plannedStart,
    end: s.plannedEnd,
    restUntil: s.restUntil,
    segments: s.segments,
    baselineStart: s.baselineStart,
    baselineEnd: s.baselineEnd,
    polisher: s.polisherId === null ? null : { id: s.polisherId, name: polishers.get(s.polisherId) ?? 'former polisher' },
    done: s.done,
    actualEnd: s.actualEnd,
    actualHours: num(s.actualHours),
    temperatureC: num(s.temperatureC),
    humidityPct: num(s.humidityPct),
    notes: s.notes,
    materialsUsed: s.materialsUsed ?? null,
    problem: s.problem ?? null,
    doneBy: s.doneBy === null ? null : { id: s.doneBy, name: users.get(s.doneBy) ?? 'former user' },
    doneAt: s.doneAt?.toISOString() ?? null,
  };
}

function sessionLabel(s: Pick<JobSession, 'stageName' | 'session' | 'ofSessions'>): string {
  return s.ofSessions > 1 ? `${s.stageName}, session ${s.session} of ${s.ofSessions}` : s.stageName;
}

/** Planned against actual, stage by stage, in the order of the work. */
function stagesDto(sessions: readonly JobSession[]): StagePlanVsActual[] {
  const out: StagePlanVsActual[] = [];
  for (const s of sessions) {
    let row = out.find((r) => r.stage === s.stage);
    if (!row) {
      row = {
        stage: s.stage,
        stageKind: s.stageKind,
        name: s.stageName,
        sessions: 0,
        sessionsDone: 0,
        estimatedHours: 0,
        actualHours: 0,
        estimatedDoneHours: 0,
        plannedStart: s.baselineStart,
        plannedEnd: null,
        currentEnd: null,
        actualEnd: null,
      };
      out.push(row);
    }
    row.sessions++;
    row.estimatedHours = round(row.estimatedHours + Number(s.estimatedHours));
    row.plannedEnd = s.baselineEnd;
    row.currentEnd = s.plannedEnd;
    if (s.done) {
      row.sessionsDone++;
      row.actualHours = round(row.actualHours + Number(s.actualHours ?? 0));
      row.estimatedDoneHours = round(row.estimatedDoneHours + Number(s.estimatedHours));
      row.actualEnd = s.actualEnd;
    }
  }
  for (const row of out) if (row.sessionsDone < row.sessions) row.actualEnd = null;
  return out;
}

async function sessionsOf(jobId: number, transaction?: Transaction): Promise<JobSession[]> {
  return JobSession.findAll({ where: { jobId }, order: [['idx', 'ASC']], transaction });
}

export async function getJob(id: number, transaction?: Transaction): Promise<JobDetail> {
  const job = await Job.findByPk(id, { transaction });
  if (!job) throw problems.notFound('Job');
  const sessions = await sessionsOf(id, transaction);
  const rel = await related([job], transaction);
  const polishers = new Map((await Polisher.findAll({ attributes: ['id', 'name'], transaction })).map((p) => [p.id, p.name]));
  const userIds = [...new Set([job.bookedBy, ...sessions.map((s) => s.doneBy)].filter((u): u is number => u !== null))];
  const users = new Map((userIds.length ? await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'], transaction }) : []).map((u) => [u.id, u.name]));
  const { settings } = await loadPlanning(transaction, false);
  return {
    ...summaryDto(job, sessions, rel),
    notes: job.notes,
    roomUnit: settings.dryingRoom.mode === 'bays' ? 'bays' : 'm²',
    whyNotSooner: job.whyNotSooner,
    overbooking: job.overbooking,
    bookedAt: job.bookedAt?.toISOString() ?? null,
    bookedBy: job.bookedBy === null ? null : { id: job.bookedBy, name: users.get(job.bookedBy) ?? 'former user' },
    startMode: job.startMode,
    stages: stagesDto(sessions),
    sessions: sessions.map((s) => sessionDto(s, polishers, users)),
    agreed: await Quote.findByPk(job.quoteId, { transaction }).then((q) => {
      const agreed = q ? agreedOf(q) : null;
      return agreed && q ? { ...agreed, currency: q.currency } : null;
    }),
  };
}

export async function listJobs(state: JobState | 'active' | 'all'): Promise<JobSummary[]> {
  const where = state === 'all' ? {} : state === 'active' ? { state: { [Op.in]: ['unbooked', ...ACTIVE_JOB_STATES] } } : { state };
  const jobs = await Job.findAll({ where, order: [['id', 'DESC']], limit: 500 });
  const sessions = jobs.length
    ? await JobSession.findAll({ where: { jobId: jobs.map((j) => j.id) }, attributes: ['jobId', 'done', 'estimatedHours', 'actualHours'] })
    : [];
  const rel = await related(jobs);
  return jobs.map((j) => summaryDto(j, sessions.filter((s) => s.jobId === j.id), rel));
}

// ---------------------------------------------------------------------------------------- making a job

async function nextNumber(sequelize: Sequelize, transaction: Transaction): Promise<string> {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('job_number_seq') AS n", { type: QueryTypes.SELECT, transaction });
  return `JOB-${new Date().getFullYear()}-${String(row!.n).padStart(4, '0')}`;
}

/** The quoted stages' hours and materials, flakes and spirit folded in under their material keys. */
export function jobStages(result: EstimateResult, catalog: Pick<Catalog, 'shellac'>): JobStage[] {
  return result.stages
    .filter((s) => s.sessions > 0)
    .map((s) => ({
      key: s.key,
      kind: s.kind,
      name: s.name,
      sessions: s.sessions,
      labourHours: s.labourHours,
      materials: [
        ...(s.flakesG > 0 ? [{ material: catalog.shellac.flakesMaterial, quantity: s.flakesG, unit: 'g' }] : []),
        ...(s.spiritL > 0 ? [{ material: catalog.shellac.spiritMaterial, quantity: round(s.spiritL * 1000, 3), unit: 'mL' }] : []),
        ...s.materials,
      ],
    }));
}

/** Longest session of extra work: longer extras are split into sessions of equal length up to this. */
export const EXTRA_SESSION_MAX_HOURS = 4;

/** The extra work the customer took at acceptance, as job stages and their sessions (no rest after them). */
export function extraStages(extras: readonly { id: string; label: string; hours: number }[]): { stage: JobStage; sessions: { handsOnHours: number }[] }[] {
  return extras
    .filter((x) => x.hours > 0)
    .map((x) => {
      const n = Math.ceil(x.hours / EXTRA_SESSION_MAX_HOURS - 1e-9);
      const each = Math.round((x.hours / n) * 1000) / 1000;
      return {
        stage: { key: `extra-${x.id}`, kind: 'extra' as const, name: `Extra: ${x.label}`.slice(0, 80), sessions: n, labourHours: x.hours, materials: [] },
        sessions: Array.from({ length: n }, () => ({ handsOnHours: each })),
      };
    });
}

/** Rack area a piece takes: its largest face, m². */
export function footprintM2(result: EstimateResult): number {
  const largest = Math.max(0, ...result.parts.map((p) => p.faceAreaM2));
  return largest > 0 ? Math.max(0.01, round(largest)) : 1;
}

export async function createJob(sequelize: Sequelize, actorId: number, input: CreateJobData): Promise<JobDetail> {
  const id = await sequelize.transaction(async (transaction) => {
    const quote = await Quote.findByPk(input.quoteId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!quote) throw problems.badRequest('unknown_quote', 'quoteId: no such quote', 'quoteId');
    if (!ACCEPTED.includes(quote.state)) {
      throw problems.conflict('quote_not_accepted', `Quote ${quote.number} is ${quote.state}: only an accepted quote becomes a job.`);
    }
    // One job a piece the customer chose: the line named, or the first chosen line not yet a job.
    const chosen = await QuoteLine.findAll({ where: { quoteId: quote.id, chosen: true }, order: [['position', 'ASC']], transaction });
    const live = await Job.findAll({ where: { quoteId: quote.id, state: { [Op.ne]: 'cancelled' } }, order: [['id', 'ASC']], transaction });
    let line: QuoteLine | undefined;
    if (input.quoteLineId !== undefined) {
      line = chosen.find((l) => l.id === input.quoteLineId);
      if (!line) throw problems.badRequest('unknown_line', `quoteLineId: not a line the customer chose in quote ${quote.number}`, 'quoteLineId');
      const made = live.find((j) => j.quoteLineId === line!.id);
      if (made) throw problems.conflict('job_exists', `That piece of quote ${quote.number} is already job ${made.number}.`);
    } else {
      line = chosen.find((l) => !live.some((j) => j.quoteLineId === l.id));
      if (!line) throw problems.conflict('job_exists', `Quote ${quote.number} is already job ${live.map((j) => j.number).join(', ') || '(none chosen)'}.`);
    }
    // One estimate, one job: the database's jobs_live_estimate index holds it too.
    const sameWork = await Job.findOne({ where: { estimateId: line.estimateId, state: { [Op.ne]: 'cancelled' } }, transaction });
    if (sameWork) throw problems.conflict('job_exists', `The work of quote ${quote.number} is already job ${sameWork.number}.`);
    const estimate = await Estimate.findByPk(line.estimateId, { transaction });
    const revision = await EstimateRevision.findByPk(line.revisionId, { transaction });
    if (!estimate || !revision) throw new HttpProblem(500, 'quote_without_revision', 'Quote has no revision');
    const result = revision.result;
    // The extras the customer took come first (repairs before the finish goes on), then the quoted stages. They go
    // with the first piece chosen.
    const extras = line.id === chosen[0]!.id ? extraStages(agreedOf(quote)?.extras ?? []) : [];
    const stages = [...extras.map((x) => x.stage), ...jobStages(result, revision.catalog)];
    const job = await Job.create(
      {
        number: await nextNumber(sequelize, transaction),
        quoteId: quote.id,
        quoteLineId: line.id,
        estimateId: estimate.id,
        revisionId: revision.id,
        customerId: estimate.customerId,
        title: estimate.title,
        bays: input.bays ?? 1,
        areaM2: input.areaM2 ?? footprintM2(result),
        stages,
        notes: input.notes ?? '',
        roomStart: null,
        roomEnd: null,
        startMode: null,
        overbooking: null,
        bookedAt: null,
        bookedBy: null,
        finishedAt: null,
        cancelledAt: null,
        createdBy: actorId,
      },
      { transaction },
    );
    const names = new Map(stages.map((s) => [s.key, s]));
    const planned = [
      ...extras.flatMap((x) =>
        x.sessions.map((e, i) => ({ stage: x.stage.key, stageKind: x.stage.kind, session: i + 1, handsOnHours: e.handsOnHours, restHours: 0 })),
      ),
      ...result.calendar.sessions.map((c) => ({ stage: c.stage, stageKind: c.stageKind as JobStage['kind'], session: c.session, handsOnHours: c.handsOnHours, restHours: c.restHours })),
    ];
    await JobSession.bulkCreate(
      planned.map((c, i) => ({
        jobId: job.id,
        idx: i,
        stage: c.stage,
        stageKind: c.stageKind,
        stageName: names.get(c.stage)?.name ?? c.stage,
        session: c.session,
        ofSessions: names.get(c.stage)?.sessions ?? 1,
        handsOnMin: Math.max(1, Math.round(c.handsOnHours * 60)),
        restMin: Math.max(0, Math.round(c.restHours * 60)),
        estimatedHours: c.handsOnHours.toFixed(3),
        plannedStart: null,
        plannedEnd: null,
        restUntil: null,
        baselineStart: null,
        baselineEnd: null,
        polisherId: null,
        actualEnd: null,
        actualHours: null,
        temperatureC: null,
        humidityPct: null,
        notes: null,
        doneBy: null,
        doneAt: null,
      })),
      { transaction },
    );
    await audit({ userId: actorId, action: 'job.create', entityType: 'job', entityId: job.id, after: { number: job.number, quote: quote.number, sessions: planned.length, extras: extras.map((x) => x.stage.name), bays: job.bays, areaM2: job.areaM2 } }, transaction);
    return job.id;
  });
  return getJob(id);
}

export async function updateJob(sequelize: Sequelize, actorId: number, id: number, input: UpdateJobInput): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await Job.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!job) throw problems.notFound('Job');
    const placeChange = (input.bays !== undefined && input.bays !== job.bays) || (input.areaM2 !== undefined && input.areaM2 !== Number(job.areaM2));
    if (placeChange && job.state !== 'unbooked') {
      throw problems.conflict('job_on_board', `Job ${job.number} is ${job.state}: change the room it takes before booking it (cancel and make it again to change it now).`);
    }
    const before = { bays: job.bays, areaM2: Number(job.areaM2), notes: job.notes };
    await job.update({ ...(input.bays !== undefined ? { bays: input.bays } : {}), ...(input.areaM2 !== undefined ? { areaM2: input.areaM2 } : {}), ...(input.notes !== undefined ? { notes: input.notes } : {}) }, { transaction });
    await audit({ userId: actorId, action: 'job.update', entityType: 'job', entityId: id, before, after: { bays: job.bays, areaM2: Number(job.areaM2), notes: job.notes } }, transaction);
  });
  return getJob(id);
}

// ---------------------------------------------------------------------------------------------- booking

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
  const newJob = toNewJob(job, sessions);
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
function cannotPlan(problem: { code: string; text: string }): HttpProblem {
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
        after: { state: 'booked', roomStart: job.roomStart, roomEnd: job.roomEnd, mode: input.mode, forced: overbooked, overbooked: overbooked ? describeOverbooking(laid.overbooking, unit) : [] },
      },
      transaction,
    );
  });
  return getJob(id);
}

/** Takes a job off the board: its bays and its polishers' hours are free again. */
export async function cancelJob(sequelize: Sequelize, actorId: number, id: number): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    await lockBoard(transaction);
    const job = await Job.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!job) throw problems.notFound('Job');
    if (job.state === 'finished' || job.state === 'cancelled') throw problems.conflict('job_closed', `Job ${job.number} is ${job.state}.`);
    const before = { state: job.state, roomStart: job.roomStart, roomEnd: job.roomEnd };
    await job.update({ state: 'cancelled', cancelledAt: new Date() }, { transaction });
    await audit({ userId: actorId, action: 'job.cancel', entityType: 'job', entityId: id, before, after: { state: 'cancelled' } }, transaction);
  });
  return getJob(id);
}

// --------------------------------------------------------------------------------------------- progress

/** Minutes a finish time may lie ahead of the server's clock (a browser clock slightly fast). */
const FINISH_GRACE_MIN = 5;

/**
 * Marks the next open session of a job done with what really happened. When it finished later than planned, the
 * sessions after it are laid again from its actual end plus its rest (the engine's shiftRemaining), and whatever
 * that overbooks is recorded on the job.
 */
export async function markSessionDone(sequelize: Sequelize, actorId: number, jobId: number, sessionId: number, input: SessionDoneInput): Promise<SessionDoneResult> {
  // A session cannot have finished in the future. A few minutes' grace covers a browser clock a little ahead.
  const latest = fromMinutes(toMinutes(localNow()) + FINISH_GRACE_MIN);
  if (input.actualEnd > latest) {
    throw problems.badRequest('finish_in_future', `actualEnd: ${input.actualEnd} is in the future; a session is marked done once it has finished`, 'actualEnd');
  }
  const shift = await sequelize.transaction(async (transaction) => {
    await lockBoard(transaction);
    const job = await Job.findByPk(jobId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!job) throw problems.notFound('Job');
    const sessions = await sessionsOf(jobId, transaction);
    const session = sessions.find((s) => s.id === sessionId);
    if (!session) throw problems.notFound('Session');
    if (job.state !== 'booked' && job.state !== 'in-progress') {
      throw problems.conflict('job_not_on_board', job.state === 'unbooked' ? `Job ${job.number} is not booked yet: book it first.` : `Job ${job.number} is ${job.state}.`);
    }
    if (session.done) throw problems.conflict('session_done', `${sessionLabel(session)} is already marked done.`);
    const open = sessions.find((s) => !s.done)!;
    if (open.id !== session.id) {
      throw problems.conflict('earlier_session_open', `${sessionLabel(open)} comes first: mark it done before ${sessionLabel(session)}.`);
    }
    const plannedEnd = toMinutes(session.plannedEnd!);
    const actualEnd = toMinutes(input.actualEnd);
    session.set({
      done: true,
      actualEnd: input.actualEnd,
      actualHours: input.actualHours.toFixed(2),
      temperatureC: input.temperatureC.toFixed(1),
      humidityPct: input.humidityPct.toFixed(1),
      notes: input.notes,
      materialsUsed: input.materialsUsed || null,
      problem: input.problem || null,
      doneBy: actorId,
      doneAt: new Date(),
    });
    await session.save({ transaction });

    let result: SessionDoneResult['shift'] = null;
    const doneCount = session.idx + 1;
    if (actualEnd > plannedEnd && doneCount < sessions.length) {
      const planning = await loadPlanning(transaction, true);
      const { booked } = await loadBoardJobs(localNow().slice(0, 10), transaction);
      const shifted = shiftRemaining(toBooked(job, sessions), doneCount, actualEnd, booked, planning.ctx);
      if (!shifted.ok) throw cannotPlan(shifted.problem);
      const moved = await writePlan(sessions, shifted.plan, false, transaction);
      const overbooking = overbookingDto(shifted.overbooking, planning.names);
      await job.update({ roomEnd: fromMinutes(shifted.plan.room.end), ...(isOverbooked(overbooking) ? { overbooking } : {}) }, { transaction });
      result = { slipMin: actualEnd - plannedEnd, moved, roomEnd: job.roomEnd, overbooking };
    }
    const finished = doneCount === sessions.length;
    // The last session finished late: the piece rests in the room that much longer.
    const lastRest = actualEnd + session.restMin;
    const longer = finished && job.roomEnd !== null && lastRest > toMinutes(job.roomEnd) ? { roomEnd: fromMinutes(lastRest) } : {};
    await job.update({ state: finished ? 'finished' : 'in-progress', ...(finished ? { finishedAt: new Date() } : {}), ...longer }, { transaction });
    await audit(
      {
        userId: actorId,
        action: 'job.session-done',
        entityType: 'job',
        entityId: jobId,
        after: { session: sessionLabel(session), actualEnd: input.actualEnd, actualHours: input.actualHours, ...(input.problem ? { problem: input.problem } : {}), estimatedHours: Number(session.estimatedHours), slipMin: Math.max(0, actualEnd - plannedEnd), moved: result?.moved ?? 0 },
      },
      transaction,
    );
    return result;
  });
  return { job: await getJob(jobId), shift };
}

// ------------------------------------------------------------------------------------------------ board

export async function getBoard(q: { from?: string; weeks: number }): Promise<PlanningBoard> {
  const planning = await loadPlanning(undefined, false);
  const now = localNow(planning.settings.timeZone);
  const today = now.slice(0, 10);
  const from = q.from ?? mondayOf(today);
  const to = addDays(from, q.weeks * 7 - 1);
  const { jobs, sessions, booked } = await loadBoardJobs(from < today ? from : today);
  const days = occupancy(booked, planning.ctx, from, to);
  const end = addDays(to, 1);
  const shown = jobs.filter((j) => j.roomStart! < end && j.roomEnd! > from);
  const rel = await related(shown);
  const boardJobs: BoardJob[] = shown.map((j) => {
    const list = sessions.get(j.id) ?? [];
    return {
      ...summaryDto(j, list, rel),
      sessions: list.map((s) => ({
        id: s.id,
        index: s.idx,
        label: sessionLabel(s),
        stageName: s.stageName,
        stageKind: s.stageKind,
        start: s.plannedStart!,
        end: s.plannedEnd!,
        restUntil: s.restUntil!,
        segments: s.segments,
        polisherId: s.polisherId,
        done: s.done,
      })),
    };
  });
  const tomorrow = addDays(today, 1);
  const polisherNames = new Map(planning.polishers.map((p) => [p.id, p.name]));
  const due: DueSession[] = [];
  for (const j of jobs) {
    if (j.state === 'finished') continue;
    const list = sessions.get(j.id) ?? [];
    const next = list.find((s) => !s.done);
    for (const s of list) {
      const day = s.plannedStart?.slice(0, 10);
      if (s.done || (day !== today && day !== tomorrow)) continue;
      due.push({
        day: day === today ? 'today' : 'tomorrow',
        jobId: j.id,
        jobNumber: j.number,
        title: j.title,
        sessionId: s.id,
        label: sessionLabel(s),
        start: s.plannedStart!,
        end: s.plannedEnd!,
        handsOnHours: round(s.handsOnMin / 60),
        polisher: s.polisherId === null ? null : { id: s.polisherId, name: polisherNames.get(s.polisherId) ?? 'former polisher' },
        next: next?.id === s.id,
      });
    }
  }
  due.sort((a, b) => a.start.localeCompare(b.start));
  const room = planning.settings.dryingRoom;
  return {
    from,
    to,
    today,
    now,
    room: {
      mode: room.mode,
      capacity: room.mode === 'bays' ? room.bays : room.rackAreaM2,
      unit: room.mode === 'bays' ? 'bays' : 'm²',
      temperatureC: room.temperatureC,
      humidityPct: room.humidityPct,
    },
    polishers: planning.polishers.map((p) => ({ id: p.id, name: p.name, hoursPerDay: Number(p.hoursPerDay), daysOff: p.daysOff, active: p.active })),
    days,
    jobs: boardJobs,
    due,
  };
}

/** The pieces chosen in accepted quotes that are not a job yet (one row a chosen line), and jobs not yet booked. */
export async function readyToBook(): Promise<ReadyToBook> {
  const lines = await QuoteLine.findAll({
    where: {
      chosen: true,
      id: { [Op.notIn]: Quote.sequelize!.literal(`(SELECT quote_line_id FROM jobs WHERE state <> 'cancelled')`) },
      quoteId: { [Op.in]: Quote.sequelize!.literal(`(SELECT id FROM quotes WHERE state IN ('accepted', 'deposit-paid'))`) },
    },
    order: [['quoteId', 'ASC'], ['position', 'ASC']],
    limit: 200,
  });
  const quotes = await Quote.findAll({ where: { id: lines.map((l) => l.quoteId) } });
  const firstChosen = await QuoteLine.findAll({ where: { quoteId: quotes.map((q) => q.id), chosen: true }, attributes: ['id', 'quoteId', 'position'] });
  const estimates = await Estimate.findAll({ where: { id: lines.map((l) => l.estimateId) }, attributes: ['id', 'number', 'title', 'customerId'] });
  const customers = await Customer.findAll({ where: { id: estimates.map((e) => e.customerId) }, attributes: ['id', 'name'] });
  const revisions = await EstimateRevision.findAll({ where: { id: lines.map((l) => l.revisionId) }, attributes: ['id', 'result'] });
  const unbooked = await listJobs('unbooked');
  const rows = lines.map((l) => {
    const q = quotes.find((x) => x.id === l.quoteId)!;
    const e = estimates.find((x) => x.id === l.estimateId)!;
    const r = revisions.find((x) => x.id === l.revisionId)!.result;
    const first = firstChosen.filter((x) => x.quoteId === q.id).sort((a, b) => a.position - b.position)[0];
    const extras = first?.id === l.id ? extraStages(agreedOf(q)?.extras ?? []) : [];
    return {
      quoteId: q.id,
      quoteLineId: l.id,
      quoteNumber: q.number,
      estimateId: e.id,
      estimateNumber: e.number,
      title: e.title,
      customer: { id: e.customerId, name: customers.find((c) => c.id === e.customerId)?.name ?? '' },
      acceptedAt: q.acceptedAt?.toISOString() ?? null,
      labourHours: round(r.totals.labourHours + extras.reduce((t, x) => t + x.stage.labourHours, 0)),
      sessions: r.calendar.sessions.length + extras.reduce((t, x) => t + x.sessions.length, 0),
      calendarDays: r.totals.calendarDays,
    };
  });
  rows.sort((a, b) => (a.acceptedAt ?? '').localeCompare(b.acceptedAt ?? '') || a.quoteId - b.quoteId);
  return { quotes: rows, jobs: unbooked };
}
