/**
 * Estimates and their revisions. Every save recomputes with the shared engine against the current price list and
 * stores an immutable revision (inputs, price-list version and snapshot, results, cautions, who and when).
 */
import { Op, QueryTypes, type Includeable, type Order, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import type { Page } from '@shared/schemas/auth';
import {
  OPEN_STATES,
  type CreateEstimateSchema,
  type CreateRevisionSchema,
  type EstimateDetail,
  type EstimateListQuerySchema,
  type EstimateState,
  type EstimateSummary,
  type Revision,
  type RevisionSummary,
} from '@shared/schemas/estimates';
import { HttpProblem, problems } from '../http/problem';
import { Customer, Estimate, EstimateRevision, Piece, User } from '../models';
import { audit } from './audit';
import { loadCatalog, type LoadedCatalog } from './catalog';
import { runEngine, withWorkshopDefaults } from './estimator';
import { anyOf, containsPattern, direction, offset, pageTotal } from './paging';

type CreateInput = z.output<typeof CreateEstimateSchema>;
type RevisionInput = z.output<typeof CreateRevisionSchema>;
type ListQuery = z.output<typeof EstimateListQuerySchema>;

const summaryIncludes: Includeable[] = [
  { model: Customer, as: 'customer', attributes: ['id', 'name'] },
  { model: Piece, as: 'piece', attributes: ['id', 'description', 'kind'] },
  { model: User, as: 'owner', attributes: ['id', 'name'] },
];

export function summaryDto(e: Estimate): EstimateSummary {
  return {
    id: e.id,
    number: e.number,
    title: e.title,
    state: e.state,
    customer: { id: e.customer!.id, name: e.customer!.name },
    piece: { id: e.piece!.id, description: e.piece!.description, kind: e.piece!.kind },
    owner: { id: e.owner!.id, name: e.owner!.name },
    labourHours: Number(e.labourHours),
    total: Number(e.total).toFixed(2),
    currency: e.currency,
    revisionCount: e.revisionCount,
    validUntil: e.validUntil,
    archived: e.archived,
    createdAt: e.createdAt.toISOString(),
    updatedAt: e.updatedAt.toISOString(),
  };
}

function revisionSummary(r: EstimateRevision): RevisionSummary {
  return {
    id: r.id,
    number: r.number,
    total: Number(r.total).toFixed(2),
    labourHours: Number(r.labourHours),
    catalogVersion: r.catalogVersion,
    note: r.note,
    createdBy: { id: r.author?.id ?? 0, name: r.author?.name ?? 'former user' },
    createdAt: r.createdAt.toISOString(),
  };
}

function revisionDto(r: EstimateRevision): Revision {
  return { ...revisionSummary(r), input: r.input, result: r.result };
}

/** Re-raises a validation problem of the engine input with the field under `input.`. */
function underInput<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof HttpProblem && err.status === 400) {
      const prefix = (f: string) => (f === '(body)' ? 'input' : `input.${f}`);
      const errors = err.extra.errors?.map((e) => ({ field: prefix(e.field), message: e.message }));
      const field = err.extra.field ? prefix(err.extra.field) : 'input';
      throw new HttpProblem(400, err.code, err.title, `${field}: ${errors?.[0]?.message ?? err.detail}`, { field, errors });
    }
    throw err;
  }
}

function addDays(date: Date, days: number): string {
  const d = new Date(date.getTime() + days * 86_400_000);
  return d.toISOString().slice(0, 10);
}

async function nextNumber(sequelize: Sequelize, transaction: Transaction): Promise<string> {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('estimate_number_seq') AS n", { type: QueryTypes.SELECT, transaction });
  return `EST-${new Date().getFullYear()}-${String(row!.n).padStart(4, '0')}`;
}

function priced(rawInput: unknown, loaded: LoadedCatalog) {
  const input = underInput(() => withWorkshopDefaults(rawInput, loaded.settings));
  const result = underInput(() => runEngine(input, loaded));
  return { input, result };
}

async function writeRevision(
  estimate: Estimate,
  number: number,
  rawInput: unknown,
  loaded: LoadedCatalog,
  actorId: number,
  note: string,
  transaction: Transaction,
): Promise<EstimateRevision> {
  const { input, result } = priced(rawInput, loaded);
  const revision = await EstimateRevision.create(
    {
      estimateId: estimate.id,
      number,
      input,
      result,
      catalogVersion: loaded.catalog.version,
      catalog: loaded.catalog,
      total: result.totals.price,
      labourHours: result.totals.labourHours.toFixed(2),
      note,
      createdBy: actorId,
    },
    { transaction },
  );
  await estimate.update(
    { revisionCount: number, currentRevisionId: revision.id, total: result.totals.price, labourHours: result.totals.labourHours.toFixed(2), currency: result.totals.currency },
    { transaction },
  );
  return revision;
}

export async function getEstimate(id: number, transaction?: Transaction): Promise<EstimateDetail> {
  const e = await Estimate.findByPk(id, { include: summaryIncludes, transaction });
  if (!e) throw problems.notFound('Estimate');
  const revisions = await EstimateRevision.findAll({
    where: { estimateId: id },
    attributes: { exclude: ['input', 'result', 'catalog'] },
    include: [{ model: User, as: 'author', attributes: ['id', 'name'] }],
    order: [['number', 'DESC']],
    transaction,
  });
  // The revision's price-list snapshot is large and not part of the answer: leave it in the database.
  const current = await EstimateRevision.findByPk(e.currentRevisionId!, {
    attributes: { exclude: ['catalog'] },
    include: [{ model: User, as: 'author', attributes: ['id', 'name'] }],
    transaction,
  });
  if (!current) throw new HttpProblem(500, 'estimate_without_revision', 'Estimate has no revision');
  return { ...summaryDto(e), revisions: revisions.map(revisionSummary), current: revisionDto(current) };
}

export async function getRevision(estimateId: number, number: number): Promise<Revision> {
  const r = await EstimateRevision.findOne({ where: { estimateId, number }, attributes: { exclude: ['catalog'] }, include: [{ model: User, as: 'author', attributes: ['id', 'name'] }] });
  if (!r) throw problems.notFound('Revision');
  return revisionDto(r);
}

export async function createEstimate(sequelize: Sequelize, actorId: number, body: CreateInput): Promise<EstimateDetail> {
  return sequelize.transaction(async (transaction) => {
    const customer = await Customer.findByPk(body.customerId, { transaction });
    if (!customer) throw problems.badRequest('unknown_customer', 'customerId: no such customer', 'customerId');
    const piece = await Piece.findByPk(body.pieceId, { transaction });
    if (!piece) throw problems.badRequest('unknown_piece', 'pieceId: no such piece', 'pieceId');
    if (piece.customerId !== customer.id) throw problems.badRequest('piece_not_customers', "pieceId: the piece is not this customer's", 'pieceId');
    const loaded = await loadCatalog(sequelize, { transaction });
    const estimate = await Estimate.create(
      {
        number: await nextNumber(sequelize, transaction),
        customerId: customer.id,
        pieceId: piece.id,
        ownerId: actorId,
        title: body.title || piece.description,
        validUntil: addDays(new Date(), loaded.settings.quoteValidityDays),
        currentRevisionId: null,
        currency: loaded.settings.pricing.currency,
      },
      { transaction },
    );
    await writeRevision(estimate, 1, body.input, loaded, actorId, body.note ?? '', transaction);
    await audit({ userId: actorId, action: 'estimate.create', entityType: 'estimate', entityId: estimate.id, after: { number: estimate.number, total: estimate.total } }, transaction);
    return getEstimate(estimate.id, transaction);
  });
}

async function lockOpen(id: number, transaction: Transaction): Promise<Estimate> {
  const estimate = await Estimate.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!estimate) throw problems.notFound('Estimate');
  if (!OPEN_STATES.includes(estimate.state)) {
    throw problems.conflict('estimate_closed', `Estimate ${estimate.number} is ${estimate.state}: it can no longer be revised. Duplicate it to make a new one.`);
  }
  if (estimate.archived) throw problems.conflict('estimate_archived', `Estimate ${estimate.number} is archived. Restore it to revise it.`);
  return estimate;
}

export async function reviseEstimate(sequelize: Sequelize, actorId: number, id: number, body: RevisionInput): Promise<EstimateDetail> {
  return sequelize.transaction(async (transaction) => {
    const estimate = await lockOpen(id, transaction);
    if (body.baseRevision !== estimate.revisionCount) {
      const latest = await EstimateRevision.findOne({ where: { estimateId: id, number: estimate.revisionCount }, include: [{ model: User, as: 'author', attributes: ['name'] }], transaction });
      throw new HttpProblem(
        409,
        'stale_revision',
        'Saved by someone else',
        `Revision ${estimate.revisionCount} was saved by ${latest?.author?.name ?? 'someone'} at ${latest?.createdAt.toISOString().slice(0, 16).replace('T', ' ')} after you opened revision ${body.baseRevision}. Your changes were not saved: reload the latest revision and apply them again.`,
        { field: 'baseRevision' },
      );
    }
    const loaded = await loadCatalog(sequelize, { transaction });
    if (body.title) await estimate.update({ title: body.title }, { transaction });
    const before = { total: estimate.total, revision: estimate.revisionCount };
    await writeRevision(estimate, estimate.revisionCount + 1, body.input, loaded, actorId, body.note ?? '', transaction);
    await audit({ userId: actorId, action: 'estimate.revise', entityType: 'estimate', entityId: id, before, after: { total: estimate.total, revision: estimate.revisionCount } }, transaction);
    return getEstimate(id, transaction);
  });
}

/** Prices an open estimate's current inputs again with today's price list, as a new revision. */
export async function repriceEstimate(sequelize: Sequelize, actorId: number, id: number, loaded?: LoadedCatalog): Promise<EstimateDetail> {
  return sequelize.transaction(async (transaction) => {
    const estimate = await lockOpen(id, transaction);
    const current = await EstimateRevision.findByPk(estimate.currentRevisionId!, { transaction });
    if (!current) throw new HttpProblem(500, 'estimate_without_revision', 'Estimate has no revision');
    const catalog = loaded ?? (await loadCatalog(sequelize, { transaction }));
    const before = { total: estimate.total, revision: estimate.revisionCount, catalogVersion: current.catalogVersion };
    await writeRevision(estimate, estimate.revisionCount + 1, current.input, catalog, actorId, `Repriced with price list ${catalog.catalog.version}`, transaction);
    await audit({ userId: actorId, action: 'estimate.reprice', entityType: 'estimate', entityId: id, before, after: { total: estimate.total, revision: estimate.revisionCount, catalogVersion: catalog.catalog.version } }, transaction);
    return getEstimate(id, transaction);
  });
}

export interface RepriceRow {
  id: number;
  number: string;
  title: string;
  customer: string;
  state: EstimateState;
  catalogVersion: string;
  oldTotal: string;
  newTotal: string;
  currency: string;
}

/** Open estimates priced with another price list than today's, with their total now. */
export async function repriceCandidates(sequelize: Sequelize): Promise<{ catalogVersion: string; rows: RepriceRow[] }> {
  const loaded = await loadCatalog(sequelize);
  const estimates = await Estimate.findAll({
    where: { state: { [Op.in]: [...OPEN_STATES] }, archived: false },
    include: [{ model: Customer, as: 'customer', attributes: ['name'] }],
    order: [['number', 'ASC']],
    limit: 500,
  });
  const revisions = await EstimateRevision.findAll({
    where: { id: estimates.map((e) => e.currentRevisionId!).filter(Boolean) },
    attributes: ['id', 'input', 'catalogVersion'],
  });
  const byId = new Map(revisions.map((r) => [r.id, r]));
  const rows: RepriceRow[] = [];
  for (const e of estimates) {
    const r = byId.get(e.currentRevisionId!);
    if (!r || r.catalogVersion === loaded.catalog.version) continue;
    const { result } = priced(r.input, loaded);
    rows.push({
      id: e.id,
      number: e.number,
      title: e.title,
      customer: e.customer?.name ?? '',
      state: e.state,
      catalogVersion: r.catalogVersion,
      oldTotal: Number(e.total).toFixed(2),
      newTotal: result.totals.price,
      currency: result.totals.currency,
    });
  }
  return { catalogVersion: loaded.catalog.version, rows };
}

export async function setEstimateState(sequelize: Sequelize, actorId: number, id: number, state: 'draft' | 'priced'): Promise<EstimateDetail> {
  return sequelize.transaction(async (transaction) => {
    const estimate = await lockOpen(id, transaction);
    const before = estimate.state;
    await estimate.update({ state }, { transaction });
    await audit({ userId: actorId, action: 'estimate.state', entityType: 'estimate', entityId: id, before: { state: before }, after: { state } }, transaction);
    return getEstimate(id, transaction);
  });
}

export async function archiveEstimate(sequelize: Sequelize, actorId: number, id: number, archived: boolean): Promise<EstimateDetail> {
  return sequelize.transaction(async (transaction) => {
    const estimate = await Estimate.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!estimate) throw problems.notFound('Estimate');
    await estimate.update({ archived }, { transaction });
    await audit({ userId: actorId, action: archived ? 'estimate.archive' : 'estimate.restore', entityType: 'estimate', entityId: id }, transaction);
    return getEstimate(id, transaction);
  });
}

/** A new draft from an estimate's current inputs, for the same piece or another. */
export async function duplicateEstimate(sequelize: Sequelize, actorId: number, id: number, pieceId?: number): Promise<EstimateDetail> {
  const source = await Estimate.findByPk(id);
  if (!source) throw problems.notFound('Estimate');
  const current = await EstimateRevision.findByPk(source.currentRevisionId!);
  if (!current) throw new HttpProblem(500, 'estimate_without_revision', 'Estimate has no revision');
  const piece = pieceId ? await Piece.findByPk(pieceId) : await Piece.findByPk(source.pieceId);
  if (!piece) throw problems.badRequest('unknown_piece', 'pieceId: no such piece', 'pieceId');
  return createEstimate(sequelize, actorId, {
    customerId: piece.customerId,
    pieceId: piece.id,
    title: pieceId ? piece.description : `${source.title} (copy)`,
    input: current.input,
    note: `Copied from ${source.number} revision ${current.number}`,
  });
}

const SORTS: Record<ListQuery['sort'], unknown[]> = {
  number: ['number', 'ASC'],
  customer: [{ model: Customer, as: 'customer' }, 'name', 'ASC'],
  state: ['state', 'ASC'],
  labourHours: ['labourHours', 'ASC'],
  total: ['total', 'ASC'],
  updatedAt: ['updatedAt', 'ASC'],
};

export async function listEstimates(q: ListQuery): Promise<Page<EstimateSummary>> {
  const where: WhereOptions<Estimate> = { archived: q.archived === 'true' };
  if (q.state) Object.assign(where, { state: q.state });
  if (q.customerId) Object.assign(where, { customerId: q.customerId });
  if (q.q) {
    // Each table's trigram index: the estimate's number and title, and the estimates of matching customers and pieces.
    const like = Estimate.sequelize!.escape(containsPattern(q.q));
    Object.assign(where, {
      [Op.or]: [
        { number: { [Op.iLike]: containsPattern(q.q) } },
        { title: { [Op.iLike]: containsPattern(q.q) } },
        anyOf('"Estimate"."customer_id"', `SELECT id FROM customers WHERE name ILIKE ${like}`),
        anyOf('"Estimate"."piece_id"', `SELECT id FROM pieces WHERE description ILIKE ${like}`),
      ],
    });
  }
  const sort = SORTS[q.sort];
  const order = [[...sort.slice(0, -1), direction(q.dir)], ['id', 'DESC']] as Order;
  const rows = await Estimate.findAll({ where, include: summaryIncludes, order, limit: q.pageSize, offset: offset(q.page, q.pageSize) });
  const total = await pageTotal(rows.length, q, async (limit) => (await Estimate.findAll({ where, attributes: ['id'], limit, raw: true })).length);
  return { rows: rows.map(summaryDto), ...total, page: q.page, pageSize: q.pageSize };
}
