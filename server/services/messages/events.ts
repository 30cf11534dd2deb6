/**
 * Which event makes which message. Each is called inside the transaction of its event (the acceptance, the booking,
 * the quote marked sent), so the message exists exactly when the event committed; its dedupe key makes an event
 * repeated (a webhook delivered twice, a job run twice) make one message only.
 */
import { quoteStateOn } from '@shared/schemas/state-moves';
import { formatDate, formatMoney } from '@shared/format';
import { addDays, dayOf, today } from '@shared/time';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { Config } from '../../config';
import { HttpProblem, problems } from '../../http/problem';
import { Customer, Estimate, Job, OutboxMessage, Quote } from '../../models';
import { onJobEvent } from '../job-events';
import { deliver, deliverQueued } from '../mail';
import { runningQueue, type ReminderJob } from './queue';
import { currentWorkshopId, getMessageSettings, morningOf, queueCustomerMessage } from './templates';

/** The pieces of a quote in words: the estimates of the lines the customer chose (of every line before choosing). */
export async function piecesOf(sequelize: Sequelize, quoteId: number, transaction?: Transaction): Promise<string> {
  const titles = await sequelize.query<{ title: string }>(
    `SELECT e.title FROM quote_lines l JOIN estimates e ON e.id = l.estimate_id
      WHERE l.quote_id = :quoteId AND (l.chosen IS NULL OR l.chosen)
      GROUP BY e.title ORDER BY min(l.position)`,
    { type: QueryTypes.SELECT, replacements: { quoteId }, transaction },
  );
  const words = titles.map((t) => t.title);
  if (words.length === 0) {
    const quote = await Quote.findByPk(quoteId, { attributes: ['estimateId'], transaction });
    const estimate = quote ? await Estimate.findByPk(quote.estimateId, { attributes: ['title'], transaction }) : null;
    return estimate?.title ?? 'piece';
  }
  return words.length === 1 ? words[0]! : `${words.slice(0, -1).join(', ')} and ${words.at(-1)}`;
}

async function customerOfQuote(quote: Quote, transaction?: Transaction): Promise<number> {
  const estimate = await Estimate.findByPk(quote.estimateId, { attributes: ['customerId'], transaction });
  return estimate!.customerId;
}

/** Acceptance: the confirmation, with the customer's own link (known here: they are using it). */
export async function messageOnAcceptance(sequelize: Sequelize, quote: Quote, link: string, transaction: Transaction): Promise<number | null> {
  return queueCustomerMessage(
    sequelize,
    {
      workshopId: await currentWorkshopId(transaction),
      kind: 'acceptance',
      customerId: await customerOfQuote(quote, transaction),
      quoteId: quote.id,
      values: {
        piece: await piecesOf(sequelize, quote.id, transaction),
        quote_number: quote.number,
        amount: quote.acceptedTotal === null ? '' : formatMoney(String(quote.acceptedTotal), quote.currency),
        dates: formatDate(quote.validUntil),
        link,
      },
      to: quote.recipient,
      dedupeKey: `acceptance:quote:${quote.id}`,
      actorId: null,
    },
    transaction,
  );
}

const dayPart = (local: string | null) => (local ? formatDate(local.slice(0, 10)) : '');

/** Booked for the first time: the dates; moved: the new dates. Nothing when a move left the dates as they were. */
export async function messageOnBooking(
  sequelize: Sequelize,
  job: Job,
  before: { state: string; roomStart: string | null; roomEnd: string | null },
  actorId: number,
  transaction: Transaction,
): Promise<number | null> {
  const moved = before.state === 'booked';
  if (moved && before.roomStart?.slice(0, 10) === job.roomStart?.slice(0, 10) && before.roomEnd?.slice(0, 10) === job.roomEnd?.slice(0, 10)) return null;
  const quote = await Quote.findByPk(job.quoteId, { transaction });
  if (!quote) return null;
  const dates = `${dayPart(job.roomStart)} to ${dayPart(job.roomEnd)}`;
  return queueCustomerMessage(
    sequelize,
    {
      workshopId: await currentWorkshopId(transaction),
      kind: moved ? 'dates-changed' : 'booking',
      customerId: job.customerId,
      quoteId: quote.id,
      jobId: job.id,
      values: { piece: job.title, quote_number: quote.number, dates },
      to: quote.recipient,
      dedupeKey: moved ? `dates:job:${job.id}:${job.roomStart}:${job.roomEnd}:${Date.now()}` : `booking:job:${job.id}:${job.bookedAt?.getTime() ?? 0}`,
      actorId,
    },
    transaction,
  );
}

/**
 * "Tell the customer it is ready": the ready message for a job, once (409 when it was already sent or is on its way;
 * a failed one is retried from the outbox page). Refused for a job cancelled or never booked.
 */
export async function sendReadyMessage(sequelize: Sequelize, config: Config, actorId: number | null, jobId: number): Promise<{ outboxId: number; status: string }> {
  const outboxId = await sequelize.transaction(async (transaction) => {
    const job = await Job.findByPk(jobId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!job) throw problems.notFound('Job');
    if (job.state === 'cancelled' || job.state === 'unbooked') {
      throw problems.conflict('job_not_ready', `Job ${job.number} is ${job.state === 'cancelled' ? 'cancelled' : 'not booked yet'}: it cannot be ready.`);
    }
    const existing = await OutboxMessage.findOne({ where: { dedupeKey: `ready:job:${job.id}` }, attributes: ['id', 'status', 'sentAt'], transaction });
    if (existing) {
      throw problems.conflict('already_told', `The customer was already told job ${job.number} is ready (message ${existing.id}, ${existing.status}).`);
    }
    const quote = await Quote.findByPk(job.quoteId, { transaction });
    const customer = await Customer.findByPk(job.customerId, { attributes: ['id', 'email', 'name'], transaction });
    if (!customer?.email && !quote?.recipient) {
      throw problems.badRequest('no_recipient', `${customer?.name ?? 'The customer'} has no e-mail address: add one on the customer's page first.`, 'email');
    }
    const id = await queueCustomerMessage(
      sequelize,
      {
        workshopId: await currentWorkshopId(transaction),
        kind: 'ready',
        customerId: job.customerId,
        quoteId: job.quoteId,
        jobId: job.id,
        values: { piece: job.title, quote_number: quote?.number ?? '', dates: formatDate(today()) },
        to: quote?.recipient,
        dedupeKey: `ready:job:${job.id}`,
        actorId,
      },
      transaction,
    );
    return id!;
  });
  // Sent at once where the mail server answers; the queue's job retries it when it did not.
  const m = await deliver(config, outboxId);
  return { outboxId, status: m.status };
}

/**
 * A quote marked sent: its two reminders are scheduled on the queue for the days they fall due (read from the
 * settings now: a later change of the settings applies to quotes sent after it).
 */
export async function scheduleQuoteReminders(sequelize: Sequelize, quote: Quote, transaction: Transaction): Promise<void> {
  const workshopId = await currentWorkshopId(transaction);
  const settings = await getMessageSettings(sequelize, workshopId, transaction);
  const sentDay = dayOf(quote.sentAt ?? new Date());
  const jobs: { job: ReminderJob; at: Date }[] = [];
  const unansweredDay = addDays(sentDay, settings.unansweredAfterDays);
  const expiringDay = addDays(quote.validUntil, -settings.expiringBeforeDays);
  // The unanswered reminder only if it falls before the other; the other only if it falls after sending.
  if (unansweredDay < expiringDay) jobs.push({ job: { workshopId, quoteId: quote.id, kind: 'quote-unanswered' }, at: morningOf(unansweredDay) });
  if (expiringDay > sentDay) jobs.push({ job: { workshopId, quoteId: quote.id, kind: 'quote-expiring' }, at: morningOf(expiringDay) });
  transaction.afterCommit(() => {
    const queue = runningQueue();
    if (queue) for (const j of jobs) void queue.remind(j.job, j.at).catch(() => undefined);
  });
}

/** A reminder falls due: sent when the quote is still waiting for its answer (and not expired), once. */
export async function runReminder(sequelize: Sequelize, job: ReminderJob): Promise<number | null> {
  return sequelize.transaction(async (transaction) => {
    const quote = await Quote.findByPk(job.quoteId, { transaction });
    if (!quote || quote.revoked) return null;
    const state = quoteStateOn(quote.state, quote.validUntil, today());
    if (state !== 'quoted' && state !== 'viewed') return null;
    return queueCustomerMessage(
      sequelize,
      {
        workshopId: job.workshopId,
        kind: job.kind,
        customerId: await customerOfQuote(quote, transaction),
        quoteId: quote.id,
        values: { piece: await piecesOf(sequelize, quote.id, transaction), quote_number: quote.number, dates: formatDate(quote.validUntil) },
        to: quote.recipient,
        dedupeKey: `${job.kind}:quote:${quote.id}`,
        actorId: null,
      },
      transaction,
    );
  });
}

/** The queue's send handler: delivers the outbox message (throws on a failed delivery, so the queue retries). */
export async function sendQueuedMessage(config: Config, outboxId: number): Promise<void> {
  await deliverQueued(config, outboxId);
}

/**
 * Messages that follow the job's own events (services/job-events.ts): when staff mark the piece ready, the customer
 * hears of it once (a piece reopened and ready again is not announced twice). Runs after the change has committed,
 * under the workshop of the request that made it. Returns the function that unhooks it (the app's close()).
 */
export function tellCustomerOfJobEvents(sequelize: Sequelize, config: Config): () => void {
  return onJobEvent(async (event) => {
    if (event.kind !== 'ready') return;
    try {
      await sendReadyMessage(sequelize, config, event.actorId, event.jobId);
    } catch (err) {
      if (err instanceof HttpProblem && (err.code === 'already_told' || err.code === 'no_recipient')) return;
      throw err;
    }
  });
}
