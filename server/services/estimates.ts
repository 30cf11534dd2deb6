/**
 * Estimates and their revisions. Every save recomputes with the shared engine against the current price list and
 * stores an immutable revision (inputs, price-list version and snapshot, results, cautions, who and when).
 */
import { estimateStateSql } from './quote-expiry';
import { formatDate } from '@shared/format';
import { dayOf, daysFromToday, today as workshopToday } from '@shared/time';
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { validationSentence } from '@shared/schemas/error-map';
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
  type RepriceCandidates,
  type RepriceRow,
  type Revision,
  type RevisionSummary,
} from '@shared/schemas/estimates';
import { isDeepStrictEqual } from 'node:util';
import { HttpProblem, problems } from '../http/problem';
import { Customer, Estimate, EstimateRevision, Piece, User } from '../models';
import { allOf } from '../db/queries';
import { plannedSelect } from '../db/planned';
import { withAgreements } from './agreements';
import { audit } from './audit';
import { loadCatalog, type LoadedCatalog } from './catalog';
import { runEngine, withWorkshopDefaults } from './estimator';
import { nextRecordNumber } from './numbering';
import { containsPattern, countLimit, direction, offset, pageTotal } from './paging';

type CreateInput = z.output<typeof CreateEstimateSchema>;
type RevisionInput = z.output<typeof CreateRevisionSchema>;
type ListQuery = z.output<typeof EstimateListQuerySchema>;

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
      throw new HttpProblem(400, err.code, err.title, err.detail ?? validationSentence(field.split('.'), errors?.[0]?.message ?? 'is not valid'), { field, errors });
    }
    throw err;
  }
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

interface RevisionRow {
  id: number;
  number: number;
  total: string;
  labour_hours: string;
  catalog_version: string;
  note: string;
  created_at: Date;
  author_id: number | null;
  author_name: string | null;
  input: Revision['input'] | null;
  result: Revision['result'] | null;
}

/**
 * An estimate with its revisions and the current one in full: two plain queries (the estimate, then its revisions
 * with only the current one's inputs and results; never the price-list snapshots).
 */
export async function getEstimate(id: number, transaction?: Transaction): Promise<EstimateDetail> {
  const sequelize = Estimate.sequelize!;
  // Plans kept per connection (server/db/planned.ts), the estimate's id sent as a parameter.
  const [e] = await plannedSelect<SummaryRow & { current_revision_id: number | null }>(sequelize, `${SUMMARY_SELECT()}, e.current_revision_id ${SUMMARY_FROM} WHERE e.id = $1`, {
    bind: [id],
    transaction,
  });
  if (!e) throw problems.notFound('Estimate');
  // The revisions and the agreed figures side by side (one after another inside a transaction).
  const [rows, [summary]] = await allOf(transaction, [
    () =>
      plannedSelect<RevisionRow>(
        sequelize,
        `SELECT r.id, r.number, r.total, r.labour_hours, r.catalog_version, r.note, r.created_at, u.id AS author_id, u.name AS author_name,
                CASE WHEN r.id = $2 THEN r.input END AS input, CASE WHEN r.id = $2 THEN r.result END AS result
           FROM estimate_revisions r LEFT JOIN users u ON u.id = r.created_by
          WHERE r.estimate_id = $1
          ORDER BY r.number DESC`,
        { bind: [id, e.current_revision_id ?? 0], transaction },
      ),
    () => withAgreements([summaryFromRow(e)]),
  ] as const);
  const summaryOf = (r: RevisionRow): RevisionSummary => ({
    id: r.id,
    number: r.number,
    total: Number(r.total).toFixed(2),
    labourHours: Number(r.labour_hours),
    catalogVersion: r.catalog_version,
    note: r.note,
    createdBy: { id: r.author_id ?? 0, name: r.author_name ?? 'former user' },
    createdAt: new Date(r.created_at).toISOString(),
  });
  const current = rows.find((r) => r.id === e.current_revision_id);
  if (!current || current.input === null || current.result === null) throw new HttpProblem(500, 'estimate_without_revision', 'Estimate has no revision');
  const labels = await priceListLabels(rows.map((r) => r.catalog_version), undefined, transaction);
  const named = <T extends RevisionSummary>(r: T): T => {
    const priceList = labels.get(r.catalogVersion) ?? '';
    // Notes written before price lists had names spoke of the hash.
    return { ...r, priceList, note: r.note.replace(/price list pl-[0-9a-f]{6,}/g, priceList) };
  };
  return { ...summary!, revisions: rows.map((r) => named(summaryOf(r))), current: named({ ...summaryOf(current), input: current.input, result: current.result }) };
}

export async function getRevision(estimateId: number, number: number): Promise<Revision> {
  const r = await EstimateRevision.findOne({ where: { estimateId, number }, attributes: { exclude: ['catalog'] }, include: [{ model: User, as: 'author', attributes: ['id', 'name'] }] });
  if (!r) throw problems.notFound('Revision');
  return revisionDto(r);
}

export async function createEstimate(sequelize: Sequelize, actorId: number, body: CreateInput): Promise<EstimateDetail> {
  // Read back after the commit: the workshop's estimate counter stays locked until then, and a read on a second
  // connection while holding it would tie up the pool when many estimates are made at once.
  const id = await sequelize.transaction(async (transaction) => {
    const customer = await Customer.findByPk(body.customerId, { transaction });
    if (!customer) throw problems.badRequest('unknown_customer', 'customerId: no such customer', 'customerId');
    const piece = await Piece.findByPk(body.pieceId, { transaction });
    if (!piece) throw problems.badRequest('unknown_piece', 'pieceId: no such piece', 'pieceId');
    if (piece.customerId !== customer.id) throw problems.badRequest('piece_not_customers', "pieceId: the piece is not this customer's", 'pieceId');
    const loaded = await loadCatalog(sequelize, { transaction });
    const estimate = await Estimate.create(
      {
        number: await nextRecordNumber(sequelize, 'estimate', transaction),
        customerId: customer.id,
        pieceId: piece.id,
        ownerId: actorId,
        title: body.title || piece.description,
        validUntil: daysFromToday(loaded.settings.quoteValidityDays, loaded.settings.timeZone),
        currentRevisionId: null,
        currency: loaded.settings.pricing.currency,
      },
      { transaction },
    );
    await writeRevision(estimate, 1, body.input, loaded, actorId, body.note ?? '', transaction);
    await audit({ userId: actorId, action: 'estimate.create', entityType: 'estimate', entityId: estimate.id, after: { number: estimate.number, total: estimate.total } }, transaction);
    return estimate.id;
  });
  return getEstimate(id);
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

/**
 * What a price list means to a customer's estimate: its prices, quantities, labour, stages and cautions, leaving out
 * the price list's own name and the calendar's dates, so that two pricings can be compared.
 */
function pricedContent(result: unknown): unknown {
  if (!result || typeof result !== 'object') return result;
  const { catalogVersion: _version, calendar: _calendar, ...rest } = result as Record<string, unknown>;
  return JSON.parse(JSON.stringify(rest));
}

/** True when pricing the inputs with `loaded` would change nothing the estimate shows. */
function samePricing(stored: { catalogVersion: string; result: unknown }, loaded: LoadedCatalog, fresh: () => unknown): boolean {
  if (stored.catalogVersion === loaded.catalog.version) return true;
  return isDeepStrictEqual(pricedContent(stored.result), pricedContent(fresh()));
}

/**
 * A price list as people name it: "prices of 2 Dec 2026", the day it was first used to price an estimate (or
 * "today's prices" for one not used yet), never its content hash.
 */
export async function priceListLabels(versions: string[], current?: string, transaction?: Transaction): Promise<Map<string, string>> {
  const labels = new Map<string, string>();
  const unique = [...new Set(versions.filter(Boolean))];
  if (unique.length) {
    const rows = await plannedSelect<{ version: string; first: Date }>(
      EstimateRevision.sequelize!,
      'SELECT catalog_version AS version, min(created_at) AS first FROM estimate_revisions WHERE catalog_version = ANY($1::text[]) GROUP BY catalog_version',
      { bind: [unique], transaction },
    );
    for (const r of rows) {
      const day = formatDate(dayOf(new Date(r.first)));
      labels.set(r.version, r.version === current ? `today's prices (in use since ${day})` : `prices of ${day}`);
    }
  }
  for (const v of unique) if (!labels.has(v)) labels.set(v, v === current ? "today's prices" : 'an earlier price list');
  return labels;
}

/**
 * Prices an open estimate's current inputs again with today's price list, as a new revision. When today's list
 * changes nothing the estimate shows, no revision is written and `changed` is false.
 */
export async function repriceEstimate(sequelize: Sequelize, actorId: number, id: number, loaded?: LoadedCatalog): Promise<EstimateDetail & { changed: boolean }> {
  return sequelize.transaction(async (transaction) => {
    const estimate = await lockOpen(id, transaction);
    const current = await EstimateRevision.findByPk(estimate.currentRevisionId!, { transaction });
    if (!current) throw new HttpProblem(500, 'estimate_without_revision', 'Estimate has no revision');
    const catalog = loaded ?? (await loadCatalog(sequelize, { transaction }));
    if (samePricing(current, catalog, () => priced(current.input, catalog).result)) return { ...(await getEstimate(id, transaction)), changed: false };
    const before = { total: estimate.total, revision: estimate.revisionCount, catalogVersion: current.catalogVersion };
    const today = formatDate(workshopToday());
    await writeRevision(estimate, estimate.revisionCount + 1, current.input, catalog, actorId, `Repriced with prices of ${today}`, transaction);
    await audit({ userId: actorId, action: 'estimate.reprice', entityType: 'estimate', entityId: id, before, after: { total: estimate.total, revision: estimate.revisionCount, catalogVersion: catalog.catalog.version } }, transaction);
    return { ...(await getEstimate(id, transaction)), changed: true };
  });
}


/** Open estimates priced with another price list than today's, with their total now. */
export async function repriceCandidates(sequelize: Sequelize): Promise<RepriceCandidates> {
  const loaded = await loadCatalog(sequelize);
  const estimates = await Estimate.findAll({
    where: { state: { [Op.in]: [...OPEN_STATES] }, archived: false },
    include: [{ model: Customer, as: 'customer', attributes: ['name'] }],
    order: [['number', 'ASC']],
    limit: 500,
  });
  const revisions = await EstimateRevision.findAll({
    where: { id: estimates.map((e) => e.currentRevisionId!).filter(Boolean) },
    attributes: ['id', 'input', 'result', 'catalogVersion'],
  });
  const byId = new Map(revisions.map((r) => [r.id, r]));
  const rows: RepriceRow[] = [];
  for (const e of estimates) {
    const r = byId.get(e.currentRevisionId!);
    if (!r || r.catalogVersion === loaded.catalog.version) continue;
    const { result } = priced(r.input, loaded);
    // Today's list changes nothing this estimate shows: nothing to reprice.
    if (samePricing(r, loaded, () => result)) continue;
    rows.push({
      id: e.id,
      number: e.number,
      title: e.title,
      customer: e.customer?.name ?? '',
      state: e.state,
      catalogVersion: r.catalogVersion,
      priceList: '',
      oldTotal: Number(e.total).toFixed(2),
      newTotal: result.totals.price,
      currency: result.totals.currency,
    });
  }
  const labels = await priceListLabels([...rows.map((r) => r.catalogVersion), loaded.catalog.version], loaded.catalog.version);
  for (const row of rows) row.priceList = labels.get(row.catalogVersion) ?? '';
  return { catalogVersion: loaded.catalog.version, priceList: labels.get(loaded.catalog.version) ?? "today's prices", rows };
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

/** The list's sort columns, as SQL (the query's aliases). */
const SORTS: Record<ListQuery['sort'], string> = {
  number: 'e.number',
  customer: 'c.name',
  state: 'state',
  labourHours: 'e.labour_hours',
  total: 'e.total',
  updatedAt: 'e.updated_at',
};

/** The sorts on the estimate's own columns (the others need its customer's name or its state worked out). */
const ESTIMATE_SORTS: ReadonlySet<ListQuery['sort']> = new Set(['number', 'labourHours', 'total', 'updatedAt']);

/** An estimate's list row: its columns and the names it shows, as SQL (see summaryFromRow). */
const SUMMARY_SELECT = () => `SELECT e.id, e.number, e.title, ${estimateStateSql('e')} AS state, e.labour_hours, e.total, e.currency, e.revision_count,
       e.valid_until::text AS valid_until, e.archived, e.created_at, e.updated_at, c.id AS customer_id, c.name AS customer_name,
       p.id AS piece_id, p.description AS piece_description, p.kind AS piece_kind, u.id AS owner_id, u.name AS owner_name`;
/** The names a list row shows, joined to the estimates `e`. */
const SUMMARY_JOINS = `JOIN customers c ON c.id = e.customer_id
  JOIN pieces p ON p.id = e.piece_id
  JOIN users u ON u.id = e.owner_id`;
const SUMMARY_FROM = `FROM estimates e
  ${SUMMARY_JOINS}`;

interface SummaryRow {
  id: number;
  number: string;
  title: string;
  state: EstimateState;
  customer_id: number;
  customer_name: string;
  piece_id: number;
  piece_description: string;
  piece_kind: string;
  owner_id: number;
  owner_name: string;
  labour_hours: string;
  total: string;
  currency: string;
  revision_count: number;
  valid_until: string;
  archived: boolean;
  created_at: Date;
  updated_at: Date;
}

function summaryFromRow(r: SummaryRow): EstimateSummary {
  return {
    id: r.id,
    number: r.number,
    title: r.title,
    state: r.state,
    customer: { id: r.customer_id, name: r.customer_name },
    piece: { id: r.piece_id, description: r.piece_description, kind: r.piece_kind },
    owner: { id: r.owner_id, name: r.owner_name },
    labourHours: Number(r.labour_hours),
    total: Number(r.total).toFixed(2),
    currency: r.currency,
    revisionCount: r.revision_count,
    validUntil: r.valid_until,
    archived: r.archived,
    createdAt: new Date(r.created_at).toISOString(),
    updatedAt: new Date(r.updated_at).toISOString(),
  };
}

/** Above this many matching estimates a search term is broad: the list walks its sort index instead of the ids. */
const BROAD_SEARCH = 500;

/**
 * A page of estimates: one query for the rows (plain SQL, no model instances: the list is the busiest read) and, only
 * when the page is full, a count that stops ten pages on. A text search reads each table's trigram index: the
 * estimate's number and title, and the matching customers and pieces (then their estimates by index).
 */
export async function listEstimates(q: ListQuery): Promise<Page<EstimateSummary>> {
  const sequelize = Estimate.sequelize!;
  const conditions = ['e.archived = :archived'];
  const replacements: Record<string, unknown> = { archived: q.archived === 'true', limit: q.pageSize, offset: offset(q.page, q.pageSize) };
  if (q.state) {
    conditions.push(`${estimateStateSql('e')} = :state`);
    replacements.state = q.state;
  }
  if (q.customerId) {
    conditions.push('e.customer_id = :customerId');
    replacements.customerId = q.customerId;
  }
  if (q.q) {
    // The estimates, customers and pieces that match come first, as plain id lists, each read from its table's
    // trigram index through the search functions (an ILIKE under row-level security cannot use an index: migration
    // 2026.12.08T50.00), so that PostgreSQL can size each part of the search and combine the id indexes. A broad
    // term (more than BROAD_SEARCH estimates) is answered instead by walking the sort index and filtering, which
    // stops as soon as the page and its capped count are full.
    replacements.like = containsPattern(q.q);
    const [matched] = await sequelize.query<{ estimates: number[]; customers: number[]; pieces: number[] }>(
      `SELECT ARRAY(SELECT shellwright_search_estimates(:like) LIMIT :broad) AS estimates,
              ARRAY(SELECT shellwright_search_customer_names(:like)) AS customers,
              ARRAY(SELECT shellwright_search_pieces(:like)) AS pieces`,
      { replacements: { like: replacements.like, broad: BROAD_SEARCH + 1 }, type: QueryTypes.SELECT },
    );
    const either: string[] = [];
    if (matched!.estimates.length > BROAD_SEARCH) either.push('e.number ILIKE :like', 'e.title ILIKE :like');
    else if (matched!.estimates.length > 0) either.push('e.id IN (:estimates)');
    if (matched!.customers.length > 0) either.push('e.customer_id IN (:customers)');
    if (matched!.pieces.length > 0) either.push('e.piece_id IN (:pieces)');
    Object.assign(replacements, matched);
    conditions.push(either.length > 0 ? `(${either.join(' OR ')})` : 'false');
  }
  const where = conditions.join(' AND ');
  // The capped count rides along in the same round trip (an uncorrelated sub-select PostgreSQL runs once).
  const countUpTo = `(SELECT count(*)::int FROM (SELECT 1 FROM estimates e WHERE ${where} LIMIT :countLimit) t)`;
  const order = `ORDER BY ${SORTS[q.sort]} ${direction(q.dir)}, e.id DESC`;
  // A search sorted on the estimate's own columns picks its page from the estimates alone, then joins the names to
  // those rows only (not to every match: a selective term's hundred matches were joined to every customer and piece).
  const pageFirst = Boolean(q.q) && ESTIMATE_SORTS.has(q.sort);
  const pageSql = pageFirst
    ? `${SUMMARY_SELECT()}, ${countUpTo} AS counted
      FROM (SELECT * FROM estimates e WHERE ${where} ${order} LIMIT :limit OFFSET :offset) e
      ${SUMMARY_JOINS}
      ${order}`
    : `${SUMMARY_SELECT()}, ${countUpTo} AS counted ${SUMMARY_FROM}
      WHERE ${where}
      ${order}
      LIMIT :limit OFFSET :offset`;
  const pageReplacements = { ...replacements, countLimit: countLimit(q.page, q.pageSize) + 1 };
  // Without a search the text depends only on the sort, page, filters and day: its plan is kept per connection
  // (server/db/planned.ts). A search's text carries the ids it matched, so it is planned each time.
  const rows = q.q
    ? await sequelize.query<SummaryRow & { counted: number }>(pageSql, { replacements: pageReplacements, type: QueryTypes.SELECT })
    : await plannedSelect<SummaryRow & { counted: number }>(sequelize, pageSql, { replacements: pageReplacements });
  const total = await pageTotal(rows.length, q, async (limit) => {
    if (rows[0]) return rows[0].counted;
    const [row] = await sequelize.query<{ n: number }>(`SELECT ${countUpTo} AS n`, { replacements: { ...replacements, countLimit: limit }, type: QueryTypes.SELECT });
    return row!.n;
  });
  return { rows: await withAgreements(rows.map(summaryFromRow)), ...total, page: q.page, pageSize: q.pageSize };
}
