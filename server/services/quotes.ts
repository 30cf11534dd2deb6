/**
 * Quotes: a priced estimate's revision offered to the customer, with a covering message, optional extras, a
 * discount within the owner's cap, a validity date and a deposit. Sending makes the PDF, e-mails it through the
 * outbox with the customer's signed link, and moves the estimate along.
 */
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import fs from 'node:fs/promises';
import { Op, QueryTypes, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { estimate as runEstimate } from '@shared/calc';
import { money, percentOf, sumMoney } from '@shared/money';
import type { Page, Role } from '@shared/schemas/auth';
import type { EstimateState } from '@shared/schemas/estimates';
import { formatArea } from '@shared/units';
import {
  QUOTE_TERMS,
  type CreateQuoteSchema,
  type PipelineRow,
  type QuoteDetail,
  type QuoteExtra,
  type QuoteListQuerySchema,
  type QuotePricing,
  type QuoteState,
  type QuoteSummary,
} from '@shared/schemas/quotes';
import type { Config } from '../config';
import { HttpProblem, problems } from '../http/problem';
import { Customer, Estimate, EstimateRevision, OutboxMessage, Payment, Piece, PiecePhoto, Quote, User, Workshop } from '../models';
import type { QuoteDocument } from '../pdf/quote-document';
import { renderQuotePdf } from '../pdf/quote-pdf';
import { audit } from './audit';
import { loadSettings } from './catalog';
import { deliver } from './mail';
import { containsPattern, direction, offset } from './paging';
import { storedPath } from './photos';

type CreateInput = z.output<typeof CreateQuoteSchema>;
type ListQuery = z.output<typeof QuoteListQuerySchema>;

/** Estimate states from which a new quote may be made. */
const QUOTABLE: readonly EstimateState[] = ['priced', 'quoted', 'viewed', 'expired', 'declined'];

const today = () => new Date().toISOString().slice(0, 10);
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

function withTax(price: string, taxPct: number): string {
  return money(price).plus(percentOf(price, taxPct)).toFixed(2);
}

/** The total and deposit once the customer has chosen which extras they take. */
export function acceptedAmounts(q: Pick<Quote, 'total' | 'extras' | 'depositPct'>, extraIds: readonly string[]): { total: string; deposit: string } {
  const chosen = q.extras.filter((x) => extraIds.includes(x.id));
  const total = sumMoney([q.total, ...chosen.map((x) => x.priceWithTax)]);
  return { total: total.toFixed(2), deposit: percentOf(total, Number(q.depositPct)).toFixed(2) };
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
    state: q.state,
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

export async function getQuote(id: number, transaction?: Transaction): Promise<QuoteDetail> {
  await expireQuotes();
  const { quote: q, estimate, customer } = await load(id, transaction);
  const payments = await Payment.findAll({ where: { quoteId: id }, order: [['id', 'ASC']], transaction });
  const piece = await Piece.findByPk(estimate.pieceId, { attributes: ['id', 'description'], transaction });
  return {
    ...summary(q, estimate, customer, await revisionNumber(q.revisionId, transaction)),
    piece: piece ? { id: piece.id, description: piece.description } : null,
    message: q.message,
    discountPct: Number(q.discountPct),
    depositPct: Number(q.depositPct),
    extras: q.extras,
    pricing: q.pricing,
    acceptedName: q.acceptedName,
    acceptedIp: q.acceptedIp,
    acceptedExtras: q.acceptedExtras,
    acceptedDeposit: q.acceptedDeposit === null ? null : Number(q.acceptedDeposit).toFixed(2),
    declineReason: q.declineReason,
    payments: payments.map((p) => ({
      id: p.id,
      amount: (Number(p.amountMinor) / 10 ** (new Intl.NumberFormat('en', { style: 'currency', currency: p.currency }).resolvedOptions().maximumFractionDigits ?? 2)).toFixed(2),
      currency: p.currency,
      status: p.status,
      createdAt: p.createdAt.toISOString(),
      paidAt: iso(p.paidAt),
    })),
  };
}

// ------------------------------------------------------------------------------------------ life cycle

/** Quotes past their date that nobody answered become expired, and so do their estimates. */
export async function expireQuotes(transaction?: Transaction): Promise<void> {
  const sequelize = Quote.sequelize!;
  await sequelize.query(
    `WITH gone AS (
       UPDATE quotes SET state = 'expired', updated_at = now()
        WHERE state IN ('quoted', 'viewed') AND valid_until < current_date
        RETURNING estimate_id)
     UPDATE estimates SET state = 'expired', updated_at = now()
      WHERE id IN (SELECT estimate_id FROM gone) AND state IN ('quoted', 'viewed')`,
    { transaction },
  );
}

async function nextNumber(sequelize: Sequelize, transaction: Transaction): Promise<string> {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('quote_number_seq') AS n", { type: QueryTypes.SELECT, transaction });
  return `Q-${new Date().getFullYear()}-${String(row!.n).padStart(4, '0')}`;
}

export async function createQuote(sequelize: Sequelize, actor: { id: number; role: Role }, estimateId: number, input: CreateInput): Promise<QuoteDetail> {
  const id = await sequelize.transaction(async (transaction) => {
    const estimate = await Estimate.findByPk(estimateId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!estimate) throw problems.notFound('Estimate');
    if (estimate.archived) throw problems.conflict('estimate_archived', `Estimate ${estimate.number} is archived.`);
    if (!QUOTABLE.includes(estimate.state)) {
      const why = estimate.state === 'draft' ? 'is still a draft: the estimator marks it priced first' : `is ${estimate.state}`;
      throw problems.conflict('estimate_not_quotable', `Estimate ${estimate.number} ${why}.`);
    }
    const revision = input.revision
      ? await EstimateRevision.findOne({ where: { estimateId, number: input.revision }, transaction })
      : await EstimateRevision.findByPk(estimate.currentRevisionId!, { transaction });
    if (!revision) throw problems.badRequest('unknown_revision', `revision: estimate ${estimate.number} has no revision ${input.revision}`, 'revision');
    const { settings } = await loadSettings(transaction);
    const discountPct = input.discountPct ?? revision.input.discountPct ?? 0;
    const cap = settings.pricing.maxDiscountPct;
    if (actor.role !== 'owner' && discountPct > cap) {
      throw problems.badRequest('discount_over_cap', `discountPct: at most ${cap} % (the owner's limit for sales)`, 'discountPct');
    }
    const validUntil = input.validUntil ?? new Date(Date.now() + settings.quoteValidityDays * 86_400_000).toISOString().slice(0, 10);
    if (validUntil < today()) throw problems.badRequest('valid_until_past', 'validUntil: must be today or later', 'validUntil');
    const depositPct = input.depositPct ?? settings.pricing.depositPct;
    const pricing = quotePricing(revision, discountPct, depositPct);
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
        revisionId: revision.id,
        message: input.message,
        extras,
        discountPct,
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
    await audit({ userId: actor.id, action: 'quote.create', entityType: 'quote', entityId: quote.id, after: { number: quote.number, estimate: estimate.number, total: quote.total, discountPct } }, transaction);
    return quote.id;
  });
  return getQuote(id);
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

function formatMoney(amount: string, currency: string): string {
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(Number(amount));
}

/**
 * Sends (or sends again) a quote: a new signed link (an earlier link stops working), the PDF, and an e-mail through
 * the outbox. The quote counts as sent only once the mail server has taken the message.
 */
export async function sendQuote(sequelize: Sequelize, config: Config, actorId: number, id: number, recipient?: string): Promise<QuoteDetail> {
  const { token, outboxId } = await sequelize.transaction(async (transaction) => {
    const { quote, estimate, customer } = await load(id, transaction);
    if (!['draft', 'quoted', 'viewed'].includes(quote.state)) {
      throw problems.conflict('quote_closed', `Quote ${quote.number} is ${quote.state}: it cannot be sent again.`);
    }
    if (quote.validUntil < today()) throw problems.conflict('quote_expired', `Quote ${quote.number} expired on ${quote.validUntil}. Make a new quote.`);
    const to = recipient ?? quote.recipient;
    if (!to) throw problems.badRequest('no_recipient', `recipient: ${customer.name} has no e-mail address; give one`, 'recipient');
    const link = makeToken(config.linkSecret);
    await quote.update({ tokenHash: link.hash, recipient: to }, { transaction });
    const { workshop } = await loadSettings(transaction);
    const pdf = await renderQuotePdf(await buildDocument(quote.id, config.uploadsDir, transaction));
    const url = quoteLink(config, link.token);
    const validUntil = new Date(`${quote.validUntil}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
    const total = formatMoney(quote.total, quote.currency);
    const deposit = formatMoney(quote.deposit, quote.currency);
    const intro = quote.message ? `${quote.message}\n\n` : '';
    const text =
      `Dear ${customer.name},\n\n${intro}Please find attached our quote ${quote.number} for ${estimate.title}: ${total}, ` +
      `with a deposit of ${deposit} to book the work. It is valid until ${validUntil}.\n\n` +
      `You can read it, accept or decline it, and pay the deposit here:\n${url}\n\n` +
      `French polishing uses flammable spirit and shellac; the work is done under our ventilation and fire precautions.\n\n` +
      `${workshop.name}\n${workshop.phone ?? ''}\n${workshop.email ?? ''}\n`;
    const html =
      `<p>Dear ${escapeHtml(customer.name)},</p>${quote.message ? quote.message.split(/\n{2,}/).map((p) => `<p>${escapeHtml(p)}</p>`).join('') : ''}` +
      `<p>Please find attached our quote <strong>${escapeHtml(quote.number)}</strong> for ${escapeHtml(estimate.title)}: <strong>${escapeHtml(total)}</strong>, ` +
      `with a deposit of ${escapeHtml(deposit)} to book the work. It is valid until ${escapeHtml(validUntil)}.</p>` +
      `<p><a href="${escapeHtml(url)}">Read, accept or decline the quote, and pay the deposit</a></p>` +
      `<p style="font-size:12px;color:#66412c">French polishing uses flammable spirit and shellac; the work is done under our ventilation and fire precautions.</p>` +
      `<p>${escapeHtml(workshop.name)}<br>${escapeHtml(workshop.phone ?? '')}<br>${escapeHtml(workshop.email ?? '')}</p>`;
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

/** After the mail server took a quote's message: the quote is sent and its estimate quoted. */
export async function markSent(sequelize: Sequelize, id: number): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const { quote, estimate } = await load(id, transaction);
    if (quote.state === 'draft') await quote.update({ state: 'quoted', sentAt: new Date() }, { transaction });
    else await quote.update({ sentAt: new Date() }, { transaction });
    // Only the newest quote speaks for the estimate: older open ones are withdrawn.
    await Quote.update(
      { state: 'withdrawn', revoked: true },
      { where: { estimateId: estimate.id, id: { [Op.ne]: quote.id }, state: { [Op.in]: ['draft', 'quoted', 'viewed'] } }, transaction },
    );
    if (['priced', 'quoted', 'viewed', 'expired', 'declined'].includes(estimate.state)) await estimate.update({ state: quote.state === 'viewed' ? 'viewed' : 'quoted' }, { transaction });
  });
}

export async function withdrawQuote(sequelize: Sequelize, actorId: number, id: number): Promise<QuoteDetail> {
  await sequelize.transaction(async (transaction) => {
    const { quote, estimate } = await load(id, transaction);
    if (!['draft', 'quoted', 'viewed'].includes(quote.state)) throw problems.conflict('quote_closed', `Quote ${quote.number} is ${quote.state}.`);
    await quote.update({ state: 'withdrawn', revoked: true }, { transaction });
    if (['quoted', 'viewed'].includes(estimate.state)) await estimate.update({ state: 'priced' }, { transaction });
    await audit({ userId: actorId, action: 'quote.withdraw', entityType: 'quote', entityId: id }, transaction);
  });
  return getQuote(id);
}

// ---------------------------------------------------------------------------------------- lists, pipeline

const SORTS: Record<ListQuery['sort'], unknown[]> = {
  number: ['number'],
  customer: [{ model: Estimate, as: 'estimate' }, 'title'],
  state: ['state'],
  total: ['total'],
  updatedAt: ['updatedAt'],
  validUntil: ['validUntil'],
};

export async function listQuotes(q: ListQuery): Promise<Page<QuoteSummary>> {
  await expireQuotes();
  const where: WhereOptions<Quote> = {};
  if (q.state) Object.assign(where, { state: q.state });
  if (q.estimateId) Object.assign(where, { estimateId: q.estimateId });
  if (q.q) {
    const like = containsPattern(q.q);
    Object.assign(where, { [Op.or]: [{ number: { [Op.iLike]: like } }, { recipient: { [Op.iLike]: like } }, { '$estimate.number$': { [Op.iLike]: like } }, { '$estimate.title$': { [Op.iLike]: like } }] });
  }
  const { rows, count } = await Quote.findAndCountAll({
    where,
    include: [{ model: Estimate, as: 'estimate' }],
    order: [[...SORTS[q.sort], direction(q.dir)], ['id', 'DESC']] as never,
    limit: q.pageSize,
    offset: offset(q.page, q.pageSize),
  });
  const customers = await Customer.findAll({ where: { id: rows.map((r) => r.estimate!.customerId) } });
  const revisions = await EstimateRevision.findAll({ where: { id: rows.map((r) => r.revisionId) }, attributes: ['id', 'number'] });
  return {
    rows: rows.map((r) =>
      summary(r, r.estimate!, customers.find((c) => c.id === r.estimate!.customerId)!, revisions.find((v) => v.id === r.revisionId)?.number ?? 0),
    ),
    total: count,
    page: q.page,
    pageSize: q.pageSize,
  };
}

/** Quotes by state: how many, and their value (accepted totals where accepted). */
export async function pipeline(sequelize: Sequelize): Promise<PipelineRow[]> {
  await expireQuotes();
  const rows = await sequelize.query<{ state: QuoteState; currency: string; count: string; value: string }>(
    `SELECT state, currency, count(*) AS count, coalesce(sum(coalesce(accepted_total, total)), 0)::numeric(14,2)::text AS value
       FROM quotes WHERE state <> 'withdrawn' GROUP BY state, currency ORDER BY state, currency`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ state: r.state, currency: r.currency, count: Number(r.count), value: r.value }));
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
  return documentFor({ uploadsDir, estimate, customer, revision, pricing: quote.pricing, number: quote.number, validUntil: quote.validUntil, message: quote.message, extras: quote.extras, createdBy: quote.createdBy, transaction });
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
  return documentFor({ uploadsDir, estimate, customer, revision, pricing, number: `Draft of ${estimate.number}`, validUntil: estimate.validUntil, message: '', extras: [], createdBy: estimate.ownerId });
}

async function documentFor(a: {
  uploadsDir: string;
  estimate: Estimate;
  customer: Customer;
  revision: EstimateRevision;
  pricing: QuotePricing;
  number: string;
  validUntil: string;
  message: string;
  extras: QuoteExtra[];
  createdBy: number | null;
  transaction?: Transaction;
}): Promise<QuoteDocument> {
  const { transaction, revision, pricing } = a;
  const workshop = await Workshop.findOne({ order: [['id', 'ASC']], transaction });
  const { settings } = await loadSettings(transaction);
  const piece = await Piece.findByPk(a.estimate.pieceId, { transaction });
  const photo = await PiecePhoto.findOne({ where: { pieceId: a.estimate.pieceId, mime: { [Op.in]: ['image/jpeg', 'image/png'] } }, order: [['id', 'ASC']], transaction });
  let photoBytes: Buffer | null = null;
  if (photo) photoBytes = await fs.readFile(storedPath(a.uploadsDir, photo.fileName)).catch(() => null);
  const author = a.createdBy ? await User.findByPk(a.createdBy, { transaction }) : null;
  const r = revision.result;
  const system = revision.catalog.systems.find((s) => s.key === r.system);
  const v = r.ventilation;
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
    piece: {
      description: piece?.description ?? a.estimate.title,
      kind: piece?.kind ?? '',
      maker: piece?.maker ?? null,
      year: piece?.year ?? null,
      serial: piece?.serial ?? null,
      photo: photoBytes,
      photoCaption: photo?.caption || null,
    },
    work: {
      systemName: system?.name ?? r.system,
      areaM2: r.totals.areaM2,
      areaText: formatArea(r.totals.areaM2, settings.units),
      totalCoats: r.totals.coats,
      labourHours: r.totals.labourHours,
      calendarDays: r.totals.calendarDays,
      startDate: r.calendar.start ? r.calendar.start.slice(0, 10) : null,
      readyDate: r.calendar.end ? r.calendar.end.slice(0, 10) : null,
      stages: r.stages.filter((s) => s.sessions > 0).map((s) => ({ name: s.name, sessions: s.sessions, coats: s.coats, hours: s.labourHours, restText: restText(s.restHours) })),
    },
    price: { lines: pricing.lines.map((l) => ({ label: l.label, amount: l.amount })), total: pricing.total, depositPct: pricing.depositPct, deposit: pricing.deposit, balance: pricing.balance },
    extras: a.extras.map((x) => ({ label: x.label, description: x.description, hours: x.hours, price: x.priceWithTax })),
    terms: QUOTE_TERMS,
    cautions: r.cautions,
    ventilationText: `While polishing the room needs fresh air of at least ${Math.ceil(v.requiredFlowM3h).toLocaleString('en-GB')} m³/h (${Math.ceil(v.requiredFlowCfm).toLocaleString('en-GB')} ft³/min) to keep spirit vapour below its exposure limit.`,
  };
}
