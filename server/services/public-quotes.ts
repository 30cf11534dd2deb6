/**
 * What the customer can do through their signed link, without an account: read the quote, download the PDF,
 * accept (typed name, terms ticked; time and address kept) or decline, and pay the deposit.
 */
import { mirrorEstimate, moveQuote, QUOTE_MOVES, quoteStateOn } from '@shared/schemas/state-moves';
import { today } from '@shared/time';
import type { QuoteState } from '@shared/schemas/quotes';
import { Op, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { customerCautions } from '@shared/calc';
import { QUOTE_TERMS, choiceFigures, choiceProblem, customerPriceLines, onlyChoice, roundHoursForCustomer, type AcceptQuoteSchema, type ChoiceLine, type PublicQuote, type PublicQuoteLine } from '@shared/schemas/quotes';
import { formatArea } from '@shared/units';
import type { Config } from '../config';
import { HttpProblem } from '../http/problem';
import type { AcceptanceRecord } from '../pdf/acceptance-pdf';
import { Customer, Estimate, EstimateRevision, Payment, Piece, Quote, QuoteLine } from '../models';
import { currentWorkshop } from './workshops';
import { audit } from './audit';
import { loadSettings } from './catalog';
import { deliver } from './mail';
import { messageOnAcceptance } from './messages';
import { cardPaymentsReady, lapseCheckouts } from './payment-provider';
import { cancelCheckout, openCheckout } from './payments';
import {
  acceptanceRecordOf,
  agreedOf,
  alreadyAgreed,
  bookedSchedule,
  buildDocument,
  expireQuotes,
  hashToken,
  linesOf,
  lockQuote,
  openQuotesNaming,
  pieceAgreement,
  quoteLink,
  shownPricing,
  tokenSigned,
} from './quotes';

type AcceptInput = z.output<typeof AcceptQuoteSchema>;

const linkInvalid = () => new HttpProblem(404, 'link_invalid', 'Link not valid', 'This quote link is not valid. Check that the whole address was copied, or ask the workshop for a new link.');

/** Finds the quote a link opens; a tampered or unknown token is a 404 that says so. */
async function byToken(config: Config, token: string, transaction?: Transaction): Promise<Quote> {
  if (!tokenSigned(token, config.linkSecret)) throw linkInvalid();
  const quote = await Quote.findOne({ where: { tokenHash: hashToken(token) }, transaction });
  if (!quote || quote.state === 'draft') throw linkInvalid();
  return quote;
}

/** The link's quote locked for an answer, its estimate locked first (see lockQuote). */
async function lockByToken(config: Config, token: string, transaction: Transaction): Promise<Awaited<ReturnType<typeof lockQuote>>> {
  // An answer is a write: the quotes that ran out are written down first, so that it meets them expired.
  await expireQuotes(transaction);
  const found = await byToken(config, token, transaction);
  const locked = await lockQuote(found.id, transaction);
  if (locked.quote.tokenHash !== hashToken(token)) throw linkInvalid();
  return locked;
}

function closedReason(q: Quote): PublicQuote['closed'] {
  const state = quoteStateOn(q.state, q.validUntil, today());
  if (state === 'withdrawn' || q.revoked) return 'withdrawn';
  if (state === 'expired') return 'expired';
  if (state === 'accepted' || state === 'declined' || state === 'deposit-paid') return state;
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
  if (quoteStateOn(found.state, found.validUntil, today()) === 'quoted' && !found.revoked) {
    // Conditional, so that an answer given meanwhile is never overwritten by "viewed".
    const [n] = await Quote.update({ state: moveQuote('quoted', 'view'), viewedAt: new Date() }, { where: { id: found.id, state: 'quoted', revoked: false } });
    if (n > 0) await Estimate.update({ state: mirrorEstimate('quoted', 'view') }, { where: { id: found.estimateId, state: 'quoted' } });
  }
  const quote = (await Quote.findByPk(found.id))!;
  const estimate = (await Estimate.findByPk(quote.estimateId))!;
  const [customer, piece, revision, workshop, { settings }] = await Promise.all([
    Customer.findByPk(estimate.customerId),
    Piece.findByPk(estimate.pieceId),
    EstimateRevision.findByPk(quote.revisionId),
    currentWorkshop(),
    loadSettings(),
  ]);
  const r = revision!.result;
  const lineRows = await linesOf(quote.id);
  const lines = await publicLines(lineRows, settings.units);
  const [schedule, lastPayment, openPayment] = await Promise.all([
    bookedSchedule(quote.id),
    Payment.findOne({ where: { quoteId: quote.id, flag: null }, order: [['id', 'DESC']] }),
    Payment.findOne({ where: { quoteId: quote.id, status: 'pending' } }),
  ]);
  // The quote's own price in the customer's lines: for several lines, the recommended choice with their hours.
  const shown = shownPricing(quote, lineRows);
  const shownHours = lineRows.length > 1 ? lines.filter((l) => shown.lines.some((x) => x.position === l.id)).reduce((t, l) => t + l.hoursExact, 0) : r.totals.labourHours;
  return {
    lines: lines.map(({ hoursExact: _, ...l }) => l),
    recommended: lines.filter((l) => l.recommended).map((l) => l.id),
    number: quote.number,
    state: quoteStateOn(quote.state, quote.validUntil, today()),
    closed: closedReason(quote),
    workshop: { name: workshop!.name, email: workshop!.email, phone: workshop!.phone, address: workshop!.address },
    customerName: customer!.name,
    piece: lines.length > 1 ? [...new Set(lines.map((l) => l.piece))].join(' and ') : (piece?.description ?? estimate.title),
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
    pricing: { ...shown.pricing, lines: customerPriceLines(shown.pricing, shownHours) },
    schedule: { booked: schedule !== null, start: schedule?.start ?? null, ready: schedule?.ready ?? null, calendarDays: r.totals.calendarDays },
    agreed: agreedOf(quote),
    checkout: { open: openPayment !== null, lastStatus: lastPayment?.status ?? null, available: await cardPaymentsReady(config) },
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

/** The quote's lines as the customer reads them (plain work, customer price lines), with each line's exact hours. */
async function publicLines(rows: readonly QuoteLine[], units: Parameters<typeof formatArea>[1]): Promise<(PublicQuoteLine & { hoursExact: number })[]> {
  const [estimates, revisions, pieces] = await Promise.all([
    Estimate.findAll({ where: { id: rows.map((l) => l.estimateId) }, attributes: ['id', 'title'] }),
    EstimateRevision.findAll({ where: { id: rows.map((l) => l.revisionId) }, attributes: ['id', 'result', 'catalog'] }),
    Piece.findAll({ where: { id: rows.map((l) => l.pieceId) }, attributes: ['id', 'description'] }),
  ]);
  return rows.map((l) => {
    const rev = revisions.find((x) => x.id === l.revisionId)!;
    const r = rev.result;
    return {
      // The customer knows a line by its place in the quote, never by a database id.
      id: l.position,
      group: l.optionGroup,
      groupOptional: l.groupOptional,
      label: l.label,
      recommended: l.recommended,
      piece: pieces.find((x) => x.id === l.pieceId)?.description ?? estimates.find((x) => x.id === l.estimateId)?.title ?? '',
      work: {
        systemName: rev.catalog.systems.find((s) => s.key === r.system)?.name ?? r.system,
        coats: r.totals.coats,
        labourHours: roundHoursForCustomer(r.totals.labourHours),
        calendarDays: r.totals.calendarDays,
        areaText: formatArea(r.totals.areaM2, units),
        stages: r.stages
          .filter((s) => s.sessions > 0)
          .map((s) => ({ name: s.name, sessions: s.sessions, coats: s.coats > 0 ? s.coats : null, hours: roundHoursForCustomer(s.labourHours) })),
      },
      pricing: { ...l.pricing, lines: customerPriceLines(l.pricing, r.totals.labourHours) },
      total: Number(l.total).toFixed(2),
      chosen: l.chosen,
      hoursExact: r.totals.labourHours,
    };
  });
}

/** The lines as the customer chooses between them: each known by its place in the quote. */
export function choiceLines(rows: readonly QuoteLine[]): ChoiceLine[] {
  return rows.map((l) => ({ id: l.position, group: l.optionGroup, groupOptional: l.groupOptional, total: Number(l.total).toFixed(2) }));
}

export async function publicPdf(config: Config, token: string): Promise<{ number: string; doc: Awaited<ReturnType<typeof buildDocument>> }> {
  const quote = await byToken(config, token);
  return { number: quote.number, doc: await buildDocument(quote.id, config.uploadsDir) };
}

/**
 * The customer accepts, with the lines they chose (one a group; none where a group is optional) and the extras they
 * ticked. Under the rows of every estimate the quote names, then the quote's: none of the chosen pieces may be agreed
 * already (409 naming the quote), the other open quotes naming a chosen piece are withdrawn, and the database's
 * one-agreement index on the chosen lines' pieces refuses a second acceptance whatever the interleaving.
 */
export async function acceptQuote(sequelize: Sequelize, config: Config, token: string, input: AcceptInput, ip: string): Promise<PublicQuote> {
  let confirmation: number | null = null;
  try {
    await sequelize.transaction(async (transaction) => {
      const { quote, estimates, lines } = await lockByToken(config, token, transaction);
      if (closedReason(quote)) throw closedProblem(quote);
      const choice = choiceLines(lines);
      const chosenIds = input.lines ?? onlyChoice(choice);
      if (!chosenIds) throw new HttpProblem(400, 'choice_required', 'Choose the options', 'Choose one option for each piece before accepting.', { field: 'lines' });
      const wrong = choiceProblem(choice, chosenIds);
      if (wrong) throw new HttpProblem(400, 'invalid_choice', 'Invalid choice', sentence(wrong), { field: 'lines' });
      if (chosenIds.length === 0) {
        throw new HttpProblem(400, 'nothing_chosen', 'Nothing chosen', 'Choose at least one piece of work to accept the quote, or decline it.', { field: 'lines' });
      }
      const chosen = lines.filter((l) => chosenIds.includes(l.position));
      const agreed = await pieceAgreement(chosen.map((l) => l.pieceId), transaction);
      if (agreed && agreed.quote.id !== quote.id) throw await alreadyAgreed(agreed, lines.map((l) => l.estimateId), transaction);
      const unknown = input.extras.filter((id) => !quote.extras.some((x) => x.id === id));
      if (unknown.length) throw new HttpProblem(400, 'unknown_extra', 'Unknown extra', `${unknown.length === 1 ? 'This extra is' : 'These extras are'} not offered on this quote: ${unknown.join(', ')}.`, { field: 'extras' });
      const extras = quote.extras.filter((x) => input.extras.includes(x.id)).map((x) => x.id);
      const amounts = choiceFigures({ lines: choice, depositPct: Number(quote.depositPct), extras: quote.extras }, chosenIds, extras);
      await quote.update(
        { state: moveQuote(quote.state, 'accept'), acceptedAt: new Date(), acceptedName: input.name, acceptedIp: ip, acceptedExtras: extras, acceptedTotal: amounts.total, acceptedDeposit: amounts.deposit },
        { transaction },
      );
      for (const l of lines) {
        const taken = chosenIds.includes(l.position);
        await l.update({ chosen: taken, agreed: taken }, { transaction });
      }
      // Other open quotes naming a piece now agreed can no longer be answered.
      const pieces = chosen.map((l) => l.pieceId);
      const others = pieces.length
        ? await QuoteLine.findAll({ where: { pieceId: { [Op.in]: pieces }, quoteId: { [Op.ne]: quote.id } }, attributes: ['quoteId'], transaction })
        : [];
      const [, withdrawn] = await Quote.update(
        { state: QUOTE_MOVES.superseded.to as QuoteState, revoked: true },
        { where: { id: { [Op.in]: [...new Set(others.map((o) => o.quoteId))] }, state: { [Op.in]: [...QUOTE_MOVES.superseded.from] } }, transaction, returning: ['id', 'number'] },
      );
      for (const estimate of estimates) {
        const taken = chosen.some((l) => l.estimateId === estimate.id);
        const otherOpenQuotes = taken || !['quoted', 'viewed'].includes(estimate.state) ? 0 : await openQuotesNaming(estimate.id, quote.id, transaction);
        const state = mirrorEstimate(estimate.state, 'accept', { chosen: taken, otherOpenQuotes });
        if (state !== estimate.state) await estimate.update({ state }, { transaction });
      }
      await audit(
        {
          userId: null,
          action: 'quote.accept',
          entityType: 'quote',
          entityId: quote.id,
          after: { name: input.name, ip, lines: chosen.map((l) => l.position), extras, total: amounts.total, deposit: amounts.deposit, withdrawn: (withdrawn as unknown as Quote[]).map((q) => q.number) },
        },
        transaction,
      );
      // The acceptance confirmation, from the owner's template, sent once this commits.
      confirmation = await messageOnAcceptance(sequelize, quote, quoteLink(config, token), transaction);
    });
    if (confirmation) await deliver(config, confirmation);
  } catch (err) {
    if (err instanceof UniqueConstraintError) {
      // Another quote's acceptance of one of these pieces committed first.
      const quote = await byToken(config, token);
      const lines = await linesOf(quote.id);
      const agreed = await pieceAgreement(lines.map((l) => l.pieceId));
      if (agreed && agreed.quote.id !== quote.id) throw await alreadyAgreed(agreed, lines.map((l) => l.estimateId));
    }
    throw err;
  }
  return viewQuote(config, token);
}

export async function declineQuote(sequelize: Sequelize, config: Config, token: string, reason: string, ip: string): Promise<PublicQuote> {
  await sequelize.transaction(async (transaction) => {
    const { quote, estimates } = await lockByToken(config, token, transaction);
    if (closedReason(quote)) throw closedProblem(quote);
    await quote.update({ state: moveQuote(quote.state, 'decline'), declinedAt: new Date(), declineReason: reason || null }, { transaction });
    for (const estimate of estimates) {
      const state = mirrorEstimate(estimate.state, 'decline', { otherOpenQuotes: await openQuotesNaming(estimate.id, quote.id, transaction) });
      if (state !== estimate.state) await estimate.update({ state }, { transaction });
    }
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

/** A rule's phrase as the customer reads it: a capital first letter and a full stop. */
function sentence(phrase: string): string {
  return `${phrase.charAt(0).toUpperCase()}${phrase.slice(1)}.`;
}
