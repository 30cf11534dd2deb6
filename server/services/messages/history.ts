/** Every message sent to a customer, with its state, for the customer's page: sorted and paged. */
import { MESSAGE_KIND_LABELS, type CustomerMessageDto, type CustomerMessagesPage, type CustomerMessagesQuery, type MessageKind } from '@shared/schemas/messages';
import { Op, QueryTypes } from 'sequelize';
import { problems } from '../../http/problem';
import { Customer, OutboxMessage } from '../../models';
import { pageTotal } from '../paging';

const ORDER: Record<CustomerMessagesQuery['sort'], string> = { createdAt: 'createdAt', sentAt: 'sentAt', status: 'status', subject: 'subject' };

function row(m: OutboxMessage): CustomerMessageDto {
  const kind = (m.kind ?? null) as MessageKind | null;
  return {
    id: m.id,
    kind,
    label: kind && kind in MESSAGE_KIND_LABELS ? MESSAGE_KIND_LABELS[kind] : m.subject,
    subject: m.subject,
    to: m.toAddress,
    status: m.status,
    attempts: m.attempts,
    lastError: m.lastError,
    createdAt: m.createdAt.toISOString(),
    sendAfter: m.sendAfter ? m.sendAfter.toISOString() : null,
    sentAt: m.sentAt ? m.sentAt.toISOString() : null,
    quoteId: m.quoteId,
  };
}

export async function listCustomerMessages(customerId: number, q: CustomerMessagesQuery): Promise<CustomerMessagesPage> {
  if (!(await Customer.findByPk(customerId, { attributes: ['id'] }))) throw problems.notFound('Customer');
  const where = { customerId: { [Op.eq]: customerId } };
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const found = await OutboxMessage.findAll({
    where,
    attributes: { exclude: ['attachment', 'htmlBody', 'textBody'] },
    order: [[ORDER[q.sort], q.dir === 'asc' ? 'ASC NULLS FIRST' : 'DESC NULLS LAST'], ['id', dir]],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  const total = await pageTotal(found.length, q, async (limit) => {
    const [r] = await OutboxMessage.sequelize!.query<{ n: number }>('SELECT count(*)::int AS n FROM (SELECT 1 FROM outbox WHERE customer_id = :customerId LIMIT :limit) t', {
      type: QueryTypes.SELECT,
      replacements: { customerId, limit },
    });
    return r?.n ?? 0;
  });
  return { rows: found.map(row), ...total, page: q.page, pageSize: q.pageSize };
}
