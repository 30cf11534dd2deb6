/**
 * Reading quotes: the detail and summary a staff page shows (state as read today), open quotes naming an estimate, and the paged list.
 */
import { quoteStateSql } from '../quote-expiry';
import { quoteStateOn } from '@shared/schemas/state-moves';
import { today } from '@shared/time';
import { literal, Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize';
import type { Page } from '@shared/schemas/auth';
import { type QuoteDetail, type QuoteLineDto, type QuoteListQuery, type QuoteSummary } from '@shared/schemas/quotes';
import { problems } from '../../http/problem';
import { Customer, Estimate, EstimateRevision, Payment, Piece, Quote, type QuoteLine } from '../../models';
import { lapseCheckouts, paymentDto } from '../payment-provider';
import { anyOf, containsPattern, direction, offset, pageTotal } from '../paging';
import { linesOf } from './locks';
import { agreedOf, shownPricing } from './pricing';
import { allOf } from '../../db/queries';

type ListQuery = QuoteListQuery;
export const iso = (d: Date | null) => (d ? d.toISOString() : null);
// ------------------------------------------------------------------------------------------------- DTOs

interface Loaded {
  quote: Quote;
  estimate: Estimate;
  customer: Customer;
}

export async function load(id: number, transaction?: Transaction): Promise<Loaded> {
  const quote = await Quote.findByPk(id, { transaction });
  if (!quote) throw problems.notFound('Quote');
  const estimate = await Estimate.findByPk(quote.estimateId, { transaction });
  const customer = estimate ? await Customer.findByPk(estimate.customerId, { transaction }) : null;
  if (!estimate || !customer) throw problems.notFound('Quote');
  return { quote, estimate, customer };
}

async function revisionNumber(revisionId: number, transaction?: Transaction): Promise<number> {
  const r = await EstimateRevision.findByPk(revisionId, { attributes: ['number'], transaction });
  return r?.number ?? 0;
}

function summary(q: Quote, e: Estimate, c: Customer, revision: number): QuoteSummary {
  return {
    id: q.id,
    number: q.number,
    state: quoteStateOn(q.state, q.validUntil, today()),
    estimate: { id: e.id, number: e.number, title: e.title, revision },
    customer: { id: c.id, name: c.name, email: c.email },
    total: Number(q.total).toFixed(2),
    deposit: Number(q.deposit).toFixed(2),
    acceptedTotal: q.acceptedTotal === null ? null : Number(q.acceptedTotal).toFixed(2),
    currency: q.currency,
    validUntil: q.validUntil,
    recipient: q.recipient,
    sentAt: iso(q.sentAt),
    viewedAt: iso(q.viewedAt),
    acceptedAt: iso(q.acceptedAt),
    declinedAt: iso(q.declinedAt),
    depositPaidAt: iso(q.depositPaidAt),
    createdAt: q.createdAt.toISOString(),
    updatedAt: q.updatedAt.toISOString(),
  };
}

/** A quote's lines for staff screens, with their estimates, revisions and pieces. */
export async function lineDtos(lines: readonly QuoteLine[], transaction?: Transaction): Promise<QuoteLineDto[]> {
  const [estimates, revisions, pieces] = await allOf(transaction, [
    () => Estimate.findAll({ where: { id: lines.map((l) => l.estimateId) }, attributes: ['id', 'number', 'title'], transaction }),
    () => EstimateRevision.findAll({ where: { id: lines.map((l) => l.revisionId) }, attributes: ['id', 'number', 'result'], transaction }),
    () => Piece.findAll({ where: { id: lines.map((l) => l.pieceId) }, attributes: ['id', 'description'], transaction }),
  ]);
  return lines.map((l) => {
    const e = estimates.find((x) => x.id === l.estimateId);
    const r = revisions.find((x) => x.id === l.revisionId);
    return {
      id: l.id,
      position: l.position,
      group: l.optionGroup,
      groupOptional: l.groupOptional,
      label: l.label,
      recommended: l.recommended,
      estimate: { id: l.estimateId, number: e?.number ?? '', title: e?.title ?? '', revision: r?.number ?? 0 },
      piece: { id: l.pieceId, description: pieces.find((x) => x.id === l.pieceId)?.description ?? e?.title ?? '' },
      pricing: l.pricing,
      total: Number(l.total).toFixed(2),
      labourHours: r?.result.totals.labourHours ?? 0,
      chosen: l.chosen,
    };
  });
}

export async function getQuote(id: number, transaction?: Transaction): Promise<QuoteDetail> {
  await lapseCheckouts(id, transaction);
  const { quote: q, estimate, customer } = await load(id, transaction);
  const payments = await Payment.findAll({ where: { quoteId: id }, order: [['id', 'ASC']], transaction });
  const lineRows = await linesOf(id, transaction);
  const piece = await Piece.findByPk(estimate.pieceId, { attributes: ['id', 'description'], transaction });
  return {
    ...summary(q, estimate, customer, await revisionNumber(q.revisionId, transaction)),
    lines: await lineDtos(lineRows, transaction),
    piece: piece ? { id: piece.id, description: piece.description } : null,
    message: q.message,
    discountPct: Number(q.discountPct),
    depositPct: Number(q.depositPct),
    extras: q.extras,
    pricing: shownPricing(q, lineRows).pricing,
    acceptedName: q.acceptedName,
    acceptedIp: q.acceptedIp,
    acceptedExtras: q.acceptedExtras,
    acceptedDeposit: q.acceptedDeposit === null ? null : Number(q.acceptedDeposit).toFixed(2),
    declineReason: q.declineReason,
    agreed: agreedOf(q),
    flagged: payments.filter((p) => p.flag).length,
    payments: payments.map(paymentDto),
  };
}

export async function openQuotesNaming(estimateId: number, exceptQuoteId: number, transaction?: Transaction): Promise<number> {
  const [row] = await Quote.sequelize!.query<{ n: string }>(
    `SELECT count(DISTINCT q.id) AS n FROM quotes q JOIN quote_lines l ON l.quote_id = q.id
      WHERE l.estimate_id = :estimateId AND q.id <> :exceptQuoteId AND q.state IN ('quoted', 'viewed')`,
    { replacements: { estimateId, exceptQuoteId }, type: QueryTypes.SELECT, transaction },
  );
  return Number(row?.n ?? 0);
}

// ---------------------------------------------------------------------------------------- lists, pipeline

const SORTS: Record<ListQuery['sort'], unknown[]> = {
  number: ['number'],
  customer: [{ model: Estimate, as: 'estimate' }, 'title'],
  state: [literal(quoteStateSql('"Quote"'))],
  total: ['total'],
  updatedAt: ['updatedAt'],
  validUntil: ['validUntil'],
};

export async function listQuotes(q: ListQuery): Promise<Page<QuoteSummary>> {
  const where: WhereOptions<Quote> = {};
  if (q.state) Object.assign(where, { [Op.and]: [Quote.sequelize!.where(Quote.sequelize!.literal(quoteStateSql('"Quote"')), q.state)] });
  if (q.estimateId) Object.assign(where, { estimateId: q.estimateId });
  if (q.q) {
    const like = containsPattern(q.q);
    // Each table's trigram index, through the search functions (an ILIKE under row-level security cannot use an
    // index, migration 2026.12.08T50.00): the quote's number and recipient, and the quotes of matching estimates.
    const escaped = Quote.sequelize!.escape(like);
    Object.assign(where, {
      [Op.or]: [anyOf('"Quote"."id"', `SELECT shellwright_search_quotes(${escaped})`), anyOf('"Quote"."estimate_id"', `SELECT shellwright_search_estimates(${escaped})`)],
    });
  }
  const rows = await Quote.findAll({
    where,
    include: [{ model: Estimate, as: 'estimate' }],
    order: [[...SORTS[q.sort], direction(q.dir)], ['id', 'DESC']] as never,
    limit: q.pageSize,
    offset: offset(q.page, q.pageSize),
  });
  const total = await pageTotal(rows.length, q, async (limit) => (await Quote.findAll({ where, attributes: ['id'], limit, raw: true })).length);
  const customers = await Customer.findAll({ where: { id: rows.map((r) => r.estimate!.customerId) } });
  const revisions = await EstimateRevision.findAll({ where: { id: rows.map((r) => r.revisionId) }, attributes: ['id', 'number'] });
  return {
    rows: rows.map((r) =>
      summary(r, r.estimate!, customers.find((c) => c.id === r.estimate!.customerId)!, revisions.find((v) => v.id === r.revisionId)?.number ?? 0),
    ),
    ...total,
    page: q.page,
    pageSize: q.pageSize,
  };
}

/** Quotes by state: how many, and their value (accepted totals where accepted). */
