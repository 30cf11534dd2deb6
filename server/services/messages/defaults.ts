/**
 * The texts the product comes with, one per kind of message. Migration 2026.12.06T10.00 wrote these for every
 * workshop there was; a workshop without its own row reads these. The safety note, the greeting and the sign-off are
 * added to every message by the product (compose.ts), so they are not part of a template and cannot be edited out.
 */
import type { MessageKind } from '@shared/schemas/messages';

export const DEFAULT_TEMPLATES: Record<MessageKind, { subject: string; body: string }> = {
  acceptance: {
    subject: 'Your quote {quote_number} is accepted: thank you',
    body: 'Thank you for accepting quote {quote_number} for the {piece}, {amount} in all.\n\nThe next step is the deposit: you can pay it on your page, where the quote and its terms are kept:\n{link}\n\nWe will write again with the dates once the work is booked.',
  },
  'deposit-receipt': {
    subject: 'Your deposit for quote {quote_number}',
    body: 'Thank you for your deposit of {amount} for the {piece}. We will write with the dates as soon as the work is booked in our drying room.',
  },
  booking: {
    subject: 'Dates for your {piece}',
    body: 'The work on the {piece} (quote {quote_number}) is booked: {dates}.\n\nYou can follow it on your page:\n{link}',
  },
  'dates-changed': {
    subject: 'New dates for your {piece}',
    body: 'The dates for the work on the {piece} (quote {quote_number}) have changed: it is now booked {dates}.\n\nWe are sorry for any trouble this causes. Your page shows the latest:\n{link}',
  },
  ready: {
    subject: 'Your {piece} is ready',
    body: 'The work on the {piece} is finished and it is ready for collection or delivery. Please let us know which suits you.\n\nWhat is still to pay, if anything, is on your page:\n{link}',
  },
  'balance-due': {
    subject: 'The balance for quote {quote_number}',
    body: 'The work on the {piece} is invoiced. The balance still to pay is {amount}; you can pay it by card on your page:\n{link}',
  },
  'quote-unanswered': {
    subject: 'Your quote {quote_number} from {workshop}',
    body: 'We sent you quote {quote_number} for the {piece} a little while ago and wondered whether you had any questions. It stays open until {dates}:\n{link}',
  },
  'quote-expiring': {
    subject: 'Quote {quote_number} expires on {dates}',
    body: 'Quote {quote_number} for the {piece} is open until {dates}. After that date we would need to price the work again. You can read it and accept it on your page:\n{link}',
  },
};
