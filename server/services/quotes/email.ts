/**
 * The e-mail that carries a quote: one sentence for a single piece, or one a piece with its options and prices, the
 * link, the safety note and the sign-off, as text and HTML (mail-compose.ts). Money and dates read as everywhere else
 * (shared/format.ts).
 */
import { formatDate, formatMoney } from '@shared/format';
import type { QuoteLineDto } from '@shared/schemas/quotes';
import type { Quote, Workshop } from '../../models';
import { composeMail } from '../mail-compose';

export interface QuoteMail {
  quote: Pick<Quote, 'number' | 'message' | 'validUntil' | 'total' | 'deposit' | 'currency'>;
  estimateTitle: string;
  customerName: string;
  lines: readonly QuoteLineDto[];
  url: string;
  author: string | null;
  workshop: Pick<Workshop, 'name' | 'phone' | 'email'>;
}

export function quoteMail(a: QuoteMail): { text: string; html: string } {
  const quote = a.quote;
  const validUntil = formatDate(quote.validUntil, { month: 'long' });
  const total = formatMoney(quote.total, quote.currency);
  const deposit = formatMoney(quote.deposit, quote.currency);
  // A quote of several pieces or with options: one sentence a piece, its options and their prices.
  const dtos = a.lines;
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
  return composeMail({
    name: a.customerName,
    message: quote.message,
    paragraphs: [
      ...(choices.length === 0
        ? [{ text: `Please find attached our quote ${quote.number} for ${a.estimateTitle}: ${total}, with a deposit of ${deposit} to book the work. It is valid until ${validUntil}.` }]
        : [
            { text: `Please find attached our quote ${quote.number} for ${choices.length === 1 ? 'your piece' : `your ${choices.length} pieces`}, valid until ${validUntil}. ${optionsOffered ? 'Where we offer a choice, you choose on the quote page before accepting; the' : 'The'} total with ${optionsOffered ? 'what we recommend' : 'everything'} is ${total}, with a deposit of ${deposit} to book the work.` },
            ...choices.map((text) => ({ text })),
          ]),
      { text: 'You can read it, accept or decline it, and pay the deposit here:', link: { url: a.url, label: 'Read, accept or decline the quote, and pay the deposit' } },
      { text: 'French polishing uses flammable spirit and shellac; the work is done under our ventilation and fire precautions.', small: true },
    ],
    signOff: { from: a.author, workshop: a.workshop.name, phone: a.workshop.phone ?? null, email: a.workshop.email ?? null },
  });
}
