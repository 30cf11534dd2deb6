/**
 * Quotes: a priced estimate's revision offered to the customer, with a covering message, optional extras, a
 * discount within the owner's cap, a validity date and a deposit. Sending makes the PDF, e-mails it through the
 * outbox with the customer's signed link, and moves the estimate along.
 */
import { expireQuotes, quoteStateSql } from './quote-expiry';
import { canMoveQuote, mirrorEstimate, moveQuote, quoteStateOn } from '@shared/schemas/state-moves';
import { formatDate, formatMoney } from '@shared/format';
import { currentYear, dayOf, daysFromToday, today } from '@shared/time';
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import fs from 'node:fs/promises';
import { literal, Op, QueryTypes, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { CUSTOMER_VENTILATION_TEXT, customerCautions, estimate as runEstimate } from '@shared/calc';
import { money, percentOf } from '@shared/money';
import type { Page, Role } from '@shared/schemas/auth';
import type { EstimateState } from '@shared/schemas/estimates';
import { formatArea } from '@shared/units';
import {
  QUOTE_TERMS,
  agreedFigures,
  customerPriceLines,
  roundHoursForCustomer,
  type AgreedFigures,
  type CreateQuoteSchema,
  type PipelineRow,
  type QuoteDetail,
  type OptionReport,
  type QuoteExtra,
  type QuoteLineDto,
  type QuoteListQuerySchema,
  type QuotePricing,
  type QuoteState,
  type QuoteSummary,
} from '@shared/schemas/quotes';
import type { Config } from '../config';
import { HttpProblem, problems } from '../http/problem';
import { Customer, Estimate, EstimateRevision, Job, OutboxMessage, Payment, Piece, PiecePhoto, Quote, QuoteLine, User, Workshop } from '../models';
import type { AcceptanceRecord } from '../pdf/acceptance-pdf';
import type { QuoteDocument, QuoteDocumentLine } from '../pdf/quote-document';
import { renderQuotePdf } from '../pdf/quote-pdf';
import { audit } from './audit';
import { loadSettings } from './catalog';
import { deliver } from './mail';
import { composeMail } from './mail-compose';
import { lapseCheckouts, paymentDto } from './payments';
import { anyOf, containsPattern, direction, offset, pageTotal } from './paging';
import { workingCopyPath } from './photos';

type CreateInput = z.output<typeof CreateQuoteSchema>;
type ListQuery = z.output<typeof QuoteListQuerySchema>;

/** Estimate states from which a new quote may be made. */
const QUOTABLE: readonly EstimateState[] = ['priced', 'quoted', 'viewed', 'expired', 'declined'];

const iso = (d: Date | null) => (d ? d.toISOString() : null);

// ------------------------------------------------------------------------------------------------ links

/** A customer's link token: random, with an HMAC so a tampered token is refused before any look-up. */
export function makeToken(secret: string): { token: string; hash: string } {
  const random = randomBytes(24).toString('base64url');
  const sig = createHmac('sha256', secret).update(random).digest('base64url').slice(0, 22);
  const token = `${random}.${sig}`;
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** True when the token carries a valid signature (it may still be unknown, expired or withdrawn). */
export function tokenSigned(token: string, secret: string): boolean {
  const m = /^([A-Za-z0-9_-]{32})\.([A-Za-z0-9_-]{22})$/.exec(token);
  if (!m) return false;
  const expected = Buffer.from(createHmac('sha256', secret).update(m[1]!).digest('base64url').slice(0, 22));
  const given = Buffer.from(m[2]!);
  return expected.length === given.length && timingSafeEqual(expected, given);
}

export function quoteLink(config: Config, token: string): string {
  return `${config.publicUrl}/q/${token}`;
}

// ---------------------------------------------------------------------------------------------- pricing

/** Prices a revision again as quoted: its own price list snapshot, the quote's discount and deposit. */
export function quotePricing(revision: EstimateRevision, discountPct: number, depositPct: number): QuotePricing {
  const catalog = { ...revision.catalog, pricing: { ...revision.catalog.pricing, depositPct } };
  const result = runEstimate({ ...revision.input, discountPct }, catalog);
  return {
    lines: result.price.lines,
    total: result.price.total,
    depositPct,
    deposit: result.price.deposit,
    balance: result.price.balance,
    taxLabel: catalog.pricing.taxLabel,
    taxPct: catalog.pricing.taxPct,
    currency: result.price.currency,
  };
}

const COMBINED_LABELS: Record<string, string> = { materials: 'Materials', labour: 'Labour', overhead: 'Workshop overhead', margin: 'Margin', discount: 'Discount', rounding: 'Rounding' };

/**
 * The price of several lines taken together (the quote's recommended choice): their price lines added by kind, the
 * total their sum, the deposit the percentage of it (to the cent, as at acceptance).
 */
export function combinedPricing(pricings: readonly QuotePricing[], depositPct: number): QuotePricing {
  if (pricings.length === 1) return pricings[0]!;
  const first = pricings[0]!;
  const cents = (x: string) => Math.round(Number(x) * 100);
  const lines: QuotePricing['lines'] = [];
  for (const p of pricings) {
    for (const l of p.lines) {
      const at = lines.findIndex((x) => x.code === l.code);
      if (at < 0) lines.push({ ...l });
      else {
        const same = lines[at]!.label === l.label;
        lines[at] = { code: l.code, label: same ? l.label : l.code === 'tax' ? first.taxLabel : (COMBINED_LABELS[l.code] ?? l.label), amount: ((cents(lines[at]!.amount) + cents(l.amount)) / 100).toFixed(2) };
      }
    }
  }
  const total = (pricings.reduce((t, p) => t + cents(p.total), 0) / 100).toFixed(2);
  const figures = agreedFigures({ total, depositPct, extras: [] }, []);
  return { lines, total, depositPct, deposit: figures.deposit, balance: figures.balance, taxLabel: first.taxLabel, taxPct: first.taxPct, currency: first.currency };
}

/**
 * The price a quote shows: its own (the recommended choice) until accepted; once a quote of several lines is
 * accepted, the chosen lines' price added up. Also the lines it is the price of.
 */
export function shownPricing(quote: Pick<Quote, 'pricing' | 'depositPct'>, lines: readonly QuoteLine[]): { pricing: QuotePricing; lines: QuoteLine[] } {
  const chosen = lines.filter((l) => l.chosen);
  if (lines.length > 1 && chosen.length > 0) return { pricing: combinedPricing(chosen.map((l) => l.pricing), Number(quote.depositPct)), lines: chosen };
  return { pricing: quote.pricing, lines: lines.length > 1 ? lines.filter((l) => l.recommended) : [...lines] };
}

function withTax(price: string, taxPct: number): string {
  return money(price).plus(percentOf(price, taxPct)).toFixed(2);
}

/** The total, deposit and balance once the customer has chosen which extras they take. */
export function acceptedAmounts(q: Pick<Quote, 'total' | 'extras' | 'depositPct'>, extraIds: readonly string[]): AgreedFigures {
  return agreedFigures({ total: Number(q.total).toFixed(2), depositPct: Number(q.depositPct), extras: q.extras }, extraIds);
}

/** What the customer agreed to, from an accepted quote's record (null before acceptance). */
export function agreedOf(q: Quote): AgreedFigures | null {
  if (q.acceptedTotal === null || q.acceptedDeposit === null) return null;
  const figures = acceptedAmounts(q, q.acceptedExtras ?? []);
  // The stored figures are what was agreed; the recomputation only supplies the extras and their hours.
  const total = Number(q.acceptedTotal).toFixed(2);
  const deposit = Number(q.acceptedDeposit).toFixed(2);
  return { ...figures, total, deposit, balance: money(total).minus(money(deposit)).toFixed(2) };
}

/** The agreement a piece has: the chosen line of an accepted quote naming it, with that quote (null if none). */
export async function pieceAgreement(pieceIds: readonly number[], transaction?: Transaction): Promise<{ line: QuoteLine; quote: Quote } | null> {
  if (pieceIds.length === 0) return null;
  const line = await QuoteLine.findOne({ where: { pieceId: { [Op.in]: [...pieceIds] }, agreed: true }, transaction });
  if (!line) return null;
  const quote = await Quote.findByPk(line.quoteId, { transaction });
  return quote ? { line, quote } : null;
}

/** The problem for a piece already agreed: 409 naming the accepted quote (and the estimate it was agreed on). */
export async function alreadyAgreed(found: { line: QuoteLine; quote: Quote }, ownEstimateIds: readonly number[], transaction?: Transaction): Promise<HttpProblem> {
  const { line, quote: agreed } = found;
  const [estimate, piece] = await Promise.all([Estimate.findByPk(line.estimateId, { transaction }), Piece.findByPk(line.pieceId, { transaction })]);
  const on = agreed.acceptedAt ? ` on ${dayOf(agreed.acceptedAt)}` : '';
  if (ownEstimateIds.includes(line.estimateId)) {
    return new HttpProblem(409, 'estimate_already_agreed', 'Already agreed', `Quote ${agreed.number} for estimate ${estimate?.number ?? line.estimateId} was accepted${on}: no other quote for it can be sent or accepted.`);
  }
  return new HttpProblem(
    409,
    'piece_already_agreed',
    'Already agreed',
    `Quote ${agreed.number} for ${piece?.description ?? 'the piece'} (estimate ${estimate?.number ?? line.estimateId}) was accepted${on}: no other quote for that piece can be sent or accepted.`,
  );
}

/** A quote's lines in their order. */
export async function linesOf(quoteId: number, transaction?: Transaction): Promise<QuoteLine[]> {
  return QuoteLine.findAll({ where: { quoteId }, order: [['position', 'ASC']], transaction });
}

/**
 * Locks the pieces named, in id order (NO KEY UPDATE: rows that merely reference a piece are not held up). Two quotes
 * naming one piece through different estimates queue here.
 */
export async function lockPieces(pieceIds: readonly number[], transaction: Transaction): Promise<void> {
  for (const id of [...new Set(pieceIds)].sort((a, b) => a - b)) {
    await Piece.findByPk(id, { attributes: ['id'], transaction, lock: transaction.LOCK.NO_KEY_UPDATE });
  }
}

/**
 * Locks a quote for a change of state, its pieces and estimates first: every transaction that moves a quote takes
 * the rows of the pieces its lines name, then of their estimates (each in id order), then the quote's, so two of
 * them never wait on each other in opposite order. `estimate` is the quote's first estimate.
 */
export async function lockQuote(quoteId: number, transaction: Transaction): Promise<{ quote: Quote; estimate: Estimate; estimates: Estimate[]; lines: QuoteLine[] }> {
  const peek = await Quote.findByPk(quoteId, { attributes: ['id', 'estimateId'], transaction });
  if (!peek) throw problems.notFound('Quote');
  const lines = await linesOf(quoteId, transaction);
  await lockPieces(lines.map((l) => l.pieceId), transaction);
  const ids = [...new Set([peek.estimateId, ...lines.map((l) => l.estimateId)])].sort((a, b) => a - b);
  const estimates: Estimate[] = [];
  for (const id of ids) {
    const e = await Estimate.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (e) estimates.push(e);
  }
  const quote = await Quote.findByPk(quoteId, { transaction, lock: transaction.LOCK.UPDATE });
  const estimate = estimates.find((e) => e.id === peek.estimateId);
  if (!estimate || !quote) throw problems.notFound('Quote');
  return { quote, estimate, estimates, lines };
}

// ------------------------------------------------------------------------------------------------- DTOs

interface Loaded {
  quote: Quote;
  estimate: Estimate;
  customer: Customer;
}

async function load(id: number, transaction?: Transaction): Promise<Loaded> {
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
  const [estimates, revisions, pieces] = await Promise.all([
    Estimate.findAll({ where: { id: lines.map((l) => l.estimateId) }, attributes: ['id', 'number', 'title'], transaction }),
    EstimateRevision.findAll({ where: { id: lines.map((l) => l.revisionId) }, attributes: ['id', 'number', 'result'], transaction }),
    Piece.findAll({ where: { id: lines.map((l) => l.pieceId) }, attributes: ['id', 'description'], transaction }),
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

// ------------------------------------------------------------------------------------------ life cycle

/** Written by writes and the app's sweep; reads compute it (quote-expiry.ts). */
export { expireQuotes };

async function nextNumber(sequelize: Sequelize, transaction: Transaction): Promise<string> {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('quote_number_seq') AS n", { type: QueryTypes.SELECT, transaction });
  return `Q-${currentYear()}-${String(row!.n).padStart(4, '0')}`;
}

interface LineSpec {
  estimate: Estimate;
  revision: EstimateRevision;
  group: number;
  label: string;
  recommended: boolean;
  optional: boolean;
  discountPct: number;
}

/**
 * Makes a quote from one estimate (the address's) or from several lines: estimates of the customer's pieces, each at a
 * revision, grouped as options. Every estimate named is locked (in id order) while the quote is made; none of its
 * pieces may be agreed already.
 */
export async function createQuote(sequelize: Sequelize, actor: { id: number; role: Role }, estimateId: number, input: CreateInput): Promise<QuoteDetail> {
  const id = await sequelize.transaction(async (transaction) => {
    const given = input.lines ?? [{ estimateId, revision: input.revision, label: '' }];
    if (!given.some((l) => l.estimateId === estimateId)) {
      throw problems.badRequest('lines_without_estimate', `lines: must include estimate ${estimateId}, the one the quote is made from`, 'lines');
    }
    const ids = [...new Set(given.map((l) => l.estimateId))].sort((a, b) => a - b);
    // The same order as lockQuote: pieces, then estimates.
    const peeked = await Estimate.findAll({ where: { id: ids }, attributes: ['id', 'pieceId'], transaction });
    await lockPieces(peeked.map((e) => e.pieceId), transaction);
    const locked = new Map<number, Estimate>();
    for (const eid of ids) {
      const e = await Estimate.findByPk(eid, { transaction, lock: transaction.LOCK.UPDATE });
      if (e) locked.set(eid, e);
    }
    const estimate = locked.get(estimateId);
    if (!estimate) throw problems.notFound('Estimate');
    // A piece agreed already: 409 naming the accepted quote, before anything else is said about the estimates.
    const agreedFirst = await pieceAgreement([...locked.values()].map((e) => e.pieceId), transaction);
    if (agreedFirst) throw await alreadyAgreed(agreedFirst, ids, transaction);
    const { settings } = await loadSettings(transaction);
    const cap = settings.pricing.maxDiscountPct;
    const depositPct = input.depositPct ?? settings.pricing.depositPct;

    // Each line: a quotable estimate of the same customer, at a revision it has.
    const specs: LineSpec[] = [];
    let nextGroup = 1000;
    for (const [i, l] of given.entries()) {
      const field = input.lines ? `lines.${i}` : 'revision';
      const e = locked.get(l.estimateId);
      if (!e) throw problems.badRequest('unknown_estimate', `lines.${i}.estimateId: no estimate ${l.estimateId}`, `lines.${i}.estimateId`);
      if (e.customerId !== estimate.customerId) {
        throw problems.badRequest('other_customer', `lines.${i}.estimateId: estimate ${e.number} is for another customer`, `lines.${i}.estimateId`);
      }
      if (e.archived) throw problems.conflict('estimate_archived', `Estimate ${e.number} is archived.`);
      if (!QUOTABLE.includes(e.state)) {
        const why = e.state === 'draft' ? 'is still a draft: the estimator marks it priced first' : `is ${e.state}`;
        throw problems.conflict('estimate_not_quotable', `Estimate ${e.number} ${why}.`);
      }
      const revision = l.revision
        ? await EstimateRevision.findOne({ where: { estimateId: e.id, number: l.revision }, transaction })
        : await EstimateRevision.findByPk(e.currentRevisionId!, { transaction });
      if (!revision) {
        const f = input.lines ? `${field}.revision` : 'revision';
        throw problems.badRequest('unknown_revision', `${f}: estimate ${e.number} has no revision ${l.revision}`, f);
      }
      // The estimator's discount carries into each line; sales may change it, within the owner's cap.
      const estimatorDiscount = revision.input.discountPct ?? 0;
      const discountPct = input.discountPct ?? estimatorDiscount;
      if (actor.role !== 'owner' && discountPct !== estimatorDiscount && discountPct > cap) {
        throw problems.badRequest('discount_over_cap', `discountPct: at most ${cap} % (the owner's limit for sales)`, 'discountPct');
      }
      const line = l as { group?: number; recommended?: boolean; optional?: boolean; label?: string };
      specs.push({ estimate: e, revision, group: line.group ?? nextGroup++, label: line.label ?? '', recommended: line.recommended ?? false, optional: line.optional ?? false, discountPct });
    }
    if (new Set(specs.map((x) => x.revision.id)).size !== specs.length) {
      throw problems.badRequest('line_twice', 'lines: the same estimate revision is on the quote twice', 'lines');
    }
    // Groups: numbered 1, 2, … in the order they first appear; the options of a group are of one piece, and a piece
    // is in one group only.
    const order = [...new Set(specs.map((x) => x.group))];
    for (const x of specs) x.group = order.indexOf(x.group) + 1;
    for (const g of order.keys()) {
      const of = specs.filter((x) => x.group === g + 1);
      const pieces = new Set(of.map((x) => x.estimate.pieceId));
      if (pieces.size > 1) throw problems.badRequest('options_of_several_pieces', `lines: the options of group ${g + 1} must be estimates of the same piece`, 'lines');
      const marked = of.filter((x) => x.recommended).length;
      if (marked > 1) throw problems.badRequest('recommended_twice', `lines: recommend one option of group ${g + 1}, not ${marked}`, 'lines');
      if (marked === 0) of[0]!.recommended = true;
      const optional = of.some((x) => x.optional);
      for (const x of of) x.optional = optional;
    }
    const piecesSeen = new Map<number, number>();
    for (const x of specs) {
      const g = piecesSeen.get(x.estimate.pieceId);
      if (g !== undefined && g !== x.group) throw problems.badRequest('piece_twice', `lines: a piece is in groups ${g} and ${x.group}; make its estimates options of one group`, 'lines');
      piecesSeen.set(x.estimate.pieceId, x.group);
    }

    const validUntil = input.validUntil ?? daysFromToday(settings.quoteValidityDays, settings.timeZone);
    if (validUntil < today()) throw problems.badRequest('valid_until_past', 'validUntil: must be today or later', 'validUntil');
    const priced = specs.map((x) => ({ ...x, pricing: quotePricing(x.revision, x.discountPct, depositPct) }));
    if (new Set(priced.map((x) => x.pricing.currency)).size > 1) throw problems.badRequest('mixed_currency', 'lines: the estimates are priced in different currencies', 'lines');
    const pricing = combinedPricing(priced.filter((x) => x.recommended).map((x) => x.pricing), depositPct);
    const first = priced.find((x) => x.estimate.id === estimateId)!;
    const extras: QuoteExtra[] = input.extras.map((x, i) => ({
      id: `x${i + 1}`,
      label: x.label,
      description: x.description,
      hours: x.hours,
      price: money(x.price).toFixed(2),
      priceWithTax: withTax(x.price, pricing.taxPct),
    }));
    const customer = await Customer.findByPk(estimate.customerId, { transaction });
    const quote = await Quote.create(
      {
        number: await nextNumber(sequelize, transaction),
        estimateId,
        revisionId: first.revision.id,
        message: input.message,
        extras,
        discountPct: input.discountPct ?? first.discountPct,
        depositPct,
        validUntil,
        pricing,
        total: pricing.total,
        deposit: pricing.deposit,
        currency: pricing.currency,
        recipient: input.recipient ?? customer?.email ?? null,
        tokenHash: null,
        createdBy: actor.id,
        sentAt: null,
        viewedAt: null,
        acceptedAt: null,
        acceptedName: null,
        acceptedIp: null,
        acceptedExtras: null,
        acceptedTotal: null,
        acceptedDeposit: null,
        declinedAt: null,
        declineReason: null,
        depositPaidAt: null,
      },
      { transaction },
    );
    await QuoteLine.bulkCreate(
      priced.map((x, i) => ({
        quoteId: quote.id,
        position: i + 1,
        optionGroup: x.group,
        groupOptional: x.optional,
        label: x.label,
        recommended: x.recommended,
        estimateId: x.estimate.id,
        pieceId: x.estimate.pieceId,
        revisionId: x.revision.id,
        pricing: x.pricing,
        total: x.pricing.total,
        chosen: null,
      })),
      { transaction },
    );
    await audit(
      {
        userId: actor.id,
        action: 'quote.create',
        entityType: 'quote',
        entityId: quote.id,
        after: { number: quote.number, estimate: estimate.number, total: quote.total, discountPct: quote.discountPct, lines: priced.map((x) => ({ estimate: x.estimate.number, group: x.group, label: x.label, recommended: x.recommended, total: x.pricing.total })) },
      },
      transaction,
    );
    return quote.id;
  });
  return getQuote(id);
}

/**
 * Sends (or sends again) a quote: a new signed link (an earlier link stops working), the PDF, and an e-mail through
 * the outbox. The quote counts as sent only once the mail server has taken the message.
 */
export async function sendQuote(sequelize: Sequelize, config: Config, actorId: number, id: number, recipient?: string): Promise<QuoteDetail> {
  const { token, outboxId } = await sequelize.transaction(async (transaction) => {
    const { quote, estimate, lines } = await lockQuote(id, transaction);
    const customer = await Customer.findByPk(estimate.customerId, { transaction });
    if (!customer) throw problems.notFound('Quote');
    if (!['draft', 'quoted', 'viewed'].includes(quote.state)) {
      throw problems.conflict('quote_closed', `Quote ${quote.number} is ${quote.state}: it cannot be sent again.`);
    }
    const agreed = await pieceAgreement(lines.map((l) => l.pieceId), transaction);
    if (agreed) throw await alreadyAgreed(agreed, lines.map((l) => l.estimateId), transaction);
    if (quote.validUntil < today()) throw problems.conflict('quote_expired', `Quote ${quote.number} expired on ${quote.validUntil}. Make a new quote.`);
    const to = recipient ?? quote.recipient;
    if (!to) throw problems.badRequest('no_recipient', `recipient: ${customer.name} has no e-mail address; give one`, 'recipient');
    const link = makeToken(config.linkSecret);
    await quote.update({ tokenHash: link.hash, recipient: to }, { transaction });
    const { workshop } = await loadSettings(transaction);
    const pdf = await renderQuotePdf(await buildDocument(quote.id, config.uploadsDir, transaction));
    const url = quoteLink(config, link.token);
    const validUntil = formatDate(quote.validUntil, { month: 'long' });
    const total = formatMoney(quote.total, quote.currency);
    const deposit = formatMoney(quote.deposit, quote.currency);
    const author = quote.createdBy ? await User.findByPk(quote.createdBy, { transaction }) : null;
    // A quote of several pieces or with options: one sentence a piece, its options and their prices.
    const dtos = await lineDtos(lines, transaction);
    const groups = [...new Set(dtos.map((l) => l.group))];
    const optionsOffered = dtos.some((l) => l.groupOptional) || groups.length !== dtos.length;
    const choices =
      dtos.length <= 1
        ? []
        : groups.map((g) => {
            const of = dtos.filter((l) => l.group === g);
            const name = (l: QuoteLineDto) => (l.label || l.estimate.title) + ` (${formatMoney(l.total, quote.currency)}${of.length > 1 && l.recommended ? ', recommended' : ''})`;
            const head = of[0]!.piece.description;
            if (of.length === 1) return `${head}: ${name(of[0]!)}${of[0]!.groupOptional ? ', if you wish to include it' : ''}.`;
            return `${head}: choose ${of.map(name).join(' or ')}${of[0]!.groupOptional ? ', or leave it out' : ''}.`;
          });
    const { text, html } = composeMail({
      name: customer.name,
      message: quote.message,
      paragraphs: [
        ...(choices.length === 0
          ? [{ text: `Please find attached our quote ${quote.number} for ${estimate.title}: ${total}, with a deposit of ${deposit} to book the work. It is valid until ${validUntil}.` }]
          : [
              { text: `Please find attached our quote ${quote.number} for ${choices.length === 1 ? 'your piece' : `your ${choices.length} pieces`}, valid until ${validUntil}. ${optionsOffered ? 'Where we offer a choice, you choose on the quote page before accepting; the' : 'The'} total with ${optionsOffered ? 'what we recommend' : 'everything'} is ${total}, with a deposit of ${deposit} to book the work.` },
              ...choices.map((text) => ({ text })),
            ]),
        { text: 'You can read it, accept or decline it, and pay the deposit here:', link: { url, label: 'Read, accept or decline the quote, and pay the deposit' } },
        { text: 'French polishing uses flammable spirit and shellac; the work is done under our ventilation and fire precautions.', small: true },
      ],
      signOff: { from: author?.name ?? null, workshop: workshop.name, phone: workshop.phone ?? null, email: workshop.email ?? null },
    });
    const outbox = await OutboxMessage.create(
      {
        quoteId: quote.id,
        toAddress: to,
        subject: `Quote ${quote.number} from ${workshop.name}`,
        textBody: text,
        htmlBody: html,
        attachmentName: `${quote.number}.pdf`,
        attachment: pdf,
        lastError: null,
        messageId: null,
        createdBy: actorId,
        sentAt: null,
      },
      { transaction },
    );
    await audit({ userId: actorId, action: 'quote.send', entityType: 'quote', entityId: quote.id, after: { to, outbox: outbox.id } }, transaction);
    return { token: link.token, outboxId: outbox.id };
  });
  const message = await deliver(config, outboxId);
  if (message.status === 'sent') await markSent(sequelize, id);
  const detail = await getQuote(id);
  return {
    ...detail,
    link: quoteLink(config, token),
    delivery: { delivered: message.status === 'sent', outboxId, error: message.status === 'sent' ? null : message.lastError },
  };
}

/**
 * After the mail server took a quote's message: a quote not sent before becomes sent, and its estimate quoted. Other
 * quotes of the estimate are left as they are (the customer may be reading one): they are withdrawn when one of
 * them is accepted, or by sales. A quote closed meanwhile (accepted, withdrawn, expired) is not touched.
 */
export async function markSent(sequelize: Sequelize, id: number): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const { quote, estimates } = await lockQuote(id, transaction);
    if (!canMoveQuote(quote.state, 'send')) return;
    await quote.update({ state: moveQuote(quote.state, 'send'), sentAt: new Date() }, { transaction });
    for (const estimate of estimates) {
      const state = mirrorEstimate(estimate.state, 'send');
      if (state !== estimate.state) await estimate.update({ state }, { transaction });
    }
  });
}

export async function withdrawQuote(sequelize: Sequelize, actorId: number, id: number): Promise<QuoteDetail> {
  await sequelize.transaction(async (transaction) => {
    const { quote, estimates } = await lockQuote(id, transaction);
    if (!canMoveQuote(quoteStateOn(quote.state, quote.validUntil, today()), 'withdraw')) throw problems.conflict('quote_closed', `Quote ${quote.number} is ${quote.state}.`);
    await quote.update({ state: moveQuote(quote.state, 'withdraw'), revoked: true }, { transaction });
    for (const estimate of estimates) {
      const state = mirrorEstimate(estimate.state, 'withdraw', { otherOpenQuotes: await openQuotesNaming(estimate.id, quote.id, transaction) });
      if (state !== estimate.state) await estimate.update({ state }, { transaction });
    }
    await audit({ userId: actorId, action: 'quote.withdraw', entityType: 'quote', entityId: id }, transaction);
  });
  return getQuote(id);
}

/** How many other quotes still open (sent or opened) name an estimate on one of their lines. */
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
    // Each table's trigram index: the quote's number and recipient, and the quotes of matching estimates.
    const escaped = Quote.sequelize!.escape(like);
    Object.assign(where, {
      [Op.or]: [
        { number: { [Op.iLike]: like } },
        { recipient: { [Op.iLike]: like } },
        anyOf('"Quote"."estimate_id"', `SELECT id FROM estimates WHERE number ILIKE ${escaped} OR title ILIKE ${escaped}`),
      ],
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
export async function pipeline(sequelize: Sequelize): Promise<PipelineRow[]> {
  const rows = await sequelize.query<{ state: QuoteState; currency: string; count: string; value: string }>(
    `SELECT ${quoteStateSql()} AS state, currency, count(*) AS count, coalesce(sum(coalesce(accepted_total, total)), 0)::numeric(14,2)::text AS value
       FROM quotes WHERE state <> 'withdrawn' GROUP BY 1, currency ORDER BY 1, currency`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ state: r.state, currency: r.currency, count: Number(r.count), value: r.value }));
}

/**
 * Which option customers take: for every option group (two lines or more) of an accepted quote, whether the lighter
 * option (the cheaper line; the first of equals) was taken, a heavier one, none (an optional group), and whether the
 * recommended one was taken.
 */
export async function optionReport(sequelize: Sequelize): Promise<OptionReport> {
  const rows = await sequelize.query<{ quote_id: number; option_group: number; month: string; id: number; total: string; chosen: boolean | null; recommended: boolean; position: number }>(
    `SELECT l.quote_id, l.option_group, to_char(q.accepted_at, 'YYYY-MM') AS month, l.id, l.total::text AS total, l.chosen, l.recommended, l.position
       FROM quote_lines l JOIN quotes q ON q.id = l.quote_id
      WHERE q.state IN ('accepted', 'deposit-paid')
        AND (l.quote_id, l.option_group) IN (SELECT quote_id, option_group FROM quote_lines GROUP BY quote_id, option_group HAVING count(*) > 1)
      ORDER BY q.accepted_at, l.quote_id, l.option_group, l.position`,
    { type: QueryTypes.SELECT },
  );
  const out: OptionReport = { groups: 0, lighterChosen: 0, heavierChosen: 0, noneChosen: 0, recommendedChosen: 0, months: [] };
  const groups = new Map<string, typeof rows>();
  for (const r of rows) {
    const key = `${r.quote_id}/${r.option_group}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  for (const of of groups.values()) {
    const lighter = [...of].sort((a, b) => Number(a.total) - Number(b.total) || a.position - b.position)[0]!;
    const taken = of.find((l) => l.chosen);
    out.groups += 1;
    if (!taken) out.noneChosen += 1;
    else if (taken.id === lighter.id) out.lighterChosen += 1;
    else out.heavierChosen += 1;
    if (taken?.recommended) out.recommendedChosen += 1;
    const month = of[0]!.month;
    let m = out.months.find((x) => x.month === month);
    if (!m) out.months.push((m = { month, groups: 0, lighterChosen: 0 }));
    m.groups += 1;
    if (taken && taken.id === lighter.id) m.lighterChosen += 1;
  }
  return out;
}

// ------------------------------------------------------------------------------------------------ PDF

function restText(hours: number): string {
  if (hours <= 0) return '—';
  if (hours < 48) return `${Math.round(hours)} h`;
  return `${Math.round(hours / 24)} days`;
}

/** Gathers a quote's PDF content. With no quote (an estimate's draft), it shows the estimate at today's terms. */
export async function buildDocument(quoteId: number, uploadsDir: string, transaction?: Transaction): Promise<QuoteDocument> {
  const { quote, estimate, customer } = await load(quoteId, transaction);
  const revision = await EstimateRevision.findByPk(quote.revisionId, { transaction });
  if (!revision) throw new HttpProblem(500, 'quote_without_revision', 'Quote has no revision');
  const lines = await linesOf(quote.id, transaction);
  // Several lines: the price shown is the recommended choice's until accepted, then the customer's choice.
  const { pricing, lines: priced } = shownPricing(quote, lines);
  const revisions = lines.length > 1 ? await EstimateRevision.findAll({ where: { id: lines.map((l) => l.revisionId) }, transaction }) : [];
  const priceHours = lines.length > 1 ? priced.reduce((t, l) => t + (revisions.find((r) => r.id === l.revisionId)?.result.totals.labourHours ?? 0), 0) : undefined;
  return documentFor({
    uploadsDir,
    estimate,
    customer,
    revision,
    lines: lines.length > 1 ? lines : undefined,
    revisions,
    priceHours,
    pricing,
    number: quote.number,
    validUntil: quote.validUntil,
    message: quote.message,
    extras: quote.extras,
    createdBy: quote.createdBy,
    agreed: agreedOf(quote),
    schedule: await bookedSchedule(quote.id, transaction),
    transaction,
  });
}

/** The booked dates of the quote's live job: the first day in the room and the day it leaves. Null until booked. */
export async function bookedSchedule(quoteId: number, transaction?: Transaction): Promise<{ start: string; ready: string } | null> {
  const job = await Job.findOne({ where: { quoteId, state: { [Op.in]: ['booked', 'in-progress', 'finished'] } }, transaction });
  if (!job || !job.roomStart || !job.roomEnd) return null;
  return { start: job.roomStart.slice(0, 10), ready: job.roomEnd.slice(0, 10) };
}

export async function estimateDocument(estimateId: number, uploadsDir: string): Promise<QuoteDocument> {
  const estimate = await Estimate.findByPk(estimateId);
  if (!estimate) throw problems.notFound('Estimate');
  const customer = await Customer.findByPk(estimate.customerId);
  const revision = await EstimateRevision.findByPk(estimate.currentRevisionId!);
  if (!customer || !revision) throw problems.notFound('Estimate');
  const { settings } = await loadSettings();
  const depositPct = settings.pricing.depositPct;
  const pricing = quotePricing(revision, revision.input.discountPct ?? 0, depositPct);
  return documentFor({ uploadsDir, estimate, customer, revision, pricing, number: `Draft of ${estimate.number}`, validUntil: estimate.validUntil, message: '', extras: [], createdBy: estimate.ownerId, agreed: null, schedule: null });
}

async function documentFor(a: {
  uploadsDir: string;
  estimate: Estimate;
  customer: Customer;
  revision: EstimateRevision;
  lines?: QuoteLine[];
  revisions?: EstimateRevision[];
  priceHours?: number;
  pricing: QuotePricing;
  number: string;
  validUntil: string;
  message: string;
  extras: QuoteExtra[];
  createdBy: number | null;
  agreed: AgreedFigures | null;
  schedule: { start: string; ready: string } | null;
  transaction?: Transaction;
}): Promise<QuoteDocument> {
  const { transaction, revision, pricing } = a;
  const workshop = await Workshop.findOne({ order: [['id', 'ASC']], transaction });
  const { settings } = await loadSettings(transaction);
  const author = a.createdBy ? await User.findByPk(a.createdBy, { transaction }) : null;
  const r = revision.result;
  const main = await pieceAndWork(a.estimate.pieceId, a.estimate.title, revision, settings.units, a.schedule, a.uploadsDir, transaction);
  const lineDocs: QuoteDocumentLine[] | undefined = a.lines
    ? await Promise.all(
        a.lines.map(async (l) => {
          const rev = a.revisions?.find((x) => x.id === l.revisionId) ?? revision;
          const est = await Estimate.findByPk(l.estimateId, { attributes: ['id', 'title'], transaction });
          const doc = await pieceAndWork(l.pieceId, est?.title ?? '', rev, settings.units, a.schedule, a.uploadsDir, transaction);
          return {
            group: l.optionGroup,
            groupOptional: l.groupOptional,
            options: a.lines!.filter((x) => x.optionGroup === l.optionGroup).length,
            label: l.label,
            recommended: l.recommended,
            chosen: l.chosen,
            piece: doc.piece,
            work: doc.work,
            total: Number(l.total).toFixed(2),
          };
        }),
      )
    : undefined;
  const cautionCodes = new Map<string, EstimateRevision['result']['cautions'][number]>();
  for (const rev of [revision, ...(a.revisions ?? [])]) for (const c of rev.result.cautions) cautionCodes.set(c.code, c);
  return {
    paperSize: settings.paperSize,
    workshop: { name: workshop?.name ?? 'Workshop', address: workshop?.address ?? null, email: workshop?.email ?? null, phone: workshop?.phone ?? null },
    quote: {
      number: a.number,
      estimateNumber: `${a.estimate.number} rev. ${revision.number}`,
      issuedOn: today(),
      validUntil: a.validUntil,
      message: a.message,
      currency: pricing.currency,
      pricesIncludeTax: settings.pricesIncludeTax,
      taxLabel: pricing.taxLabel,
      preparedBy: author?.name ?? '',
    },
    customer: { name: a.customer.name, address: a.customer.address, email: a.customer.email, phone: a.customer.phone },
    piece: lineDocs ? { ...main.piece, description: [...new Set(lineDocs.map((l) => l.piece.description))].join('; '), kind: '', maker: null, year: null, serial: null, photo: null, photoCaption: null } : main.piece,
    work: main.work,
    lines: lineDocs,
    price: {
      lines: customerPriceLines(pricing, a.priceHours ?? r.totals.labourHours).map((l) => ({ label: l.label, amount: l.amount })),
      total: pricing.total,
      depositPct: pricing.depositPct,
      deposit: a.agreed?.deposit ?? pricing.deposit,
      balance: a.agreed?.balance ?? pricing.balance,
      agreed: a.agreed ? { extras: a.agreed.extras.map((x) => ({ label: x.label, price: x.priceWithTax })), total: a.agreed.total } : null,
    },
    extras: a.extras.map((x) => ({ label: x.label, description: x.description, hours: x.hours, price: x.priceWithTax })),
    terms: QUOTE_TERMS,
    // The customer reads plain cautions: the workshop's air-change arithmetic stays on staff screens.
    cautions: customerCautions([...cautionCodes.values()]),
    ventilationText: CUSTOMER_VENTILATION_TEXT,
  };
}

/** A piece as the customer's documents show it (with its first photo) and the work of a revision in plain words. */
async function pieceAndWork(
  pieceId: number,
  title: string,
  revision: EstimateRevision,
  units: Parameters<typeof formatArea>[1],
  schedule: { start: string; ready: string } | null,
  uploadsDir: string,
  transaction?: Transaction,
): Promise<Pick<QuoteDocument, 'piece' | 'work'>> {
  const piece = await Piece.findByPk(pieceId, { transaction });
  const photo = await PiecePhoto.findOne({ where: { pieceId, mime: { [Op.in]: ['image/jpeg', 'image/png'] } }, order: [['id', 'ASC']], transaction });
  let photoBytes: Buffer | null = null;
  // The bounded working copy, never the original: a camera's full-size file would make every PDF slow.
  const workPath = photo ? await workingCopyPath(uploadsDir, photo) : null;
  if (workPath) photoBytes = await fs.readFile(workPath).catch(() => null);
  const r = revision.result;
  const system = revision.catalog.systems.find((s) => s.key === r.system);
  return {
    piece: {
      description: piece?.description ?? title,
      kind: piece?.kind ?? '',
      maker: piece?.maker ?? null,
      year: piece ? (piece.yearText ?? (piece.year === null ? null : String(piece.year))) : null,
      serial: piece?.serial ?? null,
      photo: photoBytes,
      photoCaption: photo?.caption || null,
    },
    work: {
      systemName: system?.name ?? r.system,
      areaM2: r.totals.areaM2,
      areaText: formatArea(r.totals.areaM2, units),
      totalCoats: r.totals.coats,
      labourHours: roundHoursForCustomer(r.totals.labourHours),
      calendarDays: r.totals.calendarDays,
      // Dates are promised only once the job is booked; the estimate's own calendar is a planning guess.
      startDate: schedule?.start ?? null,
      readyDate: schedule?.ready ?? null,
      datesBooked: schedule !== null,
      stages: r.stages
        .filter((s) => s.sessions > 0)
        .map((s) => ({ name: s.name, sessions: s.sessions, coats: s.coats > 0 ? s.coats : null, hours: roundHoursForCustomer(s.labourHours), restText: restText(s.restHours) })),
    },
  };
}

/** The acceptance record of an accepted quote: what was agreed, by whom, when, from which address. */
export async function acceptanceRecordOf(quoteId: number): Promise<AcceptanceRecord> {
  const { quote, estimate, customer } = await load(quoteId);
  const agreed = agreedOf(quote);
  if (!agreed || !quote.acceptedAt) throw problems.conflict('not_accepted', `Quote ${quote.number} has not been accepted: there is no acceptance record yet.`);
  const [revision, workshop, { settings }, piece] = await Promise.all([
    EstimateRevision.findByPk(quote.revisionId),
    Workshop.findOne({ order: [['id', 'ASC']] }),
    loadSettings(),
    Piece.findByPk(estimate.pieceId),
  ]);
  const r = revision!.result;
  const lines = await lineDtos(await linesOf(quote.id));
  const several = lines.length > 1;
  const optionName = (l: QuoteLineDto) => l.label || l.estimate.title;
  const chosen = lines.filter((l) => l.chosen);
  return {
    ...(several
      ? {
          choices: chosen.map((l) => ({ piece: l.piece.description, option: optionName(l), hours: roundHoursForCustomer(l.labourHours), total: l.total })),
          optionsDeclined: lines.filter((l) => !l.chosen).map((l) => `${l.piece.description}: ${optionName(l)}`),
        }
      : {}),
    paperSize: settings.paperSize,
    workshop: { name: workshop?.name ?? 'Workshop', address: workshop?.address ?? null, email: workshop?.email ?? null, phone: workshop?.phone ?? null },
    quoteNumber: quote.number,
    estimateNumber: `${estimate.number} rev. ${revision!.number}`,
    customerName: customer.name,
    piece: several ? [...new Set(chosen.map((l) => l.piece.description))].join('; ') : (piece?.description ?? estimate.title),
    systemName: several ? `${chosen.length} ${chosen.length === 1 ? 'piece' : 'pieces'}` : (revision!.catalog.systems.find((s) => s.key === r.system)?.name ?? r.system),
    currency: quote.currency,
    taxLabel: quote.pricing.taxLabel,
    quotedTotal: several ? (chosen.reduce((t, l) => t + Math.round(Number(l.total) * 100), 0) / 100).toFixed(2) : Number(quote.total).toFixed(2),
    extrasTaken: agreed.extras.map((x) => ({ label: x.label, hours: x.hours, price: x.priceWithTax })),
    extrasDeclined: quote.extras.filter((x) => !agreed.extras.some((y) => y.id === x.id)).map((x) => x.label),
    agreedTotal: agreed.total,
    depositPct: Number(quote.depositPct),
    deposit: agreed.deposit,
    balance: agreed.balance,
    acceptedName: quote.acceptedName ?? '',
    acceptedAt: quote.acceptedAt.toISOString(),
    acceptedIp: quote.acceptedIp ?? '',
    depositPaidAt: iso(quote.depositPaidAt),
    terms: QUOTE_TERMS,
  };
}
