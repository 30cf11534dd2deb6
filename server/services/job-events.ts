/**
 * A job's events: what happened that the customer may hear of (a change of dates, the piece ready, a variation sent
 * or answered). Each is a row in `job_events`, written in the transaction of the change itself, so the customer's
 * page and the staff page read them. Customer messages hook in with `onJobEvent`: the listeners run once the
 * transaction has committed (never for a change that rolled back), with the workshop taken from the job.
 */
import type { Transaction } from 'sequelize';
import { JobEvent } from '../models';

export const JOB_EVENT_KINDS = [
  'dates-changed',
  'arrived',
  'ready',
  'returned',
  'reopened',
  'variation-sent',
  'variation-approved',
  'variation-declined',
] as const;
export type JobEventKind = (typeof JOB_EVENT_KINDS)[number];

export interface JobEventRecord {
  id: number;
  jobId: number;
  kind: JobEventKind;
  detail: Record<string, unknown>;
  actorId: number | null;
}

type Listener = (event: JobEventRecord) => void | Promise<void>;
const listeners = new Set<Listener>();

/** Hooks a listener (customer messages, for one); returns the function that unhooks it. */
export function onJobEvent(listener: Listener): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** Records an event inside the caller's transaction; listeners hear of it after the commit. */
export async function recordJobEvent(
  transaction: Transaction,
  jobId: number,
  kind: JobEventKind,
  detail: Record<string, unknown> = {},
  actorId: number | null = null,
  /** Given to listeners but never stored (a customer's signed link, say). */
  transient: Record<string, unknown> = {},
): Promise<JobEventRecord> {
  const row = await JobEvent.create({ jobId, kind, detail, actorId }, { transaction });
  const record: JobEventRecord = { id: row.id, jobId, kind, detail: { ...detail, ...transient }, actorId };
  transaction.afterCommit(() => {
    for (const l of listeners) {
      // A listener's failure never undoes the change it heard of; the row stays for a retry from the queue.
      void Promise.resolve()
        .then(() => l(record))
        .catch((err: unknown) => console.error(`job event ${record.id} (${kind}) listener failed`, err));
    }
  });
  return record;
}

/** The sentence an event reads as, on the staff and the customer's pages. */
export function eventText(kind: string, detail: Record<string, unknown>): string {
  const d = (k: string) => (typeof detail[k] === 'string' ? (detail[k] as string) : '');
  switch (kind) {
    case 'dates-changed':
      return `Dates set: collection ${d('collectionDate') || 'to be arranged'}, return ${d('returnDate') || 'to be arranged'}.`;
    case 'arrived':
      return 'The piece arrived in the workshop.';
    case 'ready':
      return 'The work is finished: the piece is ready.';
    case 'returned':
      return 'The piece went home.';
    case 'reopened':
      return 'The piece is back in the work.';
    case 'variation-sent':
      return `Extra work proposed: ${d('title')}.`;
    case 'variation-approved':
      return `Extra work approved: ${d('title')}.`;
    case 'variation-declined':
      return `Extra work declined: ${d('title')}.`;
    default:
      return kind;
  }
}
