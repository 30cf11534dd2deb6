/**
 * The durable job queue: pg-boss, in its own schema (`pgboss`) of the app's database, which pg-boss creates and
 * upgrades itself when a queue starts. Jobs are rows in that schema, so a job scheduled before a restart is still
 * there after it, and a job is fetched by one worker only (pg-boss takes it with SKIP LOCKED). Two queues are used:
 *
 * - `customer-message`: send one outbox message ({ workshopId, outboxId }), now or at its `send_after` time. The
 *   outbox row is the unit of sending: the worker claims it (queued or failed → sending, one conditional update), so
 *   two jobs for the same message, or two instances, never send it twice. A delivery that fails is retried by pg-boss
 *   with a growing delay.
 * - `quote-reminder`: at the day a reminder falls due ({ workshopId, quoteId, kind }), look again at the quote and,
 *   when it is still unanswered, put the reminder in the outbox (one per quote and kind, by its dedupe key).
 *
 * Every payload carries the workshop it belongs to. The app starts one MessageQueue and stops it on close; the
 * services that make messages put jobs on whichever queue of this process is running (`runningQueue()`). When none
 * is, the outbox rows wait: every queue, when it starts, puts a job on for each customer message still queued.
 */
import PgBoss from 'pg-boss';
import { QueryTypes, type Sequelize } from 'sequelize';
import { allWorkshopIds, ensureWorkshopTimeZone, runAsWorkshop } from '../../db/workshop-context';

export const SEND_QUEUE = 'customer-message';
export const REMINDER_QUEUE = 'quote-reminder';
export const QUEUE_SCHEMA = 'pgboss';

export interface SendJob {
  workshopId: number;
  outboxId: number;
}
export interface ReminderJob {
  workshopId: number;
  quoteId: number;
  kind: 'quote-unanswered' | 'quote-expiring';
}

export interface QueueHandlers {
  /** Sends the outbox message; throws when the delivery failed, so the job is retried. */
  send(job: SendJob): Promise<void>;
  reminder(job: ReminderJob): Promise<void>;
}

export interface MessageQueueOptions {
  databaseUrl: string;
  sequelize: Sequelize;
  handlers: QueueHandlers;
  /** How often an idle worker looks for due jobs (pg-boss allows 0.5 s at least). */
  pollSeconds?: number;
  /** Delivery attempts after the first before a job gives up (the message stays failed on the outbox page). */
  retryLimit?: number;
  /** Seconds before the first retry (then doubling). */
  retryDelaySeconds?: number;
}

const running: MessageQueue[] = [];

/** The queue of this process that is running, if any (the newest started). */
export function runningQueue(): MessageQueue | undefined {
  return running.at(-1);
}

export class MessageQueue {
  readonly boss: PgBoss;
  private started: Promise<void> | undefined;
  private stopped = false;
  private readonly workers: string[] = [];
  /** Errors pg-boss reported in the background (a lost connection); kept for the health of the tests, never thrown. */
  readonly errors: Error[] = [];

  constructor(private readonly opts: MessageQueueOptions) {
    this.boss = new PgBoss({
      connectionString: opts.databaseUrl,
      schema: QUEUE_SCHEMA,
      max: 3,
      application_name: 'shellwright-queue',
      schedule: false,
    });
    this.boss.on('error', (err: Error) => {
      this.errors.push(err);
    });
  }

  /** Creates the schema and the queues when missing, starts the workers, and puts on the messages left waiting. */
  start(): Promise<void> {
    this.started ??= (async () => {
      await this.boss.start();
      const queueOptions = { retryLimit: this.opts.retryLimit ?? 5, retryDelay: this.opts.retryDelaySeconds ?? 30, retryBackoff: true };
      await this.boss.createQueue(SEND_QUEUE, { name: SEND_QUEUE, policy: 'short', ...queueOptions });
      await this.boss.createQueue(REMINDER_QUEUE, { name: REMINDER_QUEUE, policy: 'short', ...queueOptions });
      if (this.stopped) return;
      const pollingIntervalSeconds = this.opts.pollSeconds ?? 2;
      this.workers.push(
        await this.boss.work<SendJob>(SEND_QUEUE, { pollingIntervalSeconds, batchSize: 1 }, async ([job]) => {
          // Each job runs under the workshop it belongs to: row-level security shows it that workshop's rows only.
          if (!job) return;
          await runAsWorkshop(job.data.workshopId, async () => {
            await ensureWorkshopTimeZone(this.opts.sequelize);
            await this.opts.handlers.send(job.data);
          });
        }),
        await this.boss.work<ReminderJob>(REMINDER_QUEUE, { pollingIntervalSeconds, batchSize: 1 }, async ([job]) => {
          if (!job) return;
          await runAsWorkshop(job.data.workshopId, async () => {
            await ensureWorkshopTimeZone(this.opts.sequelize);
            await this.opts.handlers.reminder(job.data);
          });
        }),
      );
      running.push(this);
      await this.catchUp();
    })();
    return this.started;
  }

  /** Stops taking jobs, lets the one in hand finish, and closes the queue's connections. */
  async stop(): Promise<void> {
    this.stopped = true;
    const at = running.indexOf(this);
    if (at >= 0) running.splice(at, 1);
    if (!this.started) return;
    await this.started.catch(() => undefined);
    await this.boss.stop({ graceful: true, wait: true, timeout: 10_000 });
  }

  /** Puts a message on the queue, to go now or at `startAfter`. One waiting job per message (its singleton key). */
  async send(job: SendJob, startAfter?: Date | null): Promise<void> {
    await this.start();
    await this.put(job, startAfter);
  }

  private async put(job: SendJob, startAfter?: Date | null): Promise<void> {
    await this.boss.send(SEND_QUEUE, job, {
      singletonKey: `outbox-${job.outboxId}`,
      ...(startAfter && startAfter.getTime() > Date.now() ? { startAfter } : {}),
    });
    if (!startAfter || startAfter.getTime() <= Date.now()) this.wake(0);
  }

  /** Schedules a reminder for the day it falls due. One waiting job per quote and kind. */
  async remind(job: ReminderJob, startAfter: Date): Promise<void> {
    await this.start();
    await this.boss.send(REMINDER_QUEUE, job, { singletonKey: `${job.kind}-${job.quoteId}`, startAfter });
  }

  /** Tells this process's worker to look now rather than at its next poll. */
  private wake(index: number): void {
    const id = this.workers[index];
    if (id) this.boss.notifyWorker(id);
  }

  /**
   * Customer messages still queued with no job waiting for them (made while no queue ran, or whose job was lost):
   * each gets its job. A message that already has one is left alone by the singleton key.
   */
  private async catchUp(): Promise<void> {
    for (const workshopId of await allWorkshopIds(this.opts.sequelize)) {
      if (this.stopped) return;
      const rows = await runAsWorkshop(workshopId, () =>
        this.opts.sequelize.query<{ id: number; send_after: Date | null }>(
          `SELECT o.id, o.send_after
             FROM outbox o
            WHERE o.kind IS NOT NULL AND o.status = 'queued'
              AND NOT EXISTS (SELECT 1 FROM ${QUEUE_SCHEMA}.job j WHERE j.name = :queue AND j.singleton_key = 'outbox-' || o.id AND j.state < 'completed')
            ORDER BY o.id LIMIT 500`,
          { type: QueryTypes.SELECT, replacements: { queue: SEND_QUEUE } },
        ),
      );
      for (const r of rows) await this.put({ workshopId, outboxId: r.id }, r.send_after);
    }
  }
}
