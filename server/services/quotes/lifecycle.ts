/**
 * A quote's life after it is made: sending it (a new link, the PDF and the e-mail through the outbox), marking it sent, withdrawing it. States move by the table in shared/schemas/state-moves.ts.
 */
import { canMoveQuote, mirrorEstimate, moveQuote, quoteStateOn } from '@shared/schemas/state-moves';
import { today } from '@shared/time';
import type { Sequelize } from 'sequelize';
import type { QuoteDetail } from '@shared/schemas/quotes';
import type { Config } from '../../config';
import { problems } from '../../http/problem';
import { Customer, OutboxMessage, User } from '../../models';
import { renderQuotePdf } from '../../pdf/quote-pdf';
import { audit } from '../audit';
import { loadSettings } from '../catalog';
import { deliver } from '../mail';
import { scheduleQuoteReminders } from '../messages';
import { buildDocument } from './document';
import { quoteMail } from './email';
import { makeToken, quoteLink } from './links';
import { alreadyAgreed, lockQuote, pieceAgreement } from './locks';
import { getQuote, lineDtos, openQuotesNaming } from './read';

export async function sendQuote(sequelize: Sequelize, config: Config, actorId: number, id: number, recipient?: string): Promise<QuoteDetail> {
  const { token, outboxId } = await sequelize.transaction(async (transaction) => {
    const { quote, estimate, lines } = await lockQuote(id, transaction);
    const customer = await Customer.findByPk(estimate.customerId, { transaction });
    if (!customer) throw problems.notFound('Quote');
    if (!canMoveQuote(quote.state, 'send')) {
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
    const author = quote.createdBy ? await User.findByPk(quote.createdBy, { transaction }) : null;
    const { text, html } = quoteMail({ quote, estimateTitle: estimate.title, customerName: customer.name, lines: await lineDtos(lines, transaction), url, author: author?.name ?? null, workshop });
    const outbox = await OutboxMessage.create(
      {
        quoteId: quote.id,
        customerId: customer.id,
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
    // The reminders for an unanswered quote and one about to expire go on the queue for their days.
    await scheduleQuoteReminders(sequelize, quote, transaction);
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
