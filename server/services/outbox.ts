/**
 * The outbox as staff read it: the paged list of messages, one message, its attachment, and a retry that marks the
 * quote sent once its message goes. Sending itself lives in mail.ts.
 */
import type { Sequelize } from 'sequelize';
import { problems } from '../http/problem';
import { OutboxMessage } from '../models';
import { outboxDetail, outboxSummary, retryMessage } from './mail';
import { markSent } from './quotes';
import type { Config } from '../config';

export interface OutboxQuery {
  status?: 'queued' | 'sent' | 'failed';
  page: number;
  pageSize: number;
}

export async function listOutbox(query: OutboxQuery) {
  const { rows, count } = await OutboxMessage.findAndCountAll({
    where: query.status ? { status: query.status } : {},
    attributes: { exclude: ['attachment', 'htmlBody', 'textBody'] },
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { rows: rows.map(outboxSummary), total: count, page: query.page, pageSize: query.pageSize };
}

export async function getOutboxMessage(id: number) {
  const m = await OutboxMessage.findByPk(id, { attributes: { exclude: ['attachment'] } });
  if (!m) throw problems.notFound('Message');
  return outboxDetail(m);
}

export async function outboxAttachment(id: number): Promise<{ name: string; pdf: Buffer }> {
  const m = await OutboxMessage.findByPk(id);
  if (!m || !m.attachment) throw problems.notFound('Attachment');
  return { name: (m.attachmentName ?? 'attachment').replace(/\.pdf$/, ''), pdf: m.attachment };
}

/**
 * Tries a failed message again (only a failed one: 409 otherwise). A quote not yet sent becomes sent once its
 * message goes; nothing else about the quote or its estimate changes.
 */
export async function retryOutboxMessage(sequelize: Sequelize, config: Config, id: number) {
  const m = await retryMessage(config, id);
  if (m.status === 'sent' && m.quoteId) await markSent(sequelize, m.quoteId);
  return getOutboxMessage(m.id);
}
