/**
 * Sends what is in the outbox through SMTP (nodemailer). A message is marked sent only when the server accepted
 * it; a failure is kept with its reason and can be retried. A message is claimed before it goes (queued or failed
 * becomes "sending" in one conditional update), so two requests never send it twice.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';
import { problems } from '../http/problem';
import { OutboxMessage, Quote, Workshop } from '../models';
import type { OutboxDetail, OutboxSummary } from '@shared/schemas/quotes';

const transports = new Map<string, Transporter>();

function transport(config: Config): Transporter {
  const url = config.mail.url;
  if (!url) throw new Error('No SMTP server is configured (SMTP_URL)');
  let t = transports.get(url);
  if (!t) {
    const local = /^smtp:\/\/(127\.0\.0\.1|localhost)/.test(url);
    t = nodemailer.createTransport(local ? { url, secure: false, ignoreTLS: true, connectionTimeout: 5_000 } as never : url);
    transports.set(url, t);
  }
  return t;
}

export function outboxSummary(m: OutboxMessage): OutboxSummary {
  return {
    id: m.id,
    quoteId: m.quoteId,
    to: m.toAddress,
    subject: m.subject,
    status: m.status,
    attempts: m.attempts,
    lastError: m.lastError,
    attachmentName: m.attachmentName,
    createdAt: m.createdAt.toISOString(),
    sentAt: m.sentAt ? m.sentAt.toISOString() : null,
  };
}

export function outboxDetail(m: OutboxMessage): OutboxDetail {
  return { ...outboxSummary(m), text: m.textBody, html: m.htmlBody };
}

/** Takes a message for sending if it is in one of the given states; false when another request has it or it went. */
async function claim(id: number, from: readonly string[]): Promise<boolean> {
  const [n] = await OutboxMessage.update({ status: 'sending' }, { where: { id, status: from as string[] } });
  return n > 0;
}

/** Tries to deliver one outbox message now (a queued one, as it is made); returns it with its new status. */
export async function deliver(config: Config, id: number): Promise<OutboxMessage> {
  const m = await OutboxMessage.findByPk(id);
  if (!m) throw problems.notFound('Message');
  if (!(await claim(id, ['queued']))) return m;
  return send(config, m);
}

/**
 * Sends a message for the job queue (services/messages/queue.ts): a queued one, or a failed one being retried. The
 * claim makes the outbox row the unit of sending, so two jobs or two instances never send it twice. Throws when the
 * delivery failed, so the queue tries again later; a message already sent or in hand is left alone.
 */
export async function deliverQueued(config: Config, id: number): Promise<OutboxMessage | null> {
  const m = await OutboxMessage.findByPk(id);
  if (!m) return null;
  if (!(await claim(id, ['queued', 'failed']))) return m;
  const sent = await send(config, m);
  if (sent.status === 'failed') throw new Error(`Message ${id} was not delivered: ${sent.lastError ?? 'unknown error'}`);
  return sent;
}

/**
 * Sends a failed message again. Only a failed message can be retried (409 for one sent, queued or being sent), and
 * only the newest message of a quote that is still open: an older one carries a link that no longer works.
 */
export async function retryMessage(config: Config, id: number): Promise<OutboxMessage> {
  const m = await OutboxMessage.findByPk(id);
  if (!m) throw problems.notFound('Message');
  if (m.status !== 'failed') throw problems.conflict('not_failed', `Message ${m.id} is ${m.status}: only a message that failed can be retried.`);
  if (m.quoteId) {
    const quote = await Quote.findByPk(m.quoteId, { attributes: ['id', 'number', 'state'] });
    const newest = await OutboxMessage.max<number, OutboxMessage>('id', { where: { quoteId: m.quoteId } });
    if (quote && !['draft', 'quoted', 'viewed'].includes(quote.state)) {
      throw problems.conflict('quote_closed', `Quote ${quote.number} is ${quote.state}: its message is not sent again.`);
    }
    if (newest !== null && newest !== m.id) {
      throw problems.conflict('message_superseded', `A newer message for quote ${quote?.number ?? m.quoteId} was made after this one: its link is the one that works.`);
    }
  }
  if (!(await claim(id, ['failed']))) throw problems.conflict('not_failed', `Message ${m.id} is already being sent or was sent.`);
  return send(config, m);
}

/** The service's sending address out of MAIL_FROM ("Shellwright quotes <quotes@…>" → quotes@…). */
export function sendingAddress(from: string): string {
  const m = /<([^<>\s]+@[^<>\s]+)>\s*$/.exec(from);
  return (m ? m[1]! : from).trim();
}

/**
 * Who a message is from: the workshop the work runs under, by name, at the service's own sending address (so the
 * mail passes the service's sender checks), with replies going to the workshop's own e-mail when it has one. Under
 * no workshop (nothing to read) it is MAIL_FROM as configured.
 */
export async function senderOf(config: Config): Promise<{ from: string | { name: string; address: string }; replyTo?: string }> {
  const workshop = await Workshop.findOne({ attributes: ['id', 'name', 'email'], order: [['id', 'ASC']] });
  if (!workshop) return { from: config.mail.from };
  return { from: { name: workshop.name, address: sendingAddress(config.mail.from) }, ...(workshop.email ? { replyTo: workshop.email } : {}) };
}

async function send(config: Config, m: OutboxMessage): Promise<OutboxMessage> {
  try {
    const info = await transport(config).sendMail({
      ...(await senderOf(config)),
      to: m.toAddress,
      subject: m.subject,
      text: m.textBody,
      html: m.htmlBody,
      attachments: m.attachment && m.attachmentName ? [{ filename: m.attachmentName, content: m.attachment, contentType: 'application/pdf' }] : [],
    });
    await m.update({ status: 'sent', attempts: m.attempts + 1, lastError: null, messageId: String(info.messageId ?? ''), sentAt: new Date() });
  } catch (err) {
    await m.update({ status: 'failed', attempts: m.attempts + 1, lastError: err instanceof Error ? err.message : String(err) });
  }
  return m;
}
