/** Reading jobs: one job in full, and the list by state. */
import { Op, type Transaction } from 'sequelize';
import { money } from '@shared/money';
import { ACTIVE_JOB_STATES, type JobDetail, type JobState, type JobSummary } from '@shared/schemas/planning';
import { problems } from '../../http/problem';
import { Job, JobSession, JobVariation, Polisher, Quote, User } from '../../models';
import { agreedOf } from '../quotes';
import { loadPlanning } from '../planning-context';
import { related, summaryDto, sessionDto, stagesDto, sessionsOf } from './mapping';

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
    agreed: await agreedWithVariations(job.quoteId, transaction),
  };
}

/**
 * What the customer agreed, as the job page shows it: the accepted total plus the variations the customer approved
 * since (as the account counts them, docs/job-end.md), the deposit, and the rest due on collection.
 */
async function agreedWithVariations(quoteId: number, transaction?: Transaction): Promise<JobDetail['agreed']> {
  const q = await Quote.findByPk(quoteId, { transaction });
  const agreed = q ? agreedOf(q) : null;
  if (!agreed || !q) return null;
  const approved = await JobVariation.findAll({ where: { quoteId, state: 'approved' }, attributes: ['price'], transaction });
  const total = approved.reduce((t, v) => t.plus(money(v.price)), money(agreed.total));
  return { ...agreed, total: total.toFixed(2), balance: total.minus(money(agreed.deposit)).toFixed(2), currency: q.currency };
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
