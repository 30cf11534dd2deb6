/**
 * Making a quote from one or more priced estimates: its lines, option groups, price and validity, in one transaction.
 */
import { daysFromToday, today } from '@shared/time';
import type { Sequelize } from 'sequelize';
import { money } from '@shared/money';
import type { Role } from '@shared/schemas/auth';
import type { EstimateState } from '@shared/schemas/estimates';
import type { CreateQuote, QuoteDetail, QuoteExtra } from '@shared/schemas/quotes';
import { problems } from '../../http/problem';
import { Customer, Estimate, EstimateRevision, Quote, QuoteLine } from '../../models';
import { audit } from '../audit';
import { loadSettings } from '../catalog';
import { alreadyAgreed, lockPieces, pieceAgreement } from './locks';
import { combinedPricing, quotePricing, withTax } from './pricing';
import { getQuote } from './read';
import { nextRecordNumber } from '../numbering';

type CreateInput = CreateQuote;

/** Estimate states from which a new quote may be made. */
const QUOTABLE: readonly EstimateState[] = ['priced', 'quoted', 'viewed', 'expired', 'declined'];
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
        number: await nextRecordNumber(sequelize, 'quote', transaction),
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
