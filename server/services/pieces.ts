import { Op, type Sequelize, type WhereOptions } from 'sequelize';
import type { Page } from '@shared/schemas/auth';
import type { Piece as PieceDto, PieceInputSchema, PieceListQuerySchema } from '@shared/schemas/customers';
import type { z } from 'zod';
import { parsePieceYear } from '@shared/piece-year';
import { problems } from '../http/problem';
import { Customer, Piece, PiecePhoto } from '../models';
import { audit } from './audit';
import { containsPattern, direction, offset } from './paging';
import { photoDto } from './photos';

type ListQuery = z.output<typeof PieceListQuerySchema>;
type Input = z.output<typeof PieceInputSchema>;

/** The stored pair for a year as given: a number is exact, text is read as written, empty or null clears it. */
function yearFields(given: number | string | null | undefined): { year: number | null; yearText: string | null } {
  if (given === undefined || given === null) return { year: null, yearText: null };
  if (typeof given === 'number') return { year: given, yearText: String(given) };
  const parsed = parsePieceYear(given);
  return parsed ? { year: parsed.year, yearText: parsed.text } : { year: null, yearText: null };
}

export function pieceDto(p: Piece): PieceDto {
  return {
    id: p.id,
    customerId: p.customerId,
    customerName: p.customer?.name ?? '',
    kind: p.kind,
    description: p.description,
    maker: p.maker,
    year: p.year,
    yearText: p.yearText ?? (p.year === null ? null : String(p.year)),
    serial: p.serial,
    dimensions: p.dimensions,
    conditionNotes: p.conditionNotes,
    photos: (p.photos ?? []).sort((a, b) => a.id - b.id).map(photoDto),
    archived: p.archived,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}

const includes = [
  { model: Customer, as: 'customer', attributes: ['id', 'name'] },
  { model: PiecePhoto, as: 'photos' },
];

export async function getPiece(id: number): Promise<PieceDto> {
  const p = await Piece.findByPk(id, { include: includes });
  if (!p) throw problems.notFound('Piece');
  return pieceDto(p);
}

export async function listPieces(q: ListQuery): Promise<Page<PieceDto>> {
  const where: WhereOptions<Piece> = { archived: false };
  if (q.customerId) Object.assign(where, { customerId: q.customerId });
  if (q.kind) Object.assign(where, { kind: q.kind });
  if (q.q) {
    const like = containsPattern(q.q);
    Object.assign(where, {
      [Op.or]: [{ description: { [Op.iLike]: like } }, { maker: { [Op.iLike]: like } }, { serial: { [Op.iLike]: like } }, { '$customer.name$': { [Op.iLike]: like } }],
    });
  }
  const order =
    q.sort === 'customer'
      ? [[{ model: Customer, as: 'customer' }, 'name', direction(q.dir)] as const]
      : [[q.sort, direction(q.dir)] as const];
  const { rows, count } = await Piece.findAndCountAll({
    where,
    include: [{ model: Customer, as: 'customer', attributes: ['id', 'name'] }],
    order: [...order, ['id', 'ASC']] as never,
    limit: q.pageSize,
    offset: offset(q.page, q.pageSize),
  });
  const photos = await PiecePhoto.findAll({ where: { pieceId: rows.map((r) => r.id) }, order: [['id', 'ASC']] });
  for (const r of rows) r.photos = photos.filter((ph) => ph.pieceId === r.id);
  return { rows: rows.map(pieceDto), total: count, page: q.page, pageSize: q.pageSize };
}

export async function createPiece(sequelize: Sequelize, actorId: number, input: Input): Promise<PieceDto> {
  const id = await sequelize.transaction(async (transaction) => {
    const customer = await Customer.findByPk(input.customerId, { transaction });
    if (!customer) throw problems.badRequest('unknown_customer', 'customerId: no such customer', 'customerId');
    const p = await Piece.create(
      {
        customerId: input.customerId,
        kind: input.kind,
        description: input.description,
        maker: input.maker ?? null,
        ...yearFields(input.year),
        serial: input.serial ?? null,
        dimensions: input.dimensions,
        conditionNotes: input.conditionNotes ?? null,
      },
      { transaction },
    );
    await audit({ userId: actorId, action: 'piece.create', entityType: 'piece', entityId: p.id, after: { description: p.description, kind: p.kind } }, transaction);
    return p.id;
  });
  return getPiece(id);
}

export async function updatePiece(sequelize: Sequelize, actorId: number, id: number, input: Partial<Input>): Promise<PieceDto> {
  await sequelize.transaction(async (transaction) => {
    const p = await Piece.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!p) throw problems.notFound('Piece');
    if (input.customerId !== undefined && !(await Customer.findByPk(input.customerId, { transaction }))) {
      throw problems.badRequest('unknown_customer', 'customerId: no such customer', 'customerId');
    }
    const before = p.toJSON();
    for (const key of ['customerId', 'kind', 'description', 'maker', 'serial', 'dimensions', 'conditionNotes'] as const) {
      if (input[key] !== undefined) p.set(key, input[key] as never);
    }
    if (input.year !== undefined) p.set(yearFields(input.year));
    await p.save({ transaction });
    await audit({ userId: actorId, action: 'piece.update', entityType: 'piece', entityId: id, before, after: p.toJSON() }, transaction);
  });
  return getPiece(id);
}
