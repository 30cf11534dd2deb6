/**
 * What the customer can do through their signed link, without an account: read the quote, download the PDF,
 * accept (typed name, terms ticked; time and address kept) or decline, and pay the deposit.
 */
import type { Sequelize, Transaction } from 'sequelize';
import type { z } from 'zod';
import { customerCautions } from '@shared/calc';
import { QUOTE_TERMS, type AcceptQuoteSchema, type PublicQuote } from '@shared/schemas/quotes';
import { formatArea } from '@shared/units';
import type { Config } from '../config';
import { HttpProblem } from '../http/problem';
import { Customer, Estimate, EstimateRevision, Piece, Quote, Workshop } from '../models';
import { audit } from './audit';
import { loadSettings } from './catalog';
import { startCheckout } from './payments';
import { acceptedAmounts, buildDocument, expireQuotes, hashToken, quoteLink, tokenSigned } from './quotes';

type AcceptInput = z.output<typeof AcceptQuoteSchema>;

const linkInvalid = () => new HttpProblem(404, 'link_invalid', 'Link not valid', 'This quote link is not valid. Check that the whole address was copied, or ask the workshop for a new link.');

/** Finds the quote a link opens; a tampered or unknown token is a 404 that says so. */
async function byToken(config: Config, token: string, transaction?: Transaction): Promise<Quote> {
  if (!tokenSigned(token, config.linkSecret)) throw linkInvalid();
  await expireQuotes(transaction);
  const quote = await Quote.findOne({ where: { tokenHash: hashToken(token) }, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!quote || quote.state === 'draft') throw linkInvalid();
  return quote;
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
  const quote = await byToken(config, token);
  if (quote.state === 'quoted' && !quote.revoked) {
    await quote.update({ state: 'viewed', viewedAt: new Date() });
    await Estimate.update({ state: 'viewed' }, { where: { id: quote.estimateId, state: 'quoted' } });
  }
  const estimate = (await Estimate.findByPk(quote.estimateId))!;
  const [customer, piece, revision, workshop, { settings }] = await Promise.all([
    Customer.findByPk(estimate.customerId),
    Piece.findByPk(estimate.pieceId),
    EstimateRevision.findByPk(quote.revisionId),
    Workshop.findOne({ order: [['id', 'ASC']] }),
    loadSettings(),
  ]);
  const r = revision!.result;
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
      labourHours: r.totals.labourHours,
      calendarDays: r.totals.calendarDays,
      areaText: formatArea(r.totals.areaM2, settings.units),
      stages: r.stages.filter((s) => s.sessions > 0).map((s) => ({ name: s.name, sessions: s.sessions, coats: s.coats })),
    },
    pricing: quote.pricing,
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

export async function acceptQuote(sequelize: Sequelize, config: Config, token: string, input: AcceptInput, ip: string): Promise<PublicQuote> {
  await sequelize.transaction(async (transaction) => {
    const quote = await byToken(config, token, transaction);
    if (closedReason(quote)) throw closedProblem(quote);
    const unknown = input.extras.filter((id) => !quote.extras.some((x) => x.id === id));
    if (unknown.length) throw new HttpProblem(400, 'unknown_extra', 'Unknown extra', `extras: ${unknown.join(', ')} is not offered on this quote`, { field: 'extras' });
    const amounts = acceptedAmounts(quote, input.extras);
    await quote.update(
      { state: 'accepted', acceptedAt: new Date(), acceptedName: input.name, acceptedIp: ip, acceptedExtras: input.extras, acceptedTotal: amounts.total, acceptedDeposit: amounts.deposit },
      { transaction },
    );
    await Estimate.update({ state: 'accepted' }, { where: { id: quote.estimateId }, transaction });
    await audit({ userId: null, action: 'quote.accept', entityType: 'quote', entityId: quote.id, after: { name: input.name, ip, extras: input.extras, total: amounts.total } }, transaction);
  });
  return viewQuote(config, token);
}

export async function declineQuote(sequelize: Sequelize, config: Config, token: string, reason: string, ip: string): Promise<PublicQuote> {
  await sequelize.transaction(async (transaction) => {
    const quote = await byToken(config, token, transaction);
    if (closedReason(quote)) throw closedProblem(quote);
    await quote.update({ state: 'declined', declinedAt: new Date(), declineReason: reason || null }, { transaction });
    await Estimate.update({ state: 'declined' }, { where: { id: quote.estimateId }, transaction });
    await audit({ userId: null, action: 'quote.decline', entityType: 'quote', entityId: quote.id, after: { reason, ip } }, transaction);
  });
  return viewQuote(config, token);
}

/** Opens the provider's checkout for the deposit of an accepted quote. */
export async function depositCheckout(config: Config, token: string): Promise<{ url: string }> {
  const quote = await byToken(config, token);
  if (quote.state === 'deposit-paid') throw closedProblem(quote);
  if (quote.state !== 'accepted') throw new HttpProblem(409, 'not_accepted', 'Accept first', 'Accept the quote before paying the deposit.');
  const estimate = (await Estimate.findByPk(quote.estimateId))!;
  const customer = await Customer.findByPk(estimate.customerId);
  const url = await startCheckout(config, quote, quoteLink(config, token), `Deposit for quote ${quote.number}: ${estimate.title}`, quote.recipient ?? customer?.email ?? null);
  return { url };
}
