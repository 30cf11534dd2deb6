/**
 * Messages to the customer after the quote: the kinds, the templates the owner edits (plain text with a few named
 * placeholders in braces), how a template is filled in, and the reminder settings.
 *
 * A placeholder is a name in braces made of letters, digits and underscores: `{customer}`. Every such name must be
 * one of PLACEHOLDERS (an unknown one is refused, naming it); everything else in the text is kept exactly as typed,
 * braces that do not make a placeholder included ("{ }", "{Mr Smith's piano"). Filling in is one pass: a value that
 * itself contains "{customer}" is never filled in again.
 */
import { z } from 'zod';

export const MESSAGE_KINDS = [
  'acceptance',
  'deposit-receipt',
  'booking',
  'dates-changed',
  'ready',
  'balance-due',
  'quote-unanswered',
  'quote-expiring',
] as const;
export type MessageKind = (typeof MESSAGE_KINDS)[number];

export const MESSAGE_KIND_LABELS: Record<MessageKind, string> = {
  acceptance: 'Acceptance confirmation',
  'deposit-receipt': 'Deposit receipt',
  booking: 'Booking dates',
  'dates-changed': 'Change of dates',
  ready: 'Ready for collection or delivery',
  'balance-due': 'Balance due',
  'quote-unanswered': 'Reminder: quote not answered',
  'quote-expiring': 'Reminder: quote about to expire',
};

/** When each message goes. */
export const MESSAGE_KIND_WHEN: Record<MessageKind, string> = {
  acceptance: 'When the customer accepts a quote.',
  'deposit-receipt': 'When the deposit is paid: the covering text of the receipt e-mail.',
  booking: 'When a job is first booked in the drying room.',
  'dates-changed': 'When a booked job is moved to other dates.',
  ready: 'When staff tell the customer the piece is ready.',
  'balance-due': 'When the tax invoice is issued with a balance still to pay: the covering text of the invoice e-mail.',
  'quote-unanswered': 'When a sent quote has had no answer for the days set below.',
  'quote-expiring': 'The days set below before a quote that is still unanswered expires.',
};

export const PLACEHOLDERS = ['customer', 'piece', 'quote_number', 'dates', 'amount', 'link', 'workshop'] as const;
export type Placeholder = (typeof PLACEHOLDERS)[number];
export type PlaceholderValues = Record<Placeholder, string>;

export const PLACEHOLDER_LABELS: Record<Placeholder, string> = {
  customer: 'the customer’s name',
  piece: 'the piece or pieces of work',
  quote_number: 'the quote’s number',
  dates: 'the dates that matter to the message (booked dates, valid-until date)',
  amount: 'the amount that matters to the message (deposit, balance, total)',
  link: 'the customer’s own page',
  workshop: 'the workshop’s name',
};

/** Invented values the preview fills in. */
export const SAMPLE_VALUES: PlaceholderValues = {
  customer: 'Mrs Ada Fenwick',
  piece: 'Walnut writing bureau',
  quote_number: 'Q-2026-0042',
  dates: '12 Jan 2027 to 23 Jan 2027',
  amount: '£1,234.56',
  link: 'https://workshop.example/q/sample-link',
  workshop: 'The Polishing Shop',
};

/** A placeholder: a name of letters, digits and underscores in braces. */
const TOKEN = /\{([A-Za-z0-9_]+)\}/g;

const known = new Set<string>(PLACEHOLDERS);

/** The names in braces that are not placeholders, once each, in the order they first appear. */
export function unknownPlaceholders(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(TOKEN)) if (!known.has(m[1]!) && !out.includes(m[1]!)) out.push(m[1]!);
  return out;
}

/** The text with every placeholder filled in (one pass). Throws on an unknown placeholder. */
export function renderTemplate(text: string, values: PlaceholderValues): string {
  const unknown = unknownPlaceholders(text);
  if (unknown.length) throw new Error(`Unknown placeholder {${unknown[0]}}`);
  return text.replace(TOKEN, (_whole, name: string) => values[name as Placeholder]);
}

const noUnknown = (text: string, ctx: z.RefinementCtx) => {
  const unknown = unknownPlaceholders(text);
  if (unknown.length) {
    ctx.addIssue({
      code: 'custom',
      message: `uses ${unknown.map((u) => `{${u}}`).join(', ')}, which ${unknown.length === 1 ? 'is not a placeholder' : 'are not placeholders'}: use ${PLACEHOLDERS.map((p) => `{${p}}`).join(', ')}`,
    });
  }
};

export const MessageTemplateUpdateSchema = z.object({
  subject: z.string().trim().min(1, 'is required').max(200).superRefine(noUnknown),
  body: z.string().trim().min(1, 'is required').max(5000).superRefine(noUnknown),
});
export type MessageTemplateUpdate = z.output<typeof MessageTemplateUpdateSchema>;
export type MessageTemplateUpdateInput = z.input<typeof MessageTemplateUpdateSchema>;

export const MessageKindSchema = z.enum(MESSAGE_KINDS);

export interface MessageTemplateDto {
  kind: MessageKind;
  label: string;
  when: string;
  subject: string;
  body: string;
  /** Whether the owner changed it from the text the product came with. */
  edited: boolean;
  updatedAt: string | null;
}

export interface MessagePreview {
  subject: string;
  text: string;
}

export const MessageSettingsSchema = z.object({
  unansweredAfterDays: z.coerce.number().int().min(1).max(60),
  expiringBeforeDays: z.coerce.number().int().min(1).max(30),
});
export type MessageSettings = z.output<typeof MessageSettingsSchema>;
export type MessageSettingsInput = z.input<typeof MessageSettingsSchema>;

export const MESSAGE_STATES = ['queued', 'sending', 'sent', 'failed'] as const;
export type MessageState = (typeof MESSAGE_STATES)[number];

export const CUSTOMER_MESSAGE_SORTS = ['createdAt', 'sentAt', 'status', 'subject'] as const;

export const CustomerMessagesQuerySchema = z.object({
  sort: z.enum(CUSTOMER_MESSAGE_SORTS).default('createdAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});
export type CustomerMessagesQuery = z.output<typeof CustomerMessagesQuerySchema>;

export interface CustomerMessageDto {
  id: number;
  kind: MessageKind | null;
  /** What the message was, in words: the template's name, or the subject for a quote or document e-mail. */
  label: string;
  subject: string;
  to: string;
  status: MessageState;
  attempts: number;
  lastError: string | null;
  createdAt: string;
  /** When it is due to go (a reminder), when set. */
  sendAfter: string | null;
  sentAt: string | null;
  quoteId: number | null;
}

export interface CustomerMessagesPage {
  rows: CustomerMessageDto[];
  total: number;
  totalCapped?: true;
  page: number;
  pageSize: number;
}
