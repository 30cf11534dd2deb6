/**
 * Variations: work found during a job (loose veneer, a split, a missing moulding), priced by the engine (one part and
 * a finishing system, through shared/calc) or by hand, sent to the customer through a signed link (the quote link's
 * signing), approved or declined by them. On approval, in one transaction holding the board lock and the quote's row
 * lock: the variation's hours join the job's sessions (next in line, laid on the board when the job is booked), and
 * its price joins the agreed total the account and the invoice use (server/services/accounts.ts).
 */
import { type Sequelize, type Transaction } from 'sequelize';
import { fromMinutes, toMinutes } from '@shared/calc';
import { shiftRemaining, type BookedJob, type JobPlan } from '@shared/calc/planning';
import { moveVariation } from '@shared/schemas/state-moves';
import { type PublicVariationDto, type VariationDto } from '@shared/schemas/job-end';
import { safetyCautionTexts } from './cautions';
import type { Config } from '../../config';
import { HttpProblem, problems } from '../../http/problem';
import { AccountDocument, Job, JobSession, JobVariation, Quote } from '../../models';
import { currentWorkshop } from '../workshops';
import { audit } from '../audit';
import { estimateFromBody } from '../estimator';
import { recordJobEvent } from '../job-events';
import { isOverbooked, loadBoardJobs, loadPlanning, localNow, lockBoard, overbookingDto, toBooked, writePlan } from '../planning-context';
import { cannotPlan } from '../planning/booking';
import { EXTRA_SESSION_MAX_HOURS, unbookedSession } from '../planning/jobs';
import { sessionsOf } from '../planning/mapping';
import { hashToken, makeToken, tokenSigned } from '../quotes/links';
import { variationDto } from './variation-dto';

export interface NewVariation {
  title: string;
  description: string;
  hand?: { price: string; hours: number };
  engine?: { part: Record<string, unknown>; system: string };
}

async function currencyOf(quoteId: number, transaction?: Transaction): Promise<string> {
  return (await Quote.findByPk(quoteId, { attributes: ['id', 'currency'], transaction }))?.currency ?? 'GBP';
}

/** Adds a variation to a job, priced by hand or by the engine (the server prices: a client's figure is never read). */
export async function createVariation(sequelize: Sequelize, actorId: number, jobId: number, input: NewVariation): Promise<VariationDto> {
  let price: string;
  let hours: number;
  let working: Record<string, unknown> | null = null;
  if (input.engine) {
    const { result } = await estimateFromBody(sequelize, { parts: [input.engine.part], system: input.engine.system }).catch((err: unknown) => {
      // The engine's field names are under engine.part here.
      if (err instanceof HttpProblem && err.status === 400) {
        const field = typeof err.extra.field === 'string' ? err.extra.field.replace(/^parts\.0\.?/, 'engine.part.').replace(/\.$/, '').replace(/^system$/, 'engine.system') : 'engine';
        throw new HttpProblem(400, err.code, err.title, err.detail ?? 'The part cannot be priced.', { field, errors: [{ field, message: err.detail ?? '' }] });
      }
      throw err;
    });
    price = Number(result.price.total).toFixed(2);
    hours = Math.round(result.totals.labourHours * 1000) / 1000;
    working = { pricedWith: input.engine, labourHours: result.totals.labourHours, materialsCost: result.price.internal.materialsCost, labourCost: result.price.internal.labourCost, lines: result.price.lines };
    if (!(Number(price) > 0)) throw problems.badRequest('variation_unpriced', 'engine.part: the engine priced this part at nothing; price it by hand', 'engine.part');
  } else {
    price = Number(input.hand!.price).toFixed(2);
    hours = input.hand!.hours;
  }
  const id = await sequelize.transaction(async (transaction) => {
    const job = await Job.findByPk(jobId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!job) throw problems.notFound('Job');
    if (job.state === 'cancelled' || job.custody === 'returned') throw problems.conflict('job_closed', `Job ${job.number} is ${job.state === 'cancelled' ? 'cancelled' : 'returned'}: no more work can be added.`);
    const v = await JobVariation.create(
      { jobId, quoteId: job.quoteId, title: input.title, description: input.description, pricedBy: input.engine ? 'engine' : 'hand', price, hours: hours.toFixed(3), working, createdBy: actorId },
      { transaction },
    );
    await audit({ userId: actorId, action: 'variation.create', entityType: 'job', entityId: jobId, after: { variation: v.id, title: v.title, price, hours, pricedBy: v.pricedBy } }, transaction);
    return v.id;
  });
  const v = (await JobVariation.findByPk(id))!;
  return variationDto(v, await currencyOf(v.quoteId), true);
}

async function invoiceIssued(quoteId: number, transaction: Transaction): Promise<AccountDocument | null> {
  return AccountDocument.findOne({ where: { quoteId, kind: 'invoice' }, attributes: ['id', 'number'], transaction });
}

export function variationLink(config: Config, token: string): string {
  return `${config.publicUrl}/v/${token}`;
}

/** Sends (or sends again, with a fresh link) a variation to the customer. The link is in the answer and the event. */
export async function sendVariation(sequelize: Sequelize, config: Config, actorId: number, jobId: number, variationId: number): Promise<VariationDto> {
  const { token, hash } = makeToken(config.linkSecret);
  const link = variationLink(config, token);
  const v = await sequelize.transaction(async (transaction) => {
    const v = await JobVariation.findOne({ where: { id: variationId, jobId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!v) throw problems.notFound('Variation');
    const to = moveVariation(v.state, 'send');
    const invoice = await invoiceIssued(v.quoteId, transaction);
    if (invoice) throw problems.conflict('invoice_issued', `Invoice ${invoice.number} is issued for this agreement: an issued invoice is never changed, so agree further work as a new quote.`);
    await v.update({ state: to, tokenHash: hash, sentAt: new Date() }, { transaction });
    await audit({ userId: actorId, action: 'variation.send', entityType: 'job', entityId: jobId, after: { variation: v.id } }, transaction);
    // The link itself is never stored: listeners (customer messages) receive it with the event.
    await recordJobEvent(transaction, jobId, 'variation-sent', { variationId: v.id, title: v.title, price: Number(v.price).toFixed(2) }, actorId, { link });
    return v;
  });
  return { ...variationDto(v, await currencyOf(v.quoteId), true), link };
}

export async function withdrawVariation(sequelize: Sequelize, actorId: number, jobId: number, variationId: number): Promise<VariationDto> {
  const v = await sequelize.transaction(async (transaction) => {
    const v = await JobVariation.findOne({ where: { id: variationId, jobId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!v) throw problems.notFound('Variation');
    await v.update({ state: moveVariation(v.state, 'withdraw'), tokenHash: null }, { transaction });
    await audit({ userId: actorId, action: 'variation.withdraw', entityType: 'job', entityId: jobId, after: { variation: v.id } }, transaction);
    return v;
  });
  return variationDto(v, await currencyOf(v.quoteId), true);
}

// -------------------------------------------------------------------------------------------- the customer

const linkInvalid = () => new HttpProblem(404, 'link_invalid', 'Link not valid', 'This link is not valid. Check that the whole address was copied, or ask the workshop for a new link.');

async function byToken(config: Config, token: string, transaction?: Transaction, lock = false): Promise<JobVariation> {
  if (!tokenSigned(token, config.linkSecret)) throw linkInvalid();
  const v = await JobVariation.findOne({ where: { tokenHash: hashToken(token) }, transaction, ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}) });
  if (!v) throw linkInvalid();
  return v;
}

/** The variation as the customer reads it: what, why, the price; never hours, rates or margins. */
export async function publicVariation(config: Config, token: string): Promise<PublicVariationDto> {
  const v = await byToken(config, token);
  const [job, quote, workshop] = await Promise.all([Job.findByPk(v.jobId), Quote.findByPk(v.quoteId), currentWorkshop()]);
  return {
    title: v.title,
    description: v.description,
    price: Number(v.price).toFixed(2),
    currency: quote?.currency ?? 'GBP',
    state: v.state,
    jobNumber: job?.number ?? '',
    pieceTitle: job?.title ?? '',
    workshopName: workshop?.name ?? '',
    cautions: safetyCautionTexts(),
  };
}

/** Lays a booked job's sessions again from its last done session (or its start), after sessions were added. */
async function relay(job: Job, transaction: Transaction): Promise<void> {
  if (job.state !== 'booked' && job.state !== 'in-progress') return;
  const sessions = await sessionsOf(job.id, transaction);
  const done = sessions.filter((s) => s.done).length;
  const planning = await loadPlanning(transaction, true);
  const now = localNow();
  const { booked } = await loadBoardJobs(now.slice(0, 10), transaction);
  // Sessions not laid yet (the variation's) carry no times: the engine reads only their hours and rests.
  const placeholder = (s: JobSession) => ({ ...s.get(), plannedStart: now, plannedEnd: now, restUntil: now, segments: [{ start: now, end: now }] }) as unknown as JobSession;
  const asBooked: BookedJob = toBooked(job, sessions.map((s) => (s.plannedStart ? s : placeholder(s))));
  const lastDone = sessions[done - 1];
  const from = lastDone ? toMinutes(lastDone.actualEnd ?? lastDone.plannedEnd!) : Math.max(toMinutes(now), toMinutes(job.roomStart!));
  const shifted = shiftRemaining(asBooked, done, from, booked, planning.ctx);
  if (!shifted.ok) throw cannotPlan(shifted.problem);
  const plan: JobPlan = shifted.plan;
  await writePlan(sessions, plan, false, transaction);
  const overbooking = overbookingDto(shifted.overbooking, planning.names);
  await job.update({ roomEnd: fromMinutes(plan.room.end), ...(isOverbooked(overbooking) ? { overbooking } : {}) }, { transaction });
}

/** Adds an approved variation's hours to the job: sessions of up to four hours, next in line after the work done. */
async function addSessions(job: Job, v: JobVariation, transaction: Transaction): Promise<void> {
  const hours = Number(v.hours);
  if (!(hours > 0)) return;
  const sessions = await sessionsOf(job.id, transaction);
  const at = sessions.filter((s) => s.done).length;
  const n = Math.ceil(hours / EXTRA_SESSION_MAX_HOURS - 1e-9);
  const each = Math.round((hours / n) * 1000) / 1000;
  const sequelize = Job.sequelize!;
  // Make room in the numbering (two steps: the (job, idx) index is unique at every row).
  await sequelize.query('UPDATE job_sessions SET idx = -idx - 1 WHERE job_id = :job AND idx >= :at', { replacements: { job: job.id, at }, transaction });
  await sequelize.query('UPDATE job_sessions SET idx = -idx - 1 + :n WHERE job_id = :job AND idx < 0', { replacements: { job: job.id, n }, transaction });
  const name = `Variation: ${v.title}`.slice(0, 80);
  await JobSession.bulkCreate(
    Array.from({ length: n }, (_, i) =>
      unbookedSession({
        jobId: job.id,
        idx: at + i,
        stage: `variation-${v.id}`,
        stageKind: 'extra',
        stageName: name,
        session: i + 1,
        ofSessions: n,
        handsOnMin: Math.max(1, Math.round(each * 60)),
        restMin: 0,
        estimatedHours: each.toFixed(3),
      }),
    ),
    { transaction },
  );
  await relay(job, transaction);
}

/**
 * The customer's answer. Approving locks the board, the job and the quote (the account's lock, so a payment cannot
 * meet a half-changed total), adds the sessions and lets the price count in the agreed total, all at once.
 */
export async function answerVariation(sequelize: Sequelize, config: Config, token: string, answer: 'approve' | 'decline', note: string, ip: string): Promise<PublicVariationDto> {
  await sequelize.transaction(async (transaction) => {
    if (answer === 'approve') await lockBoard(transaction);
    const found = await byToken(config, token, transaction);
    const job = await Job.findByPk(found.jobId, { transaction, lock: transaction.LOCK.UPDATE });
    await Quote.findByPk(found.quoteId, { transaction, lock: transaction.LOCK.UPDATE });
    const v = await byToken(config, token, transaction, true);
    const to = moveVariation(v.state, answer);
    if (!job || job.state === 'cancelled') throw problems.conflict('job_closed', 'This job was cancelled: ask the workshop.');
    if (answer === 'approve') {
      const invoice = await invoiceIssued(v.quoteId, transaction);
      if (invoice) throw problems.conflict('invoice_issued', `Invoice ${invoice.number} has been issued for this work already: ask the workshop about this extra work.`);
    }
    await v.update({ state: to, answeredAt: new Date(), answerNote: note || null, answerIp: ip.slice(0, 64) }, { transaction });
    if (answer === 'approve') await addSessions(job, v, transaction);
    await audit({ userId: null, action: `variation.${answer}`, entityType: 'job', entityId: job.id, after: { variation: v.id, price: Number(v.price).toFixed(2), hours: Number(v.hours) } }, transaction);
    await recordJobEvent(transaction, job.id, answer === 'approve' ? 'variation-approved' : 'variation-declined', { variationId: v.id, title: v.title, price: Number(v.price).toFixed(2) });
  });
  return publicVariation(config, token);
}
