/**
 * Sends what is in the outbox through SMTP (nodemailer). A message is marked sent only when the server accepted
 * it; a failure is kept with its reason and can be retried.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';
import { problems } from '../http/problem';
import { OutboxMessage } from '../models';
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

/** Tries to deliver one outbox message now; returns it with its new status. */
export async function deliver(config: Config, id: number): Promise<OutboxMessage> {
  const m = await OutboxMessage.findByPk(id);
  if (!m) throw problems.notFound('Message');
  if (m.status === 'sent') return m;
  try {
    const info = await transport(config).sendMail({
      from: config.mail.from,
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
