/**
 * What the customer can do through their signed link, without an account: read the quote, download the PDF,
 * accept (typed name, terms ticked; time and address kept) or decline, and pay the deposit.
 */
import { Op, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { customerCautions } from '@shared/calc';
import { QUOTE_TERMS, customerPriceLines, roundHoursForCustomer, type AcceptQuoteSchema, type PublicQuote } from '@shared/schemas/quotes';
import { formatArea } from '@shared/units';
import type { Config } from '../config';
import { HttpProblem } from '../http/problem';
import type { AcceptanceRecord } from '../pdf/acceptance-pdf';
import { Customer, Estimate, EstimateRevision, Payment, Piece, Quote, Workshop } from '../models';
import { audit } from './audit';
import { loadSettings } from './catalog';
import { cancelCheckout, lapseCheckouts, openCheckout } from './payments';
import {
  acceptanceRecordOf,
  acceptedAmounts,
  agreedOf,
  agreementOf,
  alreadyAgreed,
  bookedSchedule,
  buildDocument,
  expireQuotes,
  hashToken,
  lockQuote,
  quoteLink,
  tokenSigned,
} from './quotes';

type AcceptInput = z.output<typeof AcceptQuoteSchema>;

const linkInvalid = () => new HttpProblem(404, 'link_invalid', 'Link not valid', 'This quote link is not valid. Check that the whole address was copied, or ask the workshop for a new link.');

/** Finds the quote a link opens; a tampered or unknown token is a 404 that says so. */
async function byToken(config: Config, token: string, transaction?: Transaction): Promise<Quote> {
  if (!tokenSigned(token, config.linkSecret)) throw linkInvalid();
  await expireQuotes(transaction);
  const quote = await Quote.findOne({ where: { tokenHash: hashToken(token) }, transaction });
  if (!quote || quote.state === 'draft') throw linkInvalid();
  return quote;
}

/** The link's quote locked for an answer, its estimate locked first (see lockQuote). */
async function lockByToken(config: Config, token: string, transaction: Transaction): Promise<{ quote: Quote; estimate: Estimate }> {
  const found = await byToken(config, token, transaction);
  const locked = await lockQuote(found.id, transaction);
  if (locked.quote.tokenHash !== hashToken(token)) throw linkInvalid();
  return locked;
}

function closedReason(q: Quote): PublicQuote['closed'] {
  if (q.state === 'withdrawn' || q.revoked) return 'withdrawn';
  if (q.state === 'expired') return 'expired';
  if (q.state === 'accepted' || q.state === 'declined' || q.state === 'deposit-paid') return q.state;
  return null;
}

function closedProblem(q: Quote): HttpProblem {
  const reason = closedReason(q);
  const text: Record<string, string> = {
    withdrawn: 'The workshop has withdrawn this quote; ask them for the current one.',
    expired: `This quote expired on ${q.validUntil}. Ask the workshop for a new one.`,
    accepted: 'This quote has already been accepted.',
    declined: 'This quote has already been declined.',
    'deposit-paid': 'This quote has been accepted and its deposit paid.',
  };
  return new HttpProblem(409, `quote_${reason}`.replace('-', '_'), 'Quote closed', text[reason ?? ''] ?? 'This quote can no longer be answered.');
}

export async function viewQuote(config: Config, token: string): Promise<PublicQuote> {
  const found = await byToken(config, token);
  await lapseCheckouts(found.id);
  if (found.state === 'quoted' && !found.revoked) {
    // Conditional, so that an answer given meanwhile is never overwritten by "viewed".
    const [n] = await Quote.update({ state: 'viewed', viewedAt: new Date() }, { where: { id: found.id, state: 'quoted', revoked: false } });
    if (n > 0) await Estimate.update({ state: 'viewed' }, { where: { id: found.estimateId, state: 'quoted' } });
  }
  const quote = (await Quote.findByPk(found.id))!;
  const estimate = (await Estimate.findByPk(quote.estimateId))!;
  const [customer, piece, revision, workshop, { settings }] = await Promise.all([
    Customer.findByPk(estimate.customerId),
    Piece.findByPk(estimate.pieceId),
    EstimateRevision.findByPk(quote.revisionId),
    Workshop.findOne({ order: [['id', 'ASC']] }),
    loadSettings(),
  ]);
  const r = revision!.result;
  const [schedule, lastPayment, openPayment] = await Promise.all([
    bookedSchedule(quote.id),
    Payment.findOne({ where: { quoteId: quote.id, flag: null }, order: [['id', 'DESC']] }),
    Payment.findOne({ where: { quoteId: quote.id, status: 'pending' } }),
  ]);
  return {
    number: quote.number,
    state: quote.state,
    closed: closedReason(quote),
    workshop: { name: workshop!.name, email: workshop!.email, phone: workshop!.phone, address: workshop!.address },
    customerName: customer!.name,
    piece: piece?.description ?? estimate.title,
    message: quote.message,
    validUntil: quote.validUntil,
    work: {
      systemName: revision!.catalog.systems.find((s) => s.key === r.system)?.name ?? r.system,
      coats: r.totals.coats,
      labourHours: roundHoursForCustomer(r.totals.labourHours),
      calendarDays: r.totals.calendarDays,
      areaText: formatArea(r.totals.areaM2, settings.units),
      stages: r.stages
        .filter((s) => s.sessions > 0)
        .map((s) => ({ name: s.name, sessions: s.sessions, coats: s.coats > 0 ? s.coats : null, hours: roundHoursForCustomer(s.labourHours) })),
    },
    // The customer's lines only: the labour rate, overhead and margin stay on staff screens.
    pricing: { ...quote.pricing, lines: customerPriceLines(quote.pricing, r.totals.labourHours) },
    schedule: { booked: schedule !== null, start: schedule?.start ?? null, ready: schedule?.ready ?? null, calendarDays: r.totals.calendarDays },
    agreed: agreedOf(quote),
    checkout: { open: openPayment !== null, lastStatus: lastPayment?.status ?? null },
    extras: quote.extras,
    terms: QUOTE_TERMS,
    cautions: customerCautions(r.cautions),
    acceptedName: quote.acceptedName,
    acceptedAt: quote.acceptedAt?.toISOString() ?? null,
    acceptedExtras: quote.acceptedExtras,
    acceptedTotal: quote.acceptedTotal === null ? null : Number(quote.acceptedTotal).toFixed(2),
    acceptedDeposit: quote.acceptedDeposit === null ? null : Number(quote.acceptedDeposit).toFixed(2),
    declinedAt: quote.declinedAt?.toISOString() ?? null,
    depositPaidAt: quote.depositPaidAt?.toISOString() ?? null,
    pricesIncludeTax: settings.pricesIncludeTax,
  };
}

export async function publicPdf(config: Config, token: string): Promise<{ number: string; doc: Awaited<ReturnType<typeof buildDocument>> }> {
  const quote = await byToken(config, token);
  return { number: quote.number, doc: await buildDocument(quote.id, config.uploadsDir) };
}

/**
 * The customer accepts, with the extras they ticked. Under the estimate's row lock: no other quote for the estimate
 * may be accepted already (409 naming it), the other open quotes are withdrawn, and the database's one-agreement
 * index refuses a second acceptance whatever the interleaving.
 */
export async function acceptQuote(sequelize: Sequelize, config: Config, token: string, input: AcceptInput, ip: string): Promise<PublicQuote> {
  try {
    await sequelize.transaction(async (transaction) => {
      const { quote, estimate } = await lockByToken(config, token, transaction);
      if (closedReason(quote)) throw closedProblem(quote);
      const agreed = await agreementOf(estimate.id, transaction);
      if (agreed && agreed.id !== quote.id) throw alreadyAgreed(estimate.number, agreed);
      const unknown = input.extras.filter((id) => !quote.extras.some((x) => x.id === id));
      if (unknown.length) throw new HttpProblem(400, 'unknown_extra', 'Unknown extra', `extras: ${unknown.join(', ')} is not offered on this quote`, { field: 'extras' });
      const extras = quote.extras.filter((x) => input.extras.includes(x.id)).map((x) => x.id);
      const amounts = acceptedAmounts(quote, extras);
      await quote.update(
        { state: 'accepted', acceptedAt: new Date(), acceptedName: input.name, acceptedIp: ip, acceptedExtras: extras, acceptedTotal: amounts.total, acceptedDeposit: amounts.deposit },
        { transaction },
      );
      const [, withdrawn] = await Quote.update(
        { state: 'withdrawn', revoked: true },
        { where: { estimateId: estimate.id, id: { [Op.ne]: quote.id }, state: { [Op.in]: ['draft', 'quoted', 'viewed'] } }, transaction, returning: ['id', 'number'] },
      );
      await estimate.update({ state: 'accepted' }, { transaction });
      await audit(
        {
          userId: null,
          action: 'quote.accept',
          entityType: 'quote',
          entityId: quote.id,
          after: { name: input.name, ip, extras, total: amounts.total, deposit: amounts.deposit, withdrawn: (withdrawn as unknown as Quote[]).map((q) => q.number) },
        },
        transaction,
      );
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) {
      const quote = await byToken(config, token);
      const agreed = await agreementOf(quote.estimateId);
      const estimate = await Estimate.findByPk(quote.estimateId);
      if (agreed && estimate) throw alreadyAgreed(estimate.number, agreed);
    }
    throw err;
  }
  return viewQuote(config, token);
}

export async function declineQuote(sequelize: Sequelize, config: Config, token: string, reason: string, ip: string): Promise<PublicQuote> {
  await sequelize.transaction(async (transaction) => {
    const { quote, estimate } = await lockByToken(config, token, transaction);
    if (closedReason(quote)) throw closedProblem(quote);
    await quote.update({ state: 'declined', declinedAt: new Date(), declineReason: reason || null }, { transaction });
    // The estimate is declined only when no other quote for it is still open.
    const open = await Quote.count({ where: { estimateId: estimate.id, id: { [Op.ne]: quote.id }, state: { [Op.in]: ['quoted', 'viewed'] } }, transaction });
    if (open === 0) await estimate.update({ state: 'declined' }, { transaction });
    await audit({ userId: null, action: 'quote.decline', entityType: 'quote', entityId: quote.id, after: { reason, ip } }, transaction);
  });
  return viewQuote(config, token);
}

/** Opens the provider's checkout for the deposit of an accepted quote, or returns the one still open. */
export async function depositCheckout(sequelize: Sequelize, config: Config, token: string): Promise<{ url: string; reused: boolean }> {
  const quote = await byToken(config, token);
  if (quote.state === 'deposit-paid') throw closedProblem(quote);
  if (quote.state !== 'accepted') throw new HttpProblem(409, 'not_accepted', 'Accept first', 'Accept the quote before paying the deposit.');
  const estimate = (await Estimate.findByPk(quote.estimateId))!;
  const customer = await Customer.findByPk(estimate.customerId);
  return openCheckout(sequelize, config, quote.id, {
    returnUrl: quoteLink(config, token),
    description: `Deposit for quote ${quote.number}: ${estimate.title}`,
    email: quote.recipient ?? customer?.email ?? null,
  });
}

/** The customer came back from the payment page without paying: the open checkout is closed and shown as cancelled. */
export async function depositCancelled(config: Config, token: string): Promise<PublicQuote> {
  const quote = await byToken(config, token);
  await cancelCheckout(config, quote.id);
  return viewQuote(config, token);
}

/** The acceptance record through the customer's link (a 409 before acceptance). */
export async function acceptanceRecord(config: Config, token: string): Promise<AcceptanceRecord> {
  const quote = await byToken(config, token);
  return acceptanceRecordOf(quote.id);
}
