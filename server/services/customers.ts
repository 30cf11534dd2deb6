import { Op, QueryTypes, type Sequelize, type WhereOptions } from 'sequelize';
import { type CustomerInputSchema, type Customer as CustomerDto, type CustomerListQuerySchema } from '@shared/schemas/customers';
import type { Page } from '@shared/schemas/auth';
import type { z } from 'zod';
import { problems } from '../http/problem';
import { Customer } from '../models';
import { audit } from './audit';
import { anyOf, containsPattern, direction, offset, pageTotal } from './paging';

type ListQuery = z.output<typeof CustomerListQuerySchema>;
type Input = z.output<typeof CustomerInputSchema>;

async function counts(sequelize: Sequelize, ids: number[]): Promise<Map<number, { pieces: number; estimates: number }>> {
  const out = new Map<number, { pieces: number; estimates: number }>();
  if (ids.length === 0) return out;
  const rows = await sequelize.query<{ id: number; pieces: string; estimates: string }>(
    `SELECT c.id,
            (SELECT count(*) FROM pieces p WHERE p.customer_id = c.id AND NOT p.archived) AS pieces,
            (SELECT count(*) FROM estimates e WHERE e.customer_id = c.id AND NOT e.archived) AS estimates
       FROM customers c WHERE c.id IN (:ids)`,
    { replacements: { ids }, type: QueryTypes.SELECT },
  );
  for (const r of rows) out.set(r.id, { pieces: Number(r.pieces), estimates: Number(r.estimates) });
  return out;
}

function toDto(c: Customer, n?: { pieces: number; estimates: number }): CustomerDto {
  return {
    id: c.id,
    name: c.name,
    email: c.email,
    phone: c.phone,
    address: c.address,
    notes: c.notes,
    pieceCount: n?.pieces ?? 0,
    estimateCount: n?.estimates ?? 0,
    archived: c.archived,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

const SORT = { name: 'name', createdAt: 'createdAt', updatedAt: 'updatedAt' } as const;

export async function listCustomers(sequelize: Sequelize, q: ListQuery): Promise<Page<CustomerDto>> {
  const where: WhereOptions<Customer> = { archived: q.archived === 'true' };
  if (q.q) {
    // Name, e-mail or phone, through the trigram indexes (the search function: an ILIKE under row-level security
    // cannot use an index, migration 2026.12.08T50.00).
    const like = sequelize.escape(containsPattern(q.q));
    Object.assign(where, { [Op.and]: [anyOf('"Customer"."id"', `SELECT shellwright_search_customers(${like})`)] });
  }
  const rows = await Customer.findAll({
    where,
    order: [
      [SORT[q.sort], direction(q.dir)],
      ['id', 'ASC'],
    ],
    limit: q.pageSize,
    offset: offset(q.page, q.pageSize),
  });
  const total = await pageTotal(rows.length, q, async (limit) => (await Customer.findAll({ where, attributes: ['id'], limit, raw: true })).length);
  const n = await counts(sequelize, rows.map((r) => r.id));
  return { rows: rows.map((r) => toDto(r, n.get(r.id))), ...total, page: q.page, pageSize: q.pageSize };
}

export async function getCustomer(sequelize: Sequelize, id: number): Promise<CustomerDto> {
  const c = await Customer.findByPk(id);
  if (!c) throw problems.notFound('Customer');
  return toDto(c, (await counts(sequelize, [id])).get(id));
}

export async function createCustomer(sequelize: Sequelize, actorId: number, input: Input): Promise<CustomerDto> {
  return sequelize.transaction(async (transaction) => {
    const c = await Customer.create(
      { name: input.name, email: input.email ?? null, phone: input.phone ?? null, address: input.address ?? null, notes: input.notes ?? null },
      { transaction },
    );
    await audit({ userId: actorId, action: 'customer.create', entityType: 'customer', entityId: c.id, after: { name: c.name } }, transaction);
    return toDto(c);
  });
}

export async function updateCustomer(sequelize: Sequelize, actorId: number, id: number, input: Partial<Input>): Promise<CustomerDto> {
  await sequelize.transaction(async (transaction) => {
    const c = await Customer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!c) throw problems.notFound('Customer');
    const before = { name: c.name, email: c.email, phone: c.phone, address: c.address };
    for (const key of ['name', 'email', 'phone', 'address', 'notes'] as const) {
      if (input[key] !== undefined) c.set(key, input[key] as never);
    }
    await c.save({ transaction });
    await audit({ userId: actorId, action: 'customer.update', entityType: 'customer', entityId: id, before, after: { name: c.name, email: c.email, phone: c.phone, address: c.address } }, transaction);
  });
  return getCustomer(sequelize, id);
}

export async function archiveCustomer(sequelize: Sequelize, actorId: number, id: number, archived: boolean): Promise<CustomerDto> {
  await sequelize.transaction(async (transaction) => {
    const c = await Customer.findByPk(id, { transaction });
    if (!c) throw problems.notFound('Customer');
    await c.update({ archived }, { transaction });
    await audit({ userId: actorId, action: archived ? 'customer.archive' : 'customer.restore', entityType: 'customer', entityId: id }, transaction);
  });
  return getCustomer(sequelize, id);
}
