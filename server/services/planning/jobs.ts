/** Making a job from an accepted quote, changing its notes or dates, and taking it off the board. */
import { Op, type CreationAttributes, type Sequelize } from 'sequelize';
import type { EstimateResult } from '@shared/schemas/calc';
import type { Catalog } from '@shared/schemas/catalog';
import { type CreateJobData, type JobDetail, type UpdateJobInput } from '@shared/schemas/planning';
import { HttpProblem, problems } from '../../http/problem';
import { Estimate, EstimateRevision, Job, JobSession, Quote, QuoteLine } from '../../models';
import type { JobStage } from '../../models/planning';
import { audit } from '../audit';
import { agreedOf } from '../quotes';
import { lockBoard } from '../planning-context';
import { ACCEPTED, round } from './mapping';
import { getJob } from './read';
import { nextRecordNumber } from '../numbering';

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

/** What a new session names: its job, place, stage and planned work. */
export type SessionPlan = Pick<
  CreationAttributes<JobSession>,
  'jobId' | 'idx' | 'stage' | 'stageKind' | 'stageName' | 'session' | 'ofSessions' | 'handsOnMin' | 'restMin' | 'estimatedHours'
>;

/**
 * A new session not yet booked: the plan given, and every field of booking, progress and record still empty (no
 * planned or baseline times, no polisher, no actuals, not done). Jobs and approved variations make sessions with it.
 */
export function unbookedSession(plan: SessionPlan): CreationAttributes<JobSession> {
  return {
    ...plan,
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
  };
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
        number: await nextRecordNumber(sequelize, 'job', transaction),
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
      planned.map((c, i) =>
        unbookedSession({
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
        }),
      ),
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
