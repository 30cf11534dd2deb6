/** Jobs and their sessions as the API sends them: summaries, details' sessions and the plan against actuals per stage. */
import { type Transaction } from 'sequelize';
import { type JobSessionDto, type JobSummary, type StagePlanVsActual } from '@shared/schemas/planning';
import { Customer, Estimate, EstimateRevision, type Job, JobSession, Quote } from '../../models';
import { allOf } from '../../db/queries';

export const ACCEPTED = ['accepted', 'deposit-paid'];
export const round = (n: number, places = 2) => Math.round(n * 10 ** places) / 10 ** places;
const num = (v: string | number | null) => (v === null ? null : Number(v));

// ------------------------------------------------------------------------------------------------- DTOs

interface Related {
  customers: Map<number, Customer>;
  estimates: Map<number, Estimate>;
  quotes: Map<number, Quote>;
  revisions: Map<number, number>;
}

export async function related(jobs: readonly Job[], transaction?: Transaction): Promise<Related> {
  const [customers, estimates, quotes, revisions] = await allOf(transaction, [
    () => Customer.findAll({ where: { id: jobs.map((j) => j.customerId) }, attributes: ['id', 'name'], transaction }),
    () => Estimate.findAll({ where: { id: jobs.map((j) => j.estimateId) }, attributes: ['id', 'number'], transaction }),
    () => Quote.findAll({ where: { id: jobs.map((j) => j.quoteId) }, attributes: ['id', 'number'], transaction }),
    () => EstimateRevision.findAll({ where: { id: jobs.map((j) => j.revisionId) }, attributes: ['id', 'number'], transaction }),
  ]);
  return {
    customers: new Map(customers.map((c) => [c.id, c])),
    estimates: new Map(estimates.map((e) => [e.id, e])),
    quotes: new Map(quotes.map((q) => [q.id, q])),
    revisions: new Map(revisions.map((r) => [r.id, r.number])),
  };
}

export function summaryDto(job: Job, sessions: readonly JobSession[], rel: Related): JobSummary {
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
    custody: job.custody ?? 'awaiting-collection',
    collectionDate: job.collectionDate ?? null,
    returnDate: job.returnDate ?? null,
    keptPolisherId: job.keptPolisherId ?? null,
    keepScope: job.keepScope ?? null,
  };
}

export function sessionDto(s: JobSession, polishers: ReadonlyMap<number, string>, users: ReadonlyMap<number, string>): JobSessionDto {
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

export function sessionLabel(s: Pick<JobSession, 'stageName' | 'session' | 'ofSessions'>): string {
  return s.ofSessions > 1 ? `${s.stageName}, session ${s.session} of ${s.ofSessions}` : s.stageName;
}

/** Planned against actual, stage by stage, in the order of the work. */
export function stagesDto(sessions: readonly JobSession[]): StagePlanVsActual[] {
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

export async function sessionsOf(jobId: number, transaction?: Transaction): Promise<JobSession[]> {
  return JobSession.findAll({ where: { jobId }, order: [['idx', 'ASC']], transaction });
}
